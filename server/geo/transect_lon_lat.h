// Transects as drawn on a globe: origin and seaward end in WGS 84 longitude,
// latitude (RFC 7946 axis order), from the projected CRS they are stored in.
#pragma once

#include <string>
#include <vector>

#include "server/geo/geo_types.h"

namespace strandline::geo {

// One line per transect: {origin, end}, or {origin} alone when the length is unknown.
// `crs` is the site's CRS text (e.g. "EPSG:32631"); `context` names it in errors.
std::vector<std::vector<XY>> transect_lines_lon_lat(const std::string& crs, const std::vector<TransectGeometry>& transects,
                                                    const std::string& context);

}  // namespace strandline::geo
