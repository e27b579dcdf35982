// Reader of the wave record `waves.csv`:
//   time,hs_m,tp_s,dir_deg[,depth_m]
// one sea state per row, times (ISO 8601 with zone) strictly increasing; hs_m in
// [0, 30], tp_s in [1, 40], dir_deg in [0, 360] or empty (unknown); depth_m, when
// the column is present, the positive depth of a nearshore record on every row
// (absent column: deep-water values). Other columns are errors (typos never pass
// silently). Errors are InputErrors naming file, line and field.
#pragma once

#include <istream>
#include <string>

#include "corrections/waves/wave_record.h"

namespace strandline {

WaveRecord read_wave_csv(std::istream& in, const std::string& file);
WaveRecord read_wave_csv_file(const std::string& path);

}  // namespace strandline
