// Step `image_misregistration`: one image displaced as a whole. On each image
// the residuals r_j (residual table; points already flagged by per-transect
// outlier filters still take part, storm_response points do not) are fitted by
//   with transect geometry on every transect:  r_j = dx sin(az_j) + dy cos(az_j)
//                                               (a 2-D shift seen along each azimuth)
//   otherwise:                                  r_j = c (a common offset)
// by weighted least squares (weights 1/noise^2), refitted on the inliers
// (|r - fit| <= inlier_k * noise) until stable. The fit is significant when the
// drop in chi-square it brings (noise scaled up by the fit's reduced chi-square
// when that exceeds 1) has a chi-square tail probability below `alpha` (1 or 2
// degrees of freedom), and large when the rms of the fitted offsets over the
// image's transects is at least `min_shift_m`. Both: every corrected point of
// the image gets image_misregistered. Images where at least `storm_share_max`
// of the points carry storm_response are not tested: a storm moves every
// transect landward at once, which is real change, not misregistration.
#pragma once

#include "corrections/core/param_fields.h"
#include "corrections/core/step.h"

namespace strandline {

class ImageMisregistrationStep final : public SiteStep {
 public:
  struct Params {
    long long min_transects = 5;
    double alpha = 1e-4;
    double min_shift_m = 20.0;
    double inlier_k = 3.0;
    bool use_geometry = true;
    double level_half_window_days = 45.0;
    double storm_share_max = 0.25;  // images with at least this share of storm_response points are not tested
    static const ParamList<Params>& fields();  // each parameter: name, unit, range, meaning
  };
  static std::unique_ptr<Step> make(const nlohmann::json& params, const std::string& pointer);
  explicit ImageMisregistrationStep(const Params& p);

 private:
  void process(SiteTable& table, const RunInputs& inputs, StepLog& log) const override;
  Params p_;
};

}  // namespace strandline
