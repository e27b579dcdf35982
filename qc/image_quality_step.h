// Step `image_quality`: rejects points of images whose metadata says they are
// unreliable. Unknown metadata (empty cells) never rejects.
//   cloud_fraction > cloud_fraction_max   -> cloudy_image
//   georef_rmse_m  > georef_rmse_max_m    -> poor_georeference
// Defaults (common practice for satellite-derived waterlines): an image mostly
// covered by cloud (three quarters) and geolocation errors beyond ~1.5 Landsat
// pixels are not trusted. A stricter cloud limit (0.5 is also common) rejects
// many good points when the waterline region itself is clear: the outlier
// filters catch what the cloud did to the waterline.
#pragma once

#include "corrections/core/param_fields.h"
#include "corrections/core/step.h"

namespace strandline {

class ImageQualityStep final : public TransectStep {
 public:
  struct Params {
    double cloud_fraction_max = 0.75;
    double georef_rmse_max_m = 15.0;
    static const ParamList<Params>& fields();  // each parameter: name, unit, range, meaning
  };
  static std::unique_ptr<Step> make(const nlohmann::json& params, const std::string& pointer);
  explicit ImageQualityStep(const Params& p);

 private:
  void process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const override;
  Params p_;
};

}  // namespace strandline
