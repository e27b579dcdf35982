// `strandline correct --transects FILE --out cleaned.gpkg|.geojson`: the cleaned
// rows as GIS layers (see server/geo/result_writer.h), the same values as the
// cleaned CSV (numbers rounded as the CSV writes them), the transect layer with
// the per-transect summary.
#pragma once

#include <string>

#include <nlohmann/json.hpp>

#include "corrections/core/site_table.h"
#include "server/geo/geo_types.h"
#include "server/io/cleaned_rows.h"

namespace strandline::cli {

// Reads the transects and stores each one's geometry (work CRS) in the table's
// TransectInfo::geometry; transects of the table missing from the file keep
// none (their points are written without geometry). Returns the set read.
geo::TransectSet attach_transect_geometry(const std::string& path, SiteTable& table);

// Writes the layers to `out_path` and, when `rejected_path` is not empty, the
// rejected rows as the CSV writer does (line,field,value,reason + input fields).
void write_cleaned_geodata(const CleanedRowStream& rows, const geo::TransectSet& transects,
                           const nlohmann::json& summary, const std::string& out_path,
                           const std::string& rejected_path);

}  // namespace strandline::cli
