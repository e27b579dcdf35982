// Step `image_misregistration`: one image displaced as a whole. On each image
// the residuals r_j (residual table; points already flagged by per-transect
// outlier filters still take part, storm_response points do not) are fitted by
// one of two models, chosen per image and recorded in the step log:
//   2-D shift:      r_j = dx sin(az_j) + dy cos(az_j)   (the shift seen along each azimuth)
//   common offset:  r_j = c
// The 2-D shift runs when every transect has geometry and the azimuths of the
// image's points spread at least `min_azimuth_spread_deg` (also over the final
// inliers). On parallel transects sin(az)dx + cos(az)dy is the same number on
// every transect: the 2-D model is then exactly the common offset along the
// shared azimuth, so that is what runs (1 degree of freedom), as it does without
// geometry. Spread: asin(sqrt(lambda_min / trace)) of the weighted normal matrix
// sum w (sin az, cos az)(sin az, cos az)^T, i.e. the weighted rms sine of the
// azimuths' departure from their principal direction. Why 3 deg by default: a
// 60 m alongshore shift is then seen on the transects as ~60 sin 3 = 3 m rms
// about their common part, under the 4-9 m noise of a mapped waterline, and its
// standard error on 20 transects at 8 m noise is 8 / (sqrt(20) sin 3) = 34 m,
// above min_shift_m: only the common part is measurable, with one degree of
// freedom instead of two (tests/bench/RESULTS.md compares both on a gentle curve).
// Fit: weighted least squares (weights 1/noise^2) from the points near the
// median residual, refitted on the inliers (|r - fit| <= inlier_k * noise) until
// stable; a 2-D fit left with too few inliers restarts from the least-absolute-
// deviation fit (on a fan the shift's projection varies widely across the image). The fit is significant when the
// drop in chi-square it brings (noise scaled up by the fit's reduced chi-square
// when that exceeds 1) has a chi-square tail probability below `alpha` (1 or 2
// degrees of freedom), and large when the rms of the fitted offsets over the
// image's transects is at least `min_shift_m`. Both: every corrected point of
// the image gets image_misregistered. Images where at least `storm_share_max`
// of the points carry storm_response are not tested: a storm moves every
// transect landward at once, which is real change, not misregistration. Images
// with some points taking part but fewer than `min_transects` of them (or of
// inliers) are counted as not testable.
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
    double min_azimuth_spread_deg = 3.0;  // below it the 2-D shift's alongshore part is not resolved
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
