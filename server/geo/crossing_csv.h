// Writes intersection results as the batch observation CSV:
// transect_id,time,chainage_m,sensor,image_id[,cloud_fraction][,georef_rmse_m],crossings
// (quality columns only when the shorelines carried them; unknown values empty).
#pragma once

#include <ostream>

#include "server/geo/shoreline_intersect.h"

namespace strandline::geo {

void write_crossing_csv(std::ostream& out, const IntersectResult& result);

}  // namespace strandline::geo
