#include "qc/sensor_offset_estimate.h"

#include <algorithm>
#include <cmath>
#include <map>

#include "qc/robust_stats.h"
#include "qc/student_t.h"

namespace strandline {

std::vector<std::string> sensor_families(const SiteTable& table, const RunInputs& inputs) {
  std::vector<std::string> out(table.sensor_names.size());
  if (!inputs.sensors) return out;
  for (std::size_t s = 0; s < out.size(); ++s)
    if (auto c = inputs.sensors->lookup(table.sensor_names[s])) out[s] = c->family;
  return out;
}

std::vector<double> sensor_sigmas_m(const SiteTable& table, const RunInputs& inputs) {
  std::vector<double> out(table.sensor_names.size(), 1.0);
  if (!inputs.sensors) return out;
  for (std::size_t s = 0; s < out.size(); ++s)
    if (auto c = inputs.sensors->lookup(table.sensor_names[s])) out[s] = c->sigma_m;
  return out;
}

std::vector<OffsetBin> transect_offset_bins(const SiteTable& table, std::size_t transect,
                                            const std::vector<double>& position_m, const std::vector<char>& usable,
                                            const std::vector<std::string>& families, const std::string& family,
                                            const std::string& reference, double bin_days,
                                            const std::vector<double>& sigma_by_sensor_m) {
  struct Side {
    std::vector<double> x;
    double var_sum = 0;  // sum of sigma^2 (for the mean variance)
  };
  std::map<long long, std::pair<Side, Side>> bins;  // bin -> (family, reference)
  const double bin_s = bin_days * kSecondsPerDay;
  const TransectInfo& t = table.transects[transect];
  for (std::size_t i = t.begin; i < t.end; ++i) {
    if (!usable[i] || !known(position_m[i])) continue;
    const std::string& f = families[table.sensor[i]];
    const bool is_family = f == family, is_reference = f == reference;
    if (!is_family && !is_reference) continue;
    const double sigma = sigma_by_sensor_m[table.sensor[i]];
    auto& both = bins[static_cast<long long>(std::floor(table.time_s[i] / bin_s))];
    auto& side = is_family ? both.first : both.second;
    side.x.push_back(position_m[i]);
    side.var_sum += sigma * sigma;
  }
  std::vector<OffsetBin> out;
  for (auto& [b, sides] : bins) {
    auto& [fam, ref] = sides;
    if (fam.x.empty() || ref.x.empty()) continue;
    const double nf = double(fam.x.size()), nr = double(ref.x.size());
    const double var = fam.var_sum / (nf * nf) + ref.var_sum / (nr * nr);
    OffsetBin ob;
    ob.bin = b;
    ob.diff_m = median_in_place(fam.x) - median_in_place(ref.x);
    ob.weight = 1.0 / var;
    ob.n_family = fam.x.size();
    ob.n_reference = ref.x.size();
    out.push_back(ob);
  }
  return out;
}

std::vector<OffsetBin> pool_offset_bins(const std::vector<std::vector<OffsetBin>>& per_transect) {
  std::map<long long, OffsetBin> pooled;
  for (const auto& bins : per_transect)
    for (const OffsetBin& b : bins) {
      OffsetBin& p = pooled[b.bin];
      p.bin = b.bin;
      p.diff_m += b.weight * b.diff_m;  // a weighted sum until divided below
      p.weight += b.weight;
      p.n_family += b.n_family;
      p.n_reference += b.n_reference;
    }
  std::vector<OffsetBin> out;
  out.reserve(pooled.size());
  for (auto& [k, p] : pooled) {
    p.diff_m /= p.weight;
    out.push_back(p);
  }
  return out;
}

FamilyOffset estimate_family_offset(const std::vector<OffsetBin>& bins, const std::string& family,
                                    const std::string& reference, std::size_t min_bins) {
  FamilyOffset r;
  r.family = family;
  r.reference_family = reference;
  r.n_bins = bins.size();
  for (const auto& b : bins) {
    r.n_points += b.n_family;
    r.n_reference_points += b.n_reference;
  }
  const std::size_t n = bins.size();
  if (n < std::max<std::size_t>(min_bins, 3)) return r;
  double sw = 0, swd = 0;
  for (const auto& b : bins) {
    sw += b.weight;
    swd += b.weight * b.diff_m;
  }
  r.offset_m = swd / sw;
  std::vector<double> e(n);
  double see = 0;
  for (std::size_t k = 0; k < n; ++k) {
    e[k] = std::sqrt(bins[k].weight) * (bins[k].diff_m - r.offset_m);
    see += e[k] * e[k];
  }
  const double se_naive = std::sqrt(see / double(n - 1) / sw);
  double num = 0;
  for (std::size_t k = 1; k < n; ++k) num += e[k] * e[k - 1];
  const double rho = see > 0 ? std::clamp(num / see, 0.0, 0.999) : 0.0;
  const double n_eff = double(n) * (1 - rho) / (1 + rho);
  if (!(n_eff > 3) || !(see > 0)) return r;
  r.dof = n_eff - 1;
  r.se_m = se_naive * std::sqrt(double(n - 1) / r.dof);
  const double half = student_t_quantile(0.975, r.dof) * r.se_m;
  r.ci95_low_m = r.offset_m - half;
  r.ci95_high_m = r.offset_m + half;
  return r;
}

}  // namespace strandline
