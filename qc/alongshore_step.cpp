#include "qc/alongshore_step.h"

#include <algorithm>
#include <cmath>

#include "corrections/core/param_reader.h"
#include "qc/residual_table.h"
#include "qc/robust_stats.h"

namespace strandline {

void AlongshoreStep::Params::validate(const std::string& pointer) const {
  if (neighbours < 1 || neighbours > 100) throw ConfigError(pointer + "/neighbours", "expected 1 to 100");
  if (min_neighbours < 1 || min_neighbours > 2 * neighbours)
    throw ConfigError(pointer + "/min_neighbours", "expected 1 to twice `neighbours`");
  if (!(k > 0)) throw ConfigError(pointer + "/k", "expected a positive number");
  if (!(min_threshold_m >= 0)) throw ConfigError(pointer + "/min_threshold_m", "expected a non-negative number of metres");
  if (!(level_half_window_days > 0))
    throw ConfigError(pointer + "/level_half_window_days", "expected a positive number of days");
}

std::unique_ptr<Step> AlongshoreStep::make(const nlohmann::json& params, const std::string& pointer) {
  Params p;
  ParamReader r(params, pointer);
  r.integer("neighbours", p.neighbours);
  r.integer("min_neighbours", p.min_neighbours);
  r.number("k", p.k);
  r.number("min_threshold_m", p.min_threshold_m);
  r.number("level_half_window_days", p.level_half_window_days);
  r.finish();
  p.validate(pointer);
  return std::make_unique<AlongshoreStep>(p);
}

AlongshoreStep::AlongshoreStep(const Params& p)
    : SiteStep("alongshore", {{"neighbours", p.neighbours},
                              {"min_neighbours", p.min_neighbours},
                              {"k", p.k},
                              {"min_threshold_m", p.min_threshold_m},
                              {"level_half_window_days", p.level_half_window_days}}),
      p_(p) {}

void AlongshoreStep::process(SiteTable& table, const RunInputs& inputs, StepLog& log) const {
  const ResidualTable res = build_residual_table(table, inputs, {p_.level_half_window_days, 5, true}, 0);
  const std::size_t nt = table.transects.size();
  bool geometry = nt > 0;
  for (const auto& t : table.transects) geometry = geometry && t.geometry.present();
  log.note("neighbour_order", geometry ? "distance between transect origins" : "transect order");
  // Candidate neighbours of each transect, nearest first.
  const std::size_t want = static_cast<std::size_t>(2 * p_.neighbours);
  std::vector<std::vector<std::size_t>> near(nt);
  for (std::size_t a = 0; a < nt; ++a) {
    std::vector<std::pair<double, std::size_t>> d;
    for (std::size_t b = 0; b < nt; ++b) {
      if (b == a) continue;
      double dist;
      if (geometry) {
        const auto& ga = table.transects[a].geometry;
        const auto& gb = table.transects[b].geometry;
        dist = std::hypot(ga.origin_x_m - gb.origin_x_m, ga.origin_y_m - gb.origin_y_m);
      } else {
        dist = std::abs(double(a) - double(b));
        if (dist > double(p_.neighbours)) continue;  // up to `neighbours` on each side
      }
      d.emplace_back(dist, b);
    }
    std::sort(d.begin(), d.end());
    for (std::size_t k = 0; k < d.size() && k < want; ++k) near[a].push_back(d[k].second);
  }

  std::vector<std::ptrdiff_t> row_of_transect(nt, -1);
  std::vector<double> nb_r, nb_s;
  std::vector<std::size_t> flagged;
  for (const auto& rows : res.rows_by_image) {
    for (std::size_t i : rows) row_of_transect[table.transect[i]] = static_cast<std::ptrdiff_t>(i);
    for (std::size_t i : rows) {
      nb_r.clear(), nb_s.clear();
      for (std::size_t b : near[table.transect[i]])
        if (row_of_transect[b] >= 0) {
          nb_r.push_back(res.residual_m[row_of_transect[b]]);
          nb_s.push_back(res.noise_m[row_of_transect[b]]);
        }
      if (static_cast<long long>(nb_r.size()) < p_.min_neighbours) continue;
      const double centre = median_in_place(nb_r);
      const double s_nb = median_in_place(nb_s);
      const double scale = std::sqrt(res.noise_m[i] * res.noise_m[i] + 1.5708 * s_nb * s_nb / double(nb_r.size()));
      if (std::abs(res.residual_m[i] - centre) > std::max(p_.min_threshold_m, p_.k * scale)) flagged.push_back(i);
    }
    for (std::size_t i : rows) row_of_transect[table.transect[i]] = -1;
  }
  // Flags set after the whole pass: one flagged point must not change its neighbours' test.
  for (std::size_t i : flagged) table.add_flag(i, Flag::alongshore_outlier);
  log.count("alongshore_outlier", static_cast<std::int64_t>(flagged.size()));
}

}  // namespace strandline
