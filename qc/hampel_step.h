// Step `hampel`: the Hampel identifier on the corrected series. Around each
// usable point, the running median m and MAD of the usable points within
// +-half_window_days (widened to the nearest `min_points` when sparser; the
// window breaks at storm onsets) give the test
//     |x - m| > k * max(1.4826 * MAD, noise_class)   and   |x - m| > min_threshold_m
// The floor noise_class (the transect's robust noise of the point's sensor
// class) keeps a window of a few low-noise points, or of a quieter sensor, from
// shrinking the band below the point's own noise. storm_response points are
// left alone.
#pragma once

#include "corrections/core/param_fields.h"
#include "corrections/core/step.h"

namespace strandline {

class HampelStep final : public TransectStep {
 public:
  struct Params {
    double half_window_days = 45.0;
    long long min_points = 7;
    double k = 3.0;
    double min_threshold_m = 10.0;
    static const ParamList<Params>& fields();  // each parameter: name, unit, range, meaning
  };
  static std::unique_ptr<Step> make(const nlohmann::json& params, const std::string& pointer);
  explicit HampelStep(const Params& p);

 private:
  void process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const override;
  Params p_;
};

}  // namespace strandline
