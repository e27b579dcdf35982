// Step `water_level`: the still water level at each image time from the run's
// WaterLevelSource; no value (and the no_water_level flag) where the source
// cannot give one without extrapolating. The level's sigma is the source's (or
// `sigma_m`) and the source's interpolation error in quadrature; points between
// samples more than `coarse_interval_s` apart are flagged coarse_gauge.
#pragma once

#include "corrections/core/param_fields.h"
#include "corrections/core/step.h"

namespace strandline {

class WaterLevelStep final : public TransectStep {
 public:
  struct Params {
    double max_gap_s = 3 * 3600.0;  // samples around an image time at most this far apart
    double sigma_m = 0.10;  // 1-sigma of a gauge level at the beach (common practice: decimetres)
    double coarse_interval_s = 3600.0;  // samples farther apart flag coarse_gauge (common practice: hourly)
    static const ParamList<Params>& fields();  // each parameter: name, unit, range, meaning
  };
  static std::unique_ptr<Step> make(const nlohmann::json& params, const std::string& pointer);
  explicit WaterLevelStep(const Params& p);
  const Params& params() const { return p_; }

 private:
  void process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const override;
  Params p_;
};

}  // namespace strandline
