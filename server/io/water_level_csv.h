// The water-level format: `time,level_m` (metres on the site datum), regular or
// irregular spacing, times strictly increasing.
#pragma once

#include <istream>
#include <string>

#include "corrections/water_level/gauge_series.h"

namespace strandline {


// Reads `time,level_m`; errors name the file, line and field (non-increasing or
// repeated times, non-numeric levels, a time without zone...).
GaugeSeries read_water_levels(std::istream& in, const std::string& file, double sigma_m);
GaugeSeries read_water_levels_file(const std::string& path, double sigma_m);

}  // namespace strandline
