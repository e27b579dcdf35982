// The engine's table of a generated site's raw points (as the readers would build it).
#pragma once

#include "corrections/core/site_table.h"
#include "demo_data/synthetic/synthetic_site.h"

namespace strandline::synthetic_test {

inline SiteTable table_of(const synthetic::Site& site) {
  SiteTableBuilder b;
  for (std::size_t k = 0; k < site.points.size(); ++k) {
    const auto& p = site.points[k];
    const auto& img = site.images[p.image];
    b.add(b.transect_index(site.transects[p.transect].id), b.image_index(img.id), b.sensor_index(img.sensor),
          {static_cast<std::uint32_t>(k), p.time_s, p.chainage_raw_m, p.cloud_fraction, p.georef_rmse_m});
  }
  return std::move(b).build();
}

}  // namespace strandline::synthetic_test
