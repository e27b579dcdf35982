#include "corrections/steps/wave_conditions_step.h"

#include <cmath>

#include "corrections/waves/linear_waves.h"

namespace strandline {

namespace {
// Ratio above which a recorded height is depth-limited (breaking): linear
// shoaling no longer holds (common practice: McCowan's 0.78).
constexpr double kBreakingHeightToDepth = 0.78;
}  // namespace

const ParamList<WaveConditionsStep::Params>& WaveConditionsStep::Params::fields() {
  static const ParamList<Params> list = {
      {.name = "max_gap_s", .member = member_of<&Params::max_gap_s>, .unit = "s", .lower = greater_than(0),
       .meaning = "wave records around an image time at most this far apart (else no_wave_data)"},
  };
  return list;
}

std::unique_ptr<Step> WaveConditionsStep::make(const nlohmann::json& params, const std::string& pointer) {
  return std::make_unique<WaveConditionsStep>(read_params(Params::fields(), params, pointer));
}

WaveConditionsStep::WaveConditionsStep(const Params& p)
    : TransectStep("wave_conditions", params_json(Params::fields(), p)), p_(p) {}

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
