#include "qc/hampel_step.h"

#include <cmath>

#include "qc/robust_stats.h"
#include "qc/transect_series.h"

namespace strandline {

const ParamList<HampelStep::Params>& HampelStep::Params::fields() {
  static const ParamList<Params> list = {
      {.name = "half_window_days", .member = member_of<&Params::half_window_days>, .unit = "days",
       .lower = greater_than(0), .meaning = "half-width of the running window"},
      {.name = "min_points", .member = member_of<&Params::min_points>, .lower = at_least(3), .upper = at_most(1000),
       .meaning = "a sparser window widens to the nearest this many usable points"},
      {.name = "k", .member = member_of<&Params::k>, .lower = greater_than(0),
       .meaning = "flagged beyond k times the robust scale max(1.4826 MAD, noise)"},
      {.name = "min_threshold_m", .member = member_of<&Params::min_threshold_m>, .unit = "m", .lower = at_least(0),
       .meaning = "deviations up to this are never flagged"},
  };
  return list;
}

std::unique_ptr<Step> HampelStep::make(const nlohmann::json& params, const std::string& pointer) {
  return std::make_unique<HampelStep>(read_params(Params::fields(), params, pointer));
}

HampelStep::HampelStep(const Params& p) : TransectStep("hampel", params_json(Params::fields(), p)), p_(p) {}

void HampelStep::process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const {
  const TransectInfo& t = table.transects[transect];
  const auto mask = usable_mask(table, transect);
  const auto noise = class_noise_m(table, transect, inputs, mask);
  const auto level = running_level(table, transect, mask,
                                   {p_.half_window_days, static_cast<std::size_t>(p_.min_points), true});
  std::int64_t flagged = 0;
  for (std::size_t i = t.begin; i < t.end; ++i) {
    const std::size_t k = i - t.begin;
    if (!mask[k] || has_flag(table.flags[i], Flag::storm_response)) continue;
    if (level.count[k] < 3) continue;  // too few points to judge
    const double scale = std::max(kMadToSigma * level.mad_m[k], noise[k]);
    const double deviation = std::abs(table.chainage_m[i] - level.median_m[k]);
    if (deviation > p_.k * scale && deviation > p_.min_threshold_m) {
      table.add_flag(i, Flag::hampel_outlier);
      ++flagged;
    }
  }
  log.count("hampel_outlier", flagged);
}

}  // namespace strandline
