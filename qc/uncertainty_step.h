// Step `uncertainty`: sigma_m per point, the root-sum-square of independent
// horizontal terms (all 1-sigma, metres):
//   sensor       from the sensor table (class of the point's sensor)
//   water level  sigma_eta / tan(beta)
//   slope        sigma_tanb * |eta - z_ref| / tan(beta)^2   (the setup's horizontal
//                term 0.35*sqrt(H0*L0) does not depend on the slope; with `runup`
//                |eta - z_ref| gains the level c of runup_slope_sensitivity_level_m)
//   wave term    sigma_wave / tan(beta)
//   sensor offset  the applied offset's 1-sigma (sigma_sensor_offset_m), only on
//                points the sensor_offsets step shifted; like the slope term it is
//                shared (by every point of a family): trends carry it separately
// A term that cannot be known is left out of sigma_m and named in a flag; it is
// never counted as zero. The slope term is shared by all points of a transect:
// trends carry it separately (see the summary), not as independent noise.
#pragma once

#include "corrections/core/param_fields.h"
#include "corrections/core/step.h"

namespace strandline {

class UncertaintyStep final : public TransectStep {
 public:
  struct Params {
    static const ParamList<Params>& fields();  // each parameter: name, unit, range, meaning
  };
  static std::unique_ptr<Step> make(const nlohmann::json& params, const std::string& pointer);
  explicit UncertaintyStep(const Params& p);

 private:
  void process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const override;
  Params p_;
};

}  // namespace strandline
