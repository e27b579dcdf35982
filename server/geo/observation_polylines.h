// The inverse of the intersection: per-transect positions of each image drawn as
// shoreline polylines, so that point observations (e.g. the invented demo site)
// also exist in the form a mapping step delivers. Per image, a polyline joins
// the positions on consecutive transects (in transect-list order); a gap (a
// transect without a position) breaks the line, so it never crosses a transect
// the image did not see. A position whose neighbours are both missing becomes a
// short tick across its transect.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "corrections/core/time_utc.h"
#include "server/geo/geo_types.h"

namespace strandline::geo {

struct ImagePosition {
  std::string transect_id;
  std::string image_id;
  TimeS time_s = 0;
  std::string sensor;
  double chainage_m = kUnknown;
  double cloud_fraction = kUnknown;
  double georef_rmse_m = kUnknown;
};

struct PolylineWriteReport {
  std::size_t images = 0;
  std::size_t features = 0;
  std::size_t ticks = 0;              // isolated positions drawn as ticks
  std::size_t unknown_transects = 0;  // positions on transects not in the set (left out)
  std::vector<std::string> files;
};

// Writes layer `layer` (.gpkg in the work CRS, .geojson in lon/lat) with the
// attributes time (date-time, UTC), sensor, image_id, cloud_fraction and
// georef_rmse_m. `tick_half_length_m` is half a tick's length.
PolylineWriteReport write_position_polylines(const std::string& path, const TransectSet& transects,
                                             const std::vector<ImagePosition>& positions,
                                             double tick_half_length_m = 5.0,
                                             const std::string& layer = "shorelines");

}  // namespace strandline::geo
