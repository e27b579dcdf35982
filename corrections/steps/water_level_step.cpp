#include "corrections/steps/water_level_step.h"

#include "corrections/core/param_reader.h"

namespace strandline {

void WaterLevelStep::Params::validate(const std::string& pointer) const {
  if (!(max_gap_s > 0)) throw ConfigError(pointer + "/max_gap_s", "must be positive (seconds)");
  if (!(sigma_m >= 0)) throw ConfigError(pointer + "/sigma_m", "must be zero or positive (metres)");
}

std::unique_ptr<Step> WaterLevelStep::make(const nlohmann::json& params, const std::string& pointer) {
  Params p;
  ParamReader r(params, pointer);
  r.number("max_gap_s", p.max_gap_s);
  r.number("sigma_m", p.sigma_m);
  r.finish();
  p.validate(pointer);
  return std::make_unique<WaterLevelStep>(p);
}

WaterLevelStep::WaterLevelStep(const Params& p)
    : TransectStep("water_level", {{"max_gap_s", p.max_gap_s}, {"sigma_m", p.sigma_m}}), p_(p) {}

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
    table.water_level_sigma_m[i] = known(wl->sigma_m) ? wl->sigma_m : p_.sigma_m;
    if (wl->predicted) {
      table.add_flag(i, Flag::tide_predicted);
      log.count("predicted");
    } else {
      log.count("gauge");
    }
  }
}

}  // namespace strandline
