// Cleaned rows as GIS layers, for both faces: `strandline correct --out
// cleaned.gpkg|.geojson` (rows streamed from the batch, carried-through input
// columns included) and the service's export of a run (typed rows from the
// store). Values are those of the cleaned CSV (reals rounded as the CSV writes
// them, unknown = null); the transect layer carries the per-transect summary.
#pragma once

#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "corrections/core/site_table.h"
#include "server/geo/geo_types.h"
#include "server/geo/result_writer.h"
#include "server/io/cleaned_rows.h"

namespace strandline::app {

// Reads the transects and stores each one's geometry (work CRS) in the table's
// TransectInfo::geometry; transects of the table missing from the file keep
// none (their points are written without geometry). Returns the set read.
geo::TransectSet attach_transect_geometry(const std::string& path, SiteTable& table);

// One cleaned row as GIS cells (text as it is, numbers rounded as in CSV).
std::vector<geo::Cell> point_cells(const std::vector<CellValue>& values, const std::vector<ColumnSpec>& columns);

// A point table of typed result rows (the engine's columns).
void append_result_points(geo::PlainTable& points, const std::vector<CleanedRow>& rows);

// Writes the layers to `out_path` and, when `rejected_path` is not empty, the
// rejected rows as the CSV writer does (line,field,value,reason + input fields).
void write_cleaned_geodata(const CleanedRowStream& rows, const geo::TransectSet& transects,
                           const nlohmann::json& summary, const std::string& out_path,
                           const std::string& rejected_path);

}  // namespace strandline::app
