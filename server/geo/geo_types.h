// Plain geodata types shared by the readers, the intersection and the writers.
// No GDAL or PROJ type appears here: the rest of the project sees coordinates as
// doubles and coordinate reference systems as text.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "corrections/core/site_table.h"

namespace strandline::geo {

struct XY {
  double x = 0.0;
  double y = 0.0;
};

// The projected CRS all metric work happens in (chainage, azimuth, spacing).
struct WorkCrs {
  std::string definition;  // WKT2, readable by GDAL and PROJ
  std::string name;        // e.g. "WGS 84 / UTM zone 31N"
  std::string authority;   // e.g. "EPSG:32631"; empty when the CRS has no code
  std::string choice;      // why this CRS: "transects' own CRS", "the work CRS given", "UTM zone of ..."
};

struct GeoTransect {
  std::string id;
  TransectGeometry geometry;  // in the work CRS
  std::int64_t fid = -1;      // feature id in the source layer (messages)
};

struct TransectSet {
  std::vector<GeoTransect> transects;
  WorkCrs crs;
  std::string source;  // "file.geojson (layer transects)"
};

// End point of a transect at `chainage_m` along its azimuth (positive seaward).
XY point_at_chainage(const TransectGeometry& g, double chainage_m);

}  // namespace strandline::geo
