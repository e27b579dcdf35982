#include "server/io/water_level_csv.h"

#include <fstream>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"
#include "server/io/series_rules.h"

namespace strandline {

GaugeSeries read_water_levels(std::istream& in, const std::string& file, double sigma_m) {
  CsvTable csv(in, file);
  const ResolvedColumns columns = resolve_columns(csv.header().names(), water_level_input_columns(), file);
  const std::size_t c_time = *columns.at[0], c_level = *columns.at[1];
  WaterLevelFileRules rules;
  std::vector<TimeS> times;
  std::vector<double> levels;
  std::vector<std::string> f;
  auto fail = [&](const RowProblem& p, std::int64_t line) { throw InputError(file, line, p.field, p.value, p.reason); };
  WaterLevelSample sample;
  while (csv.next(f)) {
    if (auto p = water_level_row(f[c_time], f[c_level], sample)) fail(*p, csv.line());
    if (auto p = rules.admit(sample, f[c_time], csv.line())) fail(*p, csv.line());
    times.push_back(sample.time_s);
    levels.push_back(sample.level_m);
  }
  if (auto problems = rules.finish(); !problems.empty()) fail(problems.front(), problems.front().line);
  return GaugeSeries(std::move(times), std::move(levels), sigma_m);
}

GaugeSeries read_water_levels_file(const std::string& path, double sigma_m) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, 0, "", "", "cannot open file");
  return read_water_levels(in, path, sigma_m);
}

}  // namespace strandline
