// Gauge where it covers the time (within the gap limit), harmonic prediction
// elsewhere. Each value says which it came from (`predicted`), so the water-level
// step can flag predicted points. Both sources must be on the same datum; the
// mean gauge-minus-prediction offset over the gauge record is reported in
// provenance to expose a datum mismatch.
#pragma once

#include "corrections/core/run_inputs.h"
#include "corrections/water_level/gauge_series.h"

namespace strandline {

class BlendedWaterLevelSource final : public WaterLevelSource {
 public:
  // Keeps references: both sources must outlive this one.
  BlendedWaterLevelSource(const GaugeSeries& gauge, const WaterLevelSource& prediction);

  std::optional<WaterLevelAt> at(TimeS time_s, double max_gap_s) const override;
  nlohmann::json describe() const override;

  // Mean of gauge minus prediction over (up to 5000 evenly picked) gauge samples; unknown without samples.
  double mean_gauge_minus_prediction_m() const { return mean_offset_m_; }

 private:
  const GaugeSeries& gauge_;
  const WaterLevelSource& prediction_;
  double mean_offset_m_ = kUnknown;
};

}  // namespace strandline
