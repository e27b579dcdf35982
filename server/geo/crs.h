// Coordinate reference systems as text, and PROJ transformations between them.
// Coordinates are always (x, y) = (easting, northing) or (longitude, latitude):
// PROJ's authority axis order (latitude first for EPSG:4326) is normalised away
// (proj_normalize_for_visualization), matching GDAL's traditional GIS order.
#pragma once

#include <memory>
#include <string>
#include <vector>

#include "server/geo/geo_types.h"

namespace strandline::geo {

struct CrsInfo {
  std::string definition;  // WKT2
  std::string name;
  std::string authority;  // "EPSG:32631" or empty
  bool projected = false;
  bool geographic = false;
};

// Parses a CRS given by a user: an EPSG code ("EPSG:32631" or "32631"), WKT or a
// PROJ string. No file or network access. Throws InputError naming `context`
// (e.g. "--crs") when the text is not a CRS.
CrsInfo parse_crs(const std::string& text, const std::string& context);

// A CRS stored with a site and used by every later run: an authority code
// ("EPSG:32631", "32631") or WKT that names no file (no PARAMETERFILE, no
// grid). PROJ strings are refused: "+nadgrids=/path" would make the service
// open a file of the caller's choosing. Throws InputError naming `context`.
CrsInfo parse_site_crs(const std::string& text, const std::string& context);

// The WGS 84 / UTM zone containing a longitude/latitude (EPSG 326zz north,
// 327zz south); the standard 6-degree zones without the Norway/Svalbard
// exceptions.
std::string utm_authority_for(double lon_deg, double lat_deg);
int utm_zone_number(double lon_deg);

// A PROJ transformation from one CRS to another, both given as definitions
// (WKT, PROJ string or authority code). Construction throws InputError naming
// `context` when PROJ finds no transformation; `apply` throws when a point
// cannot be transformed. One object per thread (it owns a PROJ context).
class CoordinateTransform {
 public:
  CoordinateTransform(const std::string& from_definition, const std::string& to_definition,
                      std::string context);
  ~CoordinateTransform();
  CoordinateTransform(CoordinateTransform&&) noexcept;
  CoordinateTransform& operator=(CoordinateTransform&&) noexcept;

  XY apply(XY p) const;
  void apply(std::vector<XY>& points) const;

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

}  // namespace strandline::geo
