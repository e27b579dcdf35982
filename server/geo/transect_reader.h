// Reads transects from any OGR vector format (GeoPackage, GeoJSON, Shapefile,
// FlatGeobuf, ...): straight lines whose first vertex is the landward origin,
// or points carrying azimuth and length attributes. Geometry comes out in the
// work CRS (see work_crs.h).
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "server/geo/geo_types.h"

namespace strandline::geo {

struct TransectReadOptions {
  std::optional<std::string> layer;          // needed when the file has several layers
  std::string id_field = "transect_id";
  std::string azimuth_field = "azimuth_deg";  // points only: degrees clockwise from grid north
  std::string length_field = "length_m";      // points only
  std::optional<std::string> crs;             // the work CRS when the layer is not projected
  // Interior vertices of a line may stray this far from the origin-end chord;
  // a transect is one straight line.
  double straightness_tolerance_m = 1.0;
  std::vector<std::string> drivers;  // GDAL drivers allowed to open the file; empty: any
};

// Throws InputError naming the layer and feature (FID) for bad geometry,
// missing CRS, missing or duplicate ids and missing attributes.
TransectSet read_transects(const std::string& path, const TransectReadOptions& options);

}  // namespace strandline::geo
