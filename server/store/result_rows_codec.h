// The stored form of a transect's typed result rows: a compact binary record
// (little-endian numbers, length-prefixed text, flags by name so that a new
// flag never changes what a stored row means). Unknown values stay NaN.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include <nlohmann/json.hpp>

#include "corrections/core/cleaned_row.h"

namespace strandline::store {

std::string encode_result_rows(const std::vector<CleanedRow>& rows);
// Throws StoreError on a damaged or unknown record.
std::vector<CleanedRow> decode_result_rows(std::string_view bytes);

// Rows from the JSON series documents that schema 3 stored (for the migration).
std::vector<CleanedRow> rows_from_series_json(const nlohmann::json& rows);

}  // namespace strandline::store
