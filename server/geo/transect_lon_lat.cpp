#include "server/geo/transect_lon_lat.h"

#include "server/geo/crs.h"

namespace strandline::geo {

std::vector<std::vector<XY>> transect_lines_lon_lat(const std::string& crs, const std::vector<TransectGeometry>& transects,
                                                    const std::string& context) {
  const CrsInfo from = parse_site_crs(crs, context);
  const CoordinateTransform to_lon_lat(from.definition, "EPSG:4326", context + ": to longitude/latitude");
  std::vector<std::vector<XY>> lines;
  lines.reserve(transects.size());
  for (const auto& g : transects) {
    std::vector<XY> line{{g.origin_x_m, g.origin_y_m}};
    if (known(g.length_m)) line.push_back(point_at_chainage(g, g.length_m));
    to_lon_lat.apply(line);
    lines.push_back(std::move(line));
  }
  return lines;
}

}  // namespace strandline::geo
