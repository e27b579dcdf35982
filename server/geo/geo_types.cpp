#include "server/geo/geo_types.h"

#include <cmath>
#include <numbers>

namespace strandline::geo {

XY point_at_chainage(const TransectGeometry& g, double chainage_m) {
  // Azimuth clockwise from grid north: east component sin, north component cos.
  const double a = g.azimuth_deg * std::numbers::pi / 180.0;
  return {g.origin_x_m + chainage_m * std::sin(a), g.origin_y_m + chainage_m * std::cos(a)};
}

}  // namespace strandline::geo
