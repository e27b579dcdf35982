// slopes.json: what `strandline slope` writes (one entry per transect: slope,
// 95% interval, tidal band, energy curve, images used, verdict with reasons),
// and what `--slopes FILE.json` reads back. Shape: server/FORMATS.md, "Slopes JSON".
#pragma once

#include <istream>
#include <string>
#include <unordered_map>

#include <nlohmann/json.hpp>

#include "corrections/core/run_inputs.h"
#include "corrections/core/site_table.h"

namespace strandline {

inline constexpr int kSlopesJsonVersion = 1;

// The document for the transects of `table` after a run (provenance added by the caller).
nlohmann::json slopes_json(const SiteTable& table, const SlopePlan& plan);

// The usable slopes of a slopes.json: entries with a slope whose source is
// "estimated" or "fixed" and that are identifiable. Others (default, none, not
// identifiable) are left out, so the run falls back to its own plan for them.
// Errors name the file and the JSON pointer.
std::unordered_map<std::string, SlopeValue> read_slopes_json(std::istream& in, const std::string& file);
std::unordered_map<std::string, SlopeValue> read_slopes_json_file(const std::string& path);

// True when `path` names a JSON slopes file (by its extension).
bool is_slopes_json_path(const std::string& path);

}  // namespace strandline
