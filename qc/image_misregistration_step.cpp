#include "qc/image_misregistration_step.h"

#include <cmath>
#include <numbers>

#include "corrections/core/param_reader.h"
#include "qc/residual_table.h"
#include "qc/robust_stats.h"

namespace strandline {

void ImageMisregistrationStep::Params::validate(const std::string& pointer) const {
  if (min_transects < 3 || min_transects > 100000) throw ConfigError(pointer + "/min_transects", "expected at least 3");
  if (!(alpha > 0 && alpha < 1)) throw ConfigError(pointer + "/alpha", "expected a probability in (0, 1)");
  if (!(min_shift_m >= 0)) throw ConfigError(pointer + "/min_shift_m", "expected a non-negative number of metres");
  if (!(inlier_k > 0)) throw ConfigError(pointer + "/inlier_k", "expected a positive number");
  if (!(level_half_window_days > 0))
    throw ConfigError(pointer + "/level_half_window_days", "expected a positive number of days");
  if (!(storm_share_max > 0 && storm_share_max <= 1))
    throw ConfigError(pointer + "/storm_share_max", "expected a fraction in (0, 1]");
}

std::unique_ptr<Step> ImageMisregistrationStep::make(const nlohmann::json& params, const std::string& pointer) {
  Params p;
  ParamReader r(params, pointer);
  r.integer("min_transects", p.min_transects);
  r.number("alpha", p.alpha);
  r.number("min_shift_m", p.min_shift_m);
  r.number("inlier_k", p.inlier_k);
  r.boolean("use_geometry", p.use_geometry);
  r.number("level_half_window_days", p.level_half_window_days);
  r.number("storm_share_max", p.storm_share_max);
  r.finish();
  p.validate(pointer);
  return std::make_unique<ImageMisregistrationStep>(p);
}

ImageMisregistrationStep::ImageMisregistrationStep(const Params& p)
    : SiteStep("image_misregistration", {{"min_transects", p.min_transects},
                                         {"alpha", p.alpha},
                                         {"min_shift_m", p.min_shift_m},
                                         {"inlier_k", p.inlier_k},
                                         {"use_geometry", p.use_geometry},
                                         {"level_half_window_days", p.level_half_window_days},
                                         {"storm_share_max", p.storm_share_max}}),
      p_(p) {}

namespace {

struct ShiftFit {
  double a = 0, b = 0;  // common offset (a), or (dx, dy)
  bool ok = false;
};

// Weighted least squares of r = a*u + b*v (two columns) or r = a*u (one).
ShiftFit weighted_fit(const std::vector<double>& r, const std::vector<double>& w, const std::vector<double>& u,
                      const std::vector<double>& v, const std::vector<char>& use, bool two) {
  double suu = 0, suv = 0, svv = 0, sur = 0, svr = 0;
  for (std::size_t j = 0; j < r.size(); ++j) {
    if (!use[j]) continue;
    suu += w[j] * u[j] * u[j];
    sur += w[j] * u[j] * r[j];
    if (two) {
      suv += w[j] * u[j] * v[j];
      svv += w[j] * v[j] * v[j];
      svr += w[j] * v[j] * r[j];
    }
  }
  ShiftFit f;
  if (!two) {
    if (suu <= 0) return f;
    f.a = sur / suu;
    f.ok = true;
    return f;
  }
  const double det = suu * svv - suv * suv;
  if (!(det > 1e-12 * suu * svv) || det <= 0) return f;  // azimuths too alike to separate dx and dy
  f.a = (svv * sur - suv * svr) / det;
  f.b = (suu * svr - suv * sur) / det;
  f.ok = true;
  return f;
}

}  // namespace

void ImageMisregistrationStep::process(SiteTable& table, const RunInputs& inputs, StepLog& log) const {
  const FlagSet tolerated = flag_bit(Flag::spike) | flag_bit(Flag::hampel_outlier) | flag_bit(Flag::implausible_rate) |
                            flag_bit(Flag::alongshore_outlier);
  const ResidualTable res = build_residual_table(table, inputs, {p_.level_half_window_days, 5, true}, tolerated);
  bool geometry = p_.use_geometry && !table.transects.empty();
  for (const auto& t : table.transects) geometry = geometry && t.geometry.present();
  log.note("model", geometry ? "2-D shift projected on each transect's azimuth" : "common offset");
  const int dof = geometry ? 2 : 1;
  constexpr double kDeg = std::numbers::pi / 180.0;

  nlohmann::json rejected = nlohmann::json::array();
  std::vector<double> r, w, u, v;
  std::vector<std::size_t> rows;
  for (std::size_t im = 0; im < res.rows_by_image.size(); ++im) {
    r.clear(), w.clear(), u.clear(), v.clear(), rows.clear();
    std::size_t storm_points = 0;
    for (std::size_t i : res.rows_by_image[im]) storm_points += has_flag(table.flags[i], Flag::storm_response) ? 1 : 0;
    // A storm moves every transect landward at once: an image where storm
    // response is seen on many transects is explained by the storm.
    if (storm_points > 0 && double(storm_points) >= p_.storm_share_max * double(res.rows_by_image[im].size())) {
      log.count("images_explained_by_storm");
      continue;
    }
    for (std::size_t i : res.rows_by_image[im]) {
      if (has_flag(table.flags[i], Flag::storm_response)) continue;
      const auto& g = table.transects[table.transect[i]].geometry;
      rows.push_back(i);
      r.push_back(res.residual_m[i]);
      w.push_back(1.0 / (res.noise_m[i] * res.noise_m[i]));
      u.push_back(geometry ? std::sin(g.azimuth_deg * kDeg) : 1.0);
      v.push_back(geometry ? std::cos(g.azimuth_deg * kDeg) : 0.0);
    }
    const std::size_t n = rows.size();
    if (static_cast<long long>(n) < p_.min_transects) continue;
    log.count("images_tested");
    // Start from the points near the median residual, then iterate the inlier set.
    std::vector<double> work = r;
    const double med = median_in_place(work);
    std::vector<char> use(n);
    for (std::size_t j = 0; j < n; ++j) use[j] = std::abs(r[j] - med) <= p_.inlier_k / std::sqrt(w[j]);
    ShiftFit fit;
    for (int iter = 0; iter < 10; ++iter) {
      fit = weighted_fit(r, w, u, v, use, geometry);
      if (!fit.ok) break;
      bool changed = false;
      for (std::size_t j = 0; j < n; ++j) {
        const char in = std::abs(r[j] - (fit.a * u[j] + fit.b * v[j])) <= p_.inlier_k / std::sqrt(w[j]);
        changed = changed || in != use[j];
        use[j] = in;
      }
      if (!changed) break;
    }
    std::size_t n_in = 0;
    for (char c : use) n_in += c ? 1 : 0;
    if (!fit.ok || static_cast<long long>(n_in) < p_.min_transects) continue;
    double chi0 = 0, chi1 = 0, pred2 = 0;
    for (std::size_t j = 0; j < n; ++j) {
      const double pred = fit.a * u[j] + fit.b * v[j];
      pred2 += pred * pred;
      if (!use[j]) continue;
      chi0 += w[j] * r[j] * r[j];
      chi1 += w[j] * (r[j] - pred) * (r[j] - pred);
    }
    const double reduced = n_in > static_cast<std::size_t>(dof) ? chi1 / double(n_in - dof) : 1.0;
    const double drop = (chi0 - chi1) / std::max(1.0, reduced);
    const double p_value = chi_square_survival(drop, dof);
    const double shift_rms = std::sqrt(pred2 / double(n));
    if (p_value < p_.alpha && shift_rms >= p_.min_shift_m) {
      log.count("images_rejected");
      nlohmann::json j = {{"image_id", table.image_ids[im]}, {"shift_rms_m", shift_rms}, {"p_value", p_value}};
      if (geometry) j["shift_x_m"] = fit.a, j["shift_y_m"] = fit.b;
      else j["offset_m"] = fit.a;
      rejected.push_back(j);
      // Every corrected point of the image, whether or not it took part in the fit.
      for (std::size_t i : res.rows_by_image[im]) table.add_flag(i, Flag::image_misregistered);
    }
  }
  // Corrected rows of rejected images that took no part (e.g. rejected for cloud) are flagged too.
  if (!rejected.empty()) {
    std::vector<char> bad(table.image_ids.size(), 0);
    for (std::size_t im = 0; im < res.rows_by_image.size(); ++im)
      for (std::size_t i : res.rows_by_image[im])
        if (has_flag(table.flags[i], Flag::image_misregistered)) bad[im] = 1;
    std::int64_t points = 0;
    for (std::size_t i = 0; i < table.size(); ++i)
      if (bad[table.image[i]] && known(table.chainage_m[i])) {
        table.add_flag(i, Flag::image_misregistered);
        ++points;
      }
    log.count("image_misregistered", points);
  }
  log.note("rejected_images", rejected);
}

}  // namespace strandline
