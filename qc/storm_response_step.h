// Step `storm_response`: real change is not noise. Storm events are the periods
// when the wave record's Hs exceeds a threshold (by default the larger of
// `hs_min_m` and the record's `hs_quantile` over the observed span). On each
// transect, a point after a storm is storm response when
//   - it lies landward of the pre-storm level (median of the usable points in the
//     `pre_window_days` before the storm) by more than
//     max(jump_min_m, jump_noise_k * noise), and
//   - the change persists: the median of the next `persist_points` usable points
//     (within `persist_days`) is landward by at least half that, and the point
//     agrees with it within consistency_k * noise.
// Scanning an event stops once the following points are back near the pre-storm
// level (recovered), at the next storm, or `max_response_days` after the storm.
// Flagged points carry storm_response (info): despike, hampel and
// implausible_rate leave them alone, and running levels break at their onset,
// so neither the erosion nor the recovery that follows is rejected.
// Without a wave record the step does nothing (noted in the log).
#pragma once

#include <vector>

#include "corrections/core/param_fields.h"
#include "corrections/core/step.h"

namespace strandline {

struct StormEventSpan {
  TimeS start_s, end_s;
  double hs_peak_m;
};

class StormResponseStep final : public SiteStep {
 public:
  struct Params {
    double hs_threshold_m = 0.0;  // 0 = automatic (see above)
    double hs_quantile = 0.99;
    double hs_min_m = 2.5;
    double scan_step_s = 3 * 3600.0;
    double max_gap_s = 6 * 3600.0;
    double merge_gap_days = 2.0;  // events closer than this are one event
    double pre_window_days = 45.0;
    long long min_pre_points = 3;
    double jump_min_m = 10.0;
    double jump_noise_k = 2.0;
    long long persist_points = 3;
    double persist_days = 60.0;
    double consistency_k = 3.0;
    double max_response_days = 365.0;
    static const ParamList<Params>& fields();  // each parameter: name, unit, range, meaning
  };
  static std::unique_ptr<Step> make(const nlohmann::json& params, const std::string& pointer);
  explicit StormResponseStep(const Params& p);

  // Storm events of the wave source between `from_s` and `to_s`, and the threshold used.
  std::vector<StormEventSpan> find_events(const WaveSource& waves, TimeS from_s, TimeS to_s, double& threshold_m) const;

 private:
  void process(SiteTable& table, const RunInputs& inputs, StepLog& log) const override;
  Params p_;
};

}  // namespace strandline
