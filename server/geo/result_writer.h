// Writes results as GIS layers, independent of how the rows were produced:
// a plain table (column names + per-row cells) of shoreline points placed on
// their transects (origin + chainage along the azimuth), and a transect layer
// (lines origin -> end) carrying an optional per-transect summary table.
//
//   .gpkg     one GeoPackage, layers `shoreline_points` and `transects`, in the
//             work CRS.
//   .geojson  RFC 7946 (WGS 84 longitude/latitude); GeoJSON holds one layer per
//             file, so the transects go beside it: X.geojson + X_transects.geojson
//             (a transects-only write uses X.geojson itself).
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <variant>
#include <vector>

#include "server/geo/geo_types.h"

namespace strandline::geo {

using Cell = std::variant<std::monostate, double, std::string>;  // null, number, text

struct PlainTable {
  std::vector<std::string> columns;
  std::vector<std::vector<Cell>> rows;  // each row has columns.size() cells
  std::optional<std::size_t> column(const std::string& name) const;
};

enum class GeoFormat { geopackage, geojson };
// From the file extension (.gpkg, .geojson); nullopt for anything else.
std::optional<GeoFormat> geo_format_for(const std::string& path);

struct GeoLayers {
  const PlainTable* points = nullptr;            // null: no point layer
  const PlainTable* transect_summary = nullptr;  // null: geometry, azimuth and length only
  std::string transect_id_column = "transect_id";
  std::string chainage_column = "chainage_m";   // of `points`
  std::string points_layer = "shoreline_points";
  std::string transects_layer = "transects";
};

struct GeoWriteReport {
  std::vector<std::string> files;
  std::size_t points = 0;
  std::size_t points_without_geometry = 0;  // unknown chainage or transect without geometry
  std::size_t transects = 0;
};

// Replaces existing output files. Throws ArgumentError for an unknown extension,
// InputError for a table without the id/chainage columns or a write failure.
GeoWriteReport write_geo_layers(const std::string& path, const TransectSet& transects, const GeoLayers& layers);

// The sibling file holding the transects of a GeoJSON result.
std::string geojson_transects_path(const std::string& points_path);

}  // namespace strandline::geo
