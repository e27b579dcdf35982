// The rule that picks the work CRS, the one projected CRS in which chainages,
// azimuths and spacings are measured:
//   1. the input layer's own CRS when it is projected;
//   2. otherwise the CRS given by the user (--crs), which must be projected;
//   3. otherwise the WGS 84 / UTM zone of the layer's centroid (reported).
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "server/geo/crs.h"
#include "server/geo/geo_types.h"

namespace strandline::geo {

// `points` are coordinates in `layer_crs` (x, y order) whose centroid picks the
// UTM zone; `label` names the layer in messages and in WorkCrs::choice.
WorkCrs choose_work_crs(const CrsInfo& layer_crs, const std::optional<std::string>& crs_option,
                        const std::vector<XY>& points, const std::string& label);

// Longitude/latitude (degrees) of the centroid of `points` given in `crs`.
XY lon_lat_centroid(const CrsInfo& crs, const std::vector<XY>& points, const std::string& label);

}  // namespace strandline::geo
