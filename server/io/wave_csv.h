// Reader of the wave record `waves.csv`:
//   time,hs_m,tp_s[,dir_deg][,depth_m]
// with the rules of series_rules.h (shared with the HTTP upload): one sea state
// per row, times strictly increasing, hs_m in [0, 30] m, tp_s in [1, 40] s,
// dir_deg in [0, 360] or empty (unknown), depth_m > 0 on every row or on none
// (deep water). Other columns are errors. Errors are InputErrors naming file,
// line and field.
#pragma once

#include <istream>
#include <string>

#include "corrections/waves/wave_record.h"

namespace strandline {

WaveRecord read_wave_csv(std::istream& in, const std::string& file);
WaveRecord read_wave_csv_file(const std::string& path);

}  // namespace strandline
