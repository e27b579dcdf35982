#include "qc/alongshore_step.h"

#include <algorithm>
#include <cmath>

#include "qc/residual_table.h"
#include "qc/robust_stats.h"

namespace strandline {

const ParamList<AlongshoreStep::Params>& AlongshoreStep::Params::fields() {
  static const ParamList<Params> list = {
      {.name = "neighbours", .member = member_of<&Params::neighbours>, .lower = at_least(1), .upper = at_most(100),
       .meaning = "neighbouring transects compared on each side"},
      {.name = "min_neighbours", .member = member_of<&Params::min_neighbours>, .lower = at_least(1),
       .meaning = "neighbours needed on the image; at most twice `neighbours`"},
      {.name = "k", .member = member_of<&Params::k>, .lower = greater_than(0),
       .meaning = "flagged beyond k times the combined noise of the point and the neighbours' median"},
      {.name = "min_threshold_m", .member = member_of<&Params::min_threshold_m>, .unit = "m", .lower = at_least(0),
       .meaning = "differences up to this are never flagged"},
      {.name = "level_half_window_days", .member = member_of<&Params::level_half_window_days>, .unit = "days",
       .lower = greater_than(0), .meaning = "half-window of the running median the residuals are taken from"},
  };
  return list;
}

void AlongshoreStep::Params::validate(const std::string& pointer) const {
  if (min_neighbours > 2 * neighbours)
    throw ConfigError(pointer + "/min_neighbours", "expected at most twice `neighbours`");
}

std::unique_ptr<Step> AlongshoreStep::make(const nlohmann::json& params, const std::string& pointer) {
  return std::make_unique<AlongshoreStep>(read_params(Params::fields(), params, pointer));
}

AlongshoreStep::AlongshoreStep(const Params& p) : SiteStep("alongshore", params_json(Params::fields(), p)), p_(p) {}

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
