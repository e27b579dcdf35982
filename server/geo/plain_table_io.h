// Plain tables for the geodata writer from files: a CSV (e.g. the cleaned rows)
// and the summary JSON's per-transect objects.
#pragma once

#include <string>

#include <nlohmann/json.hpp>

#include "server/geo/result_writer.h"

namespace strandline::geo {

// Every column of the CSV, in file order. A column whose non-empty cells all
// parse as numbers becomes numeric, except identifier and time columns
// (transect_id, image_id, sensor, time, flags), which stay text; empty cells
// are null. Throws InputError (file:line) for malformed CSV.
PlainTable read_csv_plain_table(const std::string& path);

// One row per element of summary["transects"]: scalar members as columns,
// two-number arrays as NAME_low/NAME_high, objects of scalars as NAME_KEY;
// other members (e.g. slope details) are left out. Booleans become "true"/"false".
PlainTable summary_plain_table(const nlohmann::json& summary, const std::string& file);

}  // namespace strandline::geo
