#include "server/geo/work_crs.h"

#include <cmath>
#include <cstdio>
#include <numbers>

#include "corrections/core/errors.h"

namespace strandline::geo {

namespace {

WorkCrs from_info(const CrsInfo& info, std::string choice) {
  return {info.definition, info.name, info.authority, std::move(choice)};
}

}  // namespace

XY lon_lat_centroid(const CrsInfo& crs, const std::vector<XY>& points, const std::string& label) {
  if (points.empty()) throw InputError(label + ": no coordinates to place the work CRS");
  CoordinateTransform to_lon_lat(crs.definition, "EPSG:4326", label + ": to longitude/latitude");
  // Longitudes are averaged as unit vectors so a layer across 180 degrees works.
  double sum_cos = 0, sum_sin = 0, sum_lat = 0;
  for (const XY& p : points) {
    const XY ll = to_lon_lat.apply(p);
    const double lon = ll.x * std::numbers::pi / 180.0;
    sum_cos += std::cos(lon);
    sum_sin += std::sin(lon);
    sum_lat += ll.y;
  }
  return {std::atan2(sum_sin, sum_cos) * 180.0 / std::numbers::pi, sum_lat / static_cast<double>(points.size())};
}

WorkCrs choose_work_crs(const CrsInfo& layer_crs, const std::optional<std::string>& crs_option,
                        const std::vector<XY>& points, const std::string& label) {
  if (layer_crs.projected) {
    std::string choice = "the CRS of " + label + " (projected)";
    if (crs_option) choice += "; the work CRS given was not needed and not used";
    return from_info(layer_crs, choice);
  }
  if (crs_option) {
    CrsInfo given = parse_crs(*crs_option, "work CRS");
    if (!given.projected)
      throw InputError("work CRS \"" + *crs_option + "\" (" + given.name +
                       ") is not a projected CRS; chainages need metres");
    return from_info(given, "the work CRS given (" + label + " is not projected)");
  }
  if (!layer_crs.geographic)
    throw InputError(label + ": CRS \"" + layer_crs.name +
                     "\" is neither projected nor geographic; give a projected work CRS");
  const XY c = lon_lat_centroid(layer_crs, points, label);
  const std::string authority = utm_authority_for(c.x, c.y);
  char where[96];
  std::snprintf(where, sizeof where, "centroid lon %.5f, lat %.5f", c.x, c.y);
  CrsInfo utm = parse_crs(authority, "UTM zone");
  return from_info(utm, "UTM zone of the " + std::string(where) + " of " + label +
                            " (not projected, no work CRS given)");
}

}  // namespace strandline::geo
