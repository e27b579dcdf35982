#include "qc/image_quality_step.h"

namespace strandline {

const ParamList<ImageQualityStep::Params>& ImageQualityStep::Params::fields() {
  static const ParamList<Params> list = {
      {.name = "cloud_fraction_max", .member = member_of<&Params::cloud_fraction_max>, .lower = at_least(0),
       .upper = at_most(1),
       .meaning = "images more cloudy than this are rejected (cloudy_image); unknown cloud never rejects"},
      {.name = "georef_rmse_max_m", .member = member_of<&Params::georef_rmse_max_m>, .unit = "m",
       .lower = greater_than(0), .meaning = "images with a larger geolocation RMSE are rejected (poor_georeference)"},
  };
  return list;
}

std::unique_ptr<Step> ImageQualityStep::make(const nlohmann::json& params, const std::string& pointer) {
  return std::make_unique<ImageQualityStep>(read_params(Params::fields(), params, pointer));
}

ImageQualityStep::ImageQualityStep(const Params& p)
    : TransectStep("image_quality", params_json(Params::fields(), p)), p_(p) {}

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
