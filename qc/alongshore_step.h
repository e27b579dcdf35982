// Step `alongshore`: a point at odds with its neighbouring transects on the same
// image. On the residual table (accepted points only), the point's residual is
// compared with the median residual of up to `neighbours` transects on each
// side present on that image: by distance between transect origins when every
// transect has geometry, otherwise by transect order (ids sorted; the order must
// then follow the coast). Flagged when
//     |r - median(r_nb)| > max(min_threshold_m, k * sqrt(noise^2 + (1.2533 noise_nb)^2 / n_nb))
// with at least `min_neighbours` neighbours (1.2533 = sqrt(pi/2), the
// efficiency loss of a median).
#pragma once

#include "corrections/core/param_fields.h"
#include "corrections/core/step.h"

namespace strandline {

class AlongshoreStep final : public SiteStep {
 public:
  struct Params {
    long long neighbours = 3;
    long long min_neighbours = 3;
    double k = 4.0;
    double min_threshold_m = 20.0;
    double level_half_window_days = 45.0;
    static const ParamList<Params>& fields();  // each parameter: name, unit, range, meaning
    void validate(const std::string& pointer) const;  // rules between fields
  };
  static std::unique_ptr<Step> make(const nlohmann::json& params, const std::string& pointer);
  explicit AlongshoreStep(const Params& p);

 private:
  void process(SiteTable& table, const RunInputs& inputs, StepLog& log) const override;
  Params p_;
};

}  // namespace strandline
