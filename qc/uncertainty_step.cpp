#include "qc/uncertainty_step.h"

#include <cmath>

#include "corrections/waves/stockdon.h"

namespace strandline {

const ParamList<UncertaintyStep::Params>& UncertaintyStep::Params::fields() {
  static const ParamList<Params> list;
  return list;
}

std::unique_ptr<Step> UncertaintyStep::make(const nlohmann::json& params, const std::string& pointer) {
  return std::make_unique<UncertaintyStep>(read_params(Params::fields(), params, pointer));
}

UncertaintyStep::UncertaintyStep(const Params& p)
    : TransectStep("uncertainty", params_json(Params::fields(), p)), p_(p) {}

void UncertaintyStep::process(SiteTable& table, std::size_t transect, const RunInputs& inputs,
                              StepLog& log) const {
  const TransectInfo& t = table.transects[transect];
  // Sensor sigma per sensor index, looked up once.
  std::vector<double> sensor_sigma(table.sensor_names.size(), kUnknown);
  if (inputs.sensors)
    for (std::size_t s = 0; s < table.sensor_names.size(); ++s)
      if (auto c = inputs.sensors->lookup(table.sensor_names[s])) sensor_sigma[s] = c->sigma_m;

  const double slope = t.slope;
  for (std::size_t i = t.begin; i < t.end; ++i) {
    if (!known(table.chainage_m[i])) continue;  // uncorrected: no position, no sigma
    const double s_sensor = sensor_sigma[table.sensor[i]];
    const double s_wl = table.water_level_sigma_m[i] / slope;
    double s_wave = 0.0;
    const bool wave_term_used = inputs.waves != nullptr && inputs.wave_correction != WaveCorrection::none &&
                                known(table.wave_level_m[i]);
    // A wave term whose horizontal shift depends on the slope (R2%; the setup
    // on a dissipative beach, not the general setup) adds a level c to |eta - z_ref|.
    double slope_level_m = 0.0;
    if (wave_term_used && inputs.wave_correction == WaveCorrection::runup)
      slope_level_m = runup_slope_sensitivity_level_m(table.hs0_m[i], table.l0_m[i], slope);
    else if (wave_term_used && inputs.wave_correction == WaveCorrection::setup)
      slope_level_m = setup_slope_sensitivity_level_m(table.hs0_m[i], table.l0_m[i], slope);
    const double s_slope =
        t.slope_sigma * std::abs(table.water_level_m[i] - t.z_ref_m + slope_level_m) / (slope * slope);
    if (wave_term_used) s_wave = table.wave_sigma_m[i] / slope;

    table.sigma_sensor_m[i] = s_sensor;
    table.sigma_water_level_m[i] = s_wl;
    table.sigma_slope_m[i] = s_slope;
    table.sigma_wave_m[i] = wave_term_used ? s_wave : kUnknown;

    double sum2 = 0.0;
    auto add = [&](double term, Flag unknown_flag) {
      if (known(term)) {
        sum2 += term * term;
      } else {
        table.add_flag(i, unknown_flag);
        log.count(flag_info(unknown_flag).name);
      }
    };
    add(s_sensor, Flag::sigma_sensor_unknown);
    add(s_wl, Flag::sigma_water_level_unknown);
    add(s_slope, Flag::sigma_slope_unknown);
    if (wave_term_used) add(s_wave, Flag::sigma_wave_unknown);
    // Only a point shifted by a sensor offset carries that offset's uncertainty.
    if (known(table.sensor_offset_m[i])) add(table.sigma_sensor_offset_m[i], Flag::sigma_sensor_offset_unknown);
    table.sigma_m[i] = std::sqrt(sum2);
    log.count("points");
  }
}

}  // namespace strandline
