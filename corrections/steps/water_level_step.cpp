#include "corrections/steps/water_level_step.h"

#include <cmath>

namespace strandline {

const ParamList<WaterLevelStep::Params>& WaterLevelStep::Params::fields() {
  static const ParamList<Params> list = {
      {.name = "max_gap_s", .member = member_of<&Params::max_gap_s>, .unit = "s", .lower = greater_than(0),
       .meaning = "gauge samples around an image time at most this far apart (never extrapolated)"},
      {.name = "sigma_m", .member = member_of<&Params::sigma_m>, .unit = "m", .lower = at_least(0),
       .meaning = "1σ of a gauge level at the beach when the source gives none (common practice: decimetres)"},
      {.name = "coarse_interval_s", .member = member_of<&Params::coarse_interval_s>, .unit = "s",
       .lower = greater_than(0), .meaning = "gauge samples farther apart around an image flag coarse_gauge (~1 h)"},
  };
  return list;
}

std::unique_ptr<Step> WaterLevelStep::make(const nlohmann::json& params, const std::string& pointer) {
  return std::make_unique<WaterLevelStep>(read_params(Params::fields(), params, pointer));
}

WaterLevelStep::WaterLevelStep(const Params& p)
    : TransectStep("water_level", params_json(Params::fields(), p)), p_(p) {}

void WaterLevelStep::process(SiteTable& table, std::size_t transect, const RunInputs& inputs,
                             StepLog& log) const {
  const TransectInfo& t = table.transects[transect];
  for (std::size_t i = t.begin; i < t.end; ++i) {
    std::optional<WaterLevelAt> wl;
    if (inputs.water_levels) wl = inputs.water_levels->at(table.time_s[i], p_.max_gap_s);
    if (!wl) {
      table.add_flag(i, Flag::no_water_level);
      log.count("no_water_level");
      continue;
    }
    table.water_level_m[i] = wl->level_m;
    // A source that knows its own error (a fitted tide's residual) overrides the default.
    const double level_sigma_m = known(wl->sigma_m) ? wl->sigma_m : p_.sigma_m;
    table.water_level_sigma_m[i] = std::hypot(level_sigma_m, wl->interpolation_sigma_m);  // NaN stays unknown
    if (wl->sample_interval_s > p_.coarse_interval_s) {
      table.add_flag(i, Flag::coarse_gauge);
      log.count("coarse_gauge");
    }
    if (wl->predicted) {
      table.add_flag(i, Flag::tide_predicted);
      log.count("predicted");
    } else {
      log.count("gauge");
    }
  }
}

}  // namespace strandline
