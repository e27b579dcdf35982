// The water-level format: `time,level_m` (metres on the site datum), regular or
// irregular spacing, times strictly increasing.
#pragma once

#include <istream>
#include <string>

#include "corrections/water_level/gauge_series.h"

namespace strandline {


// Reads `time,level_m` with the rules of series_rules.h (shared with the HTTP
// upload); errors name the file, line and field (non-increasing or repeated
// times, non-numeric levels, a time without zone, levels not in metres...).
GaugeSeries read_water_levels(std::istream& in, const std::string& file, double sigma_m);
GaugeSeries read_water_levels_file(const std::string& path, double sigma_m);

}  // namespace strandline
