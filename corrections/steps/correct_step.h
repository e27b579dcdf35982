// Step `correct`: the horizontal shift of each point to the reference contour,
//   chainage_m = chainage_raw_m + (water_level_m + wave_level_m - z_ref) / slope
// (positive seaward: a waterline seen at a high water level lies landward of the
// z_ref contour, so the shift is seaward). Points without a water level or slope
// keep their raw values and an empty chainage_m.
#pragma once

#include "corrections/core/param_fields.h"
#include "corrections/core/step.h"

namespace strandline {

class CorrectStep final : public TransectStep {
 public:
  struct Params {
    static const ParamList<Params>& fields();  // each parameter: name, unit, range, meaning
  };
  static std::unique_ptr<Step> make(const nlohmann::json& params, const std::string& pointer);
  explicit CorrectStep(const Params& p);

 private:
  void process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const override;
  Params p_;
};

// The shift itself, for one point (NaN when any input is unknown).
double horizontal_correction_m(double water_level_m, double wave_level_m, double z_ref_m, double slope);

}  // namespace strandline
