#include "server/io/water_level_csv.h"

#include <fstream>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"

namespace strandline {

GaugeSeries read_water_levels(std::istream& in, const std::string& file, double sigma_m) {
  CsvTable csv(in, file);
  const auto c_time = csv.header().require("time");
  const auto c_level = csv.header().require("level_m");
  std::vector<TimeS> times;
  std::vector<double> levels;
  std::vector<std::string> f;
  std::int64_t previous_line = 0;
  while (csv.next(f)) {
    TimeS t;
    double level;
    try {
      t = parse_time_utc(f[c_time]);
    } catch (const FieldError& e) {
      throw InputError(file, csv.line(), "time", f[c_time], e.what());
    }
    try {
      level = parse_number(f[c_level]);
    } catch (const FieldError& e) {
      throw InputError(file, csv.line(), "level_m", f[c_level], e.what());
    }
    if (!times.empty() && !(t > times.back()))
      throw InputError(file, csv.line(), "time", f[c_time],
                       t == times.back() ? "repeats the time of line " + std::to_string(previous_line)
                                         : "earlier than line " + std::to_string(previous_line) +
                                               " (times must increase)");
    if (std::abs(level) > 100.0)
      throw InputError(file, csv.line(), "level_m", f[c_level], "implausible water level (metres expected)");
    times.push_back(t);
    levels.push_back(level);
    previous_line = csv.line();
  }
  if (times.size() < 2) throw InputError(file, 0, "", "", "need at least two water-level samples");
  return GaugeSeries(std::move(times), std::move(levels), sigma_m);
}

GaugeSeries read_water_levels_file(const std::string& path, double sigma_m) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, 0, "", "", "cannot open file");
  return read_water_levels(in, path, sigma_m);
}

}  // namespace strandline
