#include "server/io/wave_csv.h"

#include <fstream>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"
#include "server/io/series_rules.h"

namespace strandline {

WaveRecord read_wave_csv(std::istream& in, const std::string& file) {
  CsvTable table(in, file);
  const ResolvedColumns c = resolve_columns(table.header().names(), wave_input_columns(), file);
  WaveFileRules rules;
  std::vector<WaveSample> samples;
  std::vector<std::string> fields;
  auto cell = [&](std::size_t spec) { return c.at[spec] ? std::string_view(fields[*c.at[spec]]) : std::string_view(); };
  auto fail = [&](const RowProblem& p, std::int64_t line) { throw InputError(file, line, p.field, p.value, p.reason); };
  WaveFields row;
  while (table.next(fields)) {
    const WaveSampleText text{cell(0), cell(1), cell(2), cell(3), cell(4)};
    if (auto p = wave_row(text, row)) fail(*p, table.line());
    if (auto p = rules.admit(row, text, table.line())) fail(*p, table.line());
    samples.push_back({row.time_s, row.hs_m, row.tp_s, row.dir_deg, row.depth_m});
  }
  if (auto p = rules.finish()) fail(*p, 0);
  return WaveRecord(std::move(samples));
}

WaveRecord read_wave_csv_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, 0, "", "", "cannot open the wave record");
  return read_wave_csv(in, path);
}

}  // namespace strandline
