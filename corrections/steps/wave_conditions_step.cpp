#include "corrections/steps/wave_conditions_step.h"

#include <cmath>

#include "corrections/core/param_reader.h"
#include "corrections/waves/linear_waves.h"

namespace strandline {

namespace {
// Ratio above which a recorded height is depth-limited (breaking): linear
// shoaling no longer holds (common practice: McCowan's 0.78).
constexpr double kBreakingHeightToDepth = 0.78;
}  // namespace

void WaveConditionsStep::Params::validate(const std::string& pointer) const {
  if (!(max_gap_s > 0)) throw ConfigError(pointer + "/max_gap_s", "must be positive (seconds)");
}

std::unique_ptr<Step> WaveConditionsStep::make(const nlohmann::json& params, const std::string& pointer) {
  Params p;
  ParamReader r(params, pointer);
  r.number("max_gap_s", p.max_gap_s);
  r.finish();
  p.validate(pointer);
  return std::make_unique<WaveConditionsStep>(p);
}

WaveConditionsStep::WaveConditionsStep(const Params& p)
    : TransectStep("wave_conditions", {{"max_gap_s", p.max_gap_s}}), p_(p) {}

void WaveConditionsStep::process(SiteTable& table, std::size_t transect, const RunInputs& inputs,
                                 StepLog& log) const {
  if (inputs.waves == nullptr) return;
  const TransectInfo& t = table.transects[transect];
  for (std::size_t i = t.begin; i < t.end; ++i) {
    const auto sea = inputs.waves->at(table.time_s[i], p_.max_gap_s);
    // A source outside the reader's checks (e.g. stored service data) may hand
    // over non-physical values: treated as no sea state rather than a failure.
    if (!sea || !(sea->hs_m >= 0) || !(sea->tp_s > 0) || !std::isfinite(sea->tp_s) ||
        (known(sea->depth_m) && !(sea->depth_m > 0))) {
      table.add_flag(i, Flag::no_wave_data);
      log.count("no_wave_data");
      continue;
    }
    if (known(sea->depth_m) && sea->hs_m > kBreakingHeightToDepth * sea->depth_m) log.count("record_depth_limited");
    table.hs0_m[i] = deshoal_to_deep_water(sea->hs_m, sea->tp_s, sea->depth_m);
    table.l0_m[i] = deep_water_wavelength_m(sea->tp_s);
    log.count(known(sea->depth_m) ? "deshoaled" : "deep_water");
  }
}

}  // namespace strandline
