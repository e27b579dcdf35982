#include "qc/image_quality_step.h"

#include "corrections/core/param_reader.h"

namespace strandline {

void ImageQualityStep::Params::validate(const std::string& pointer) const {
  if (!(cloud_fraction_max >= 0 && cloud_fraction_max <= 1))
    throw ConfigError(pointer + "/cloud_fraction_max", "expected a fraction in [0, 1]");
  if (!(georef_rmse_max_m > 0)) throw ConfigError(pointer + "/georef_rmse_max_m", "expected a positive number of metres");
}

std::unique_ptr<Step> ImageQualityStep::make(const nlohmann::json& params, const std::string& pointer) {
  Params p;
  ParamReader r(params, pointer);
  r.number("cloud_fraction_max", p.cloud_fraction_max);
  r.number("georef_rmse_max_m", p.georef_rmse_max_m);
  r.finish();
  p.validate(pointer);
  return std::make_unique<ImageQualityStep>(p);
}

ImageQualityStep::ImageQualityStep(const Params& p)
    : TransectStep("image_quality",
                   {{"cloud_fraction_max", p.cloud_fraction_max}, {"georef_rmse_max_m", p.georef_rmse_max_m}}),
      p_(p) {}

void ImageQualityStep::process(SiteTable& table, std::size_t transect, const RunInputs&, StepLog& log) const {
  const TransectInfo& t = table.transects[transect];
  for (std::size_t i = t.begin; i < t.end; ++i) {
    if (known(table.cloud_fraction[i]) && table.cloud_fraction[i] > p_.cloud_fraction_max) {
      table.add_flag(i, Flag::cloudy_image);
      log.count("cloudy_image");
    }
    if (known(table.georef_rmse_m[i]) && table.georef_rmse_m[i] > p_.georef_rmse_max_m) {
      table.add_flag(i, Flag::poor_georeference);
      log.count("poor_georeference");
    }
  }
}

}  // namespace strandline
