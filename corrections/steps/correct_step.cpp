#include "corrections/steps/correct_step.h"

namespace strandline {

double horizontal_correction_m(double water_level_m, double wave_level_m, double z_ref_m, double slope) {
  if (!known(water_level_m) || !known(wave_level_m) || !known(z_ref_m) || !(slope > 0)) return kUnknown;
  return (water_level_m + wave_level_m - z_ref_m) / slope;
}

const ParamList<CorrectStep::Params>& CorrectStep::Params::fields() {
  static const ParamList<Params> list;
  return list;
}

std::unique_ptr<Step> CorrectStep::make(const nlohmann::json& params, const std::string& pointer) {
  return std::make_unique<CorrectStep>(read_params(Params::fields(), params, pointer));
}

CorrectStep::CorrectStep(const Params& p) : TransectStep("correct", params_json(Params::fields(), p)), p_(p) {}

void CorrectStep::process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const {
  const TransectInfo& t = table.transects[transect];
  const bool waves_given = inputs.waves != nullptr && inputs.wave_correction != WaveCorrection::none;
  for (std::size_t i = t.begin; i < t.end; ++i) {
    // Without a wave record the wave term is absent (column stays empty) and
    // contributes nothing; with one, a missing value was flagged upstream and the
    // tide-only correction is kept with that warning. The wave_terms step writes
    // wave_level_m (0 with `none`, empty without a sea state).
    double wave = 0.0;
    if (waves_given && known(table.wave_level_m[i])) wave = table.wave_level_m[i];
    const double shift = horizontal_correction_m(table.water_level_m[i], wave, t.z_ref_m, t.slope);
    if (!known(shift)) {
      log.count("uncorrected");
      continue;
    }
    table.correction_m[i] = shift;
    table.chainage_m[i] = table.chainage_raw_m[i] + shift;
    log.count("corrected");
  }
}

}  // namespace strandline
