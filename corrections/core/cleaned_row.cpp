#include "corrections/core/cleaned_row.h"

namespace strandline {

CleanedRow cleaned_row(const SiteTable& t, std::size_t i) {
  const TransectInfo& tr = t.transects[t.transect[i]];
  CleanedRow r;
  r.transect_id = tr.id;
  r.time_s = t.time_s[i];
  r.sensor = t.sensor_names[t.sensor[i]];
  r.image_id = t.image_ids[t.image[i]];
  r.chainage_raw_m = t.chainage_raw_m[i];
  r.water_level_m = t.water_level_m[i];
  r.setup_m = t.setup_m[i];
  r.runup_m = t.runup_m[i];
  r.wave_level_m = t.wave_level_m[i];
  r.z_ref_m = tr.z_ref_m;
  r.slope = tr.slope;
  r.correction_m = t.correction_m[i];
  r.sensor_offset_m = t.sensor_offset_m[i];
  r.chainage_m = t.chainage_m[i];
  r.sigma_m = t.sigma_m[i];
  r.sigma_sensor_m = t.sigma_sensor_m[i];
  r.sigma_water_level_m = t.sigma_water_level_m[i];
  r.sigma_slope_m = t.sigma_slope_m[i];
  r.sigma_wave_m = t.sigma_wave_m[i];
  r.sigma_sensor_offset_m = t.sigma_sensor_offset_m[i];
  r.cloud_fraction = t.cloud_fraction[i];
  r.georef_rmse_m = t.georef_rmse_m[i];
  r.flags = t.flags[i];
  r.accepted = t.accepted(i);
  return r;
}

}  // namespace strandline
