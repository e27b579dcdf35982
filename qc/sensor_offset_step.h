// Step `sensor_offsets` (per site): offsets between sensor families (sensor
// table `family`), estimated where a family and the reference family overlap in
// time (qc/sensor_offset_estimate.h), per transect and pooled over the run's
// transects, and applied according to RunInputs::sensor_offset_mode:
//   estimate  every family whose site offset is significant (95% interval
//             excludes 0) is shifted by that offset, its SE as the point's
//             sigma_sensor_offset_m
//   none      nothing applied (the summary cautions when an offset is significant)
//   given     each sensor's offset_m (sigma offset_sigma_m) from the sensor table
// Applying subtracts the offset from chainage_m and correction_m of every
// corrected point of that sensor and flags it sensor_offset_applied.
//
// Order: right after `correct`, before the QC filters, so the running levels
// the filters compare against do not straddle two families' levels (and an
// offset is not mistaken for whole-image misregistration). The estimate works
// on bin medians, which the gross outliers still present at that point do not move.
#pragma once

#include "corrections/core/param_fields.h"
#include "corrections/core/step.h"

namespace strandline {

class SensorOffsetStep final : public SiteStep {
 public:
  struct Params {
    double bin_days = 30.0;
    long long min_bins = 10;
    std::string reference_family;  // empty: the longest record (then the most points)
    static const ParamList<Params>& fields();  // each parameter: name, unit, range, meaning
  };
  static std::unique_ptr<Step> make(const nlohmann::json& params, const std::string& pointer);
  explicit SensorOffsetStep(const Params& p);

 private:
  void process(SiteTable& table, const RunInputs& inputs, StepLog& log) const override;
  Params p_;
};

}  // namespace strandline
