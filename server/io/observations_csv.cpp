#include "server/io/observations_csv.h"

#include <fstream>

#include "corrections/core/errors.h"

namespace strandline {

ObservationFile read_observations(std::istream& in, const std::string& file, const ObservationReadOptions& options) {
  CsvTable csv(in, file);
  ObservationFile result;
  result.header = csv.header().names();
  result.columns = ObservationColumns::from_header(csv.header(), file);
  SiteTableBuilder builder;
  ObservationFileRules file_rules;
  std::vector<std::string> fields;
  ObservationRow row;
  std::uint32_t data_row = 0;
  auto reject = [&](RowProblem p) {
    p.line = csv.line();
    if (p.field == "sensor" && !options.unknown_sensor_hint.empty() && p.reason.rfind("sensor not in", 0) == 0)
      p.reason += " (" + options.unknown_sensor_hint + ")";
    if (!options.skip_invalid) throw InputError(file, p.line, p.field, p.value, p.reason);
    result.rejected.push_back({data_row, std::move(p)});
  };
  while (true) {
    try {
      if (!csv.next(fields)) break;
    } catch (const InputError& e) {
      // A record with the wrong field count is a bad row like any other.
      if (!options.skip_invalid) throw;
      result.rejected.push_back({data_row, RowProblem{e.line, "", "", e.reason}});
      ++data_row;
      continue;
    }
    if (auto p = validate_observation_row(fields, result.columns, options.sensors, row)) {
      reject(std::move(*p));
      ++data_row;
      continue;
    }
    const auto t = builder.transect_index(row.transect_id);
    const auto im = builder.image_index(row.image_id);
    const auto s = builder.sensor_index(row.sensor);
    if (auto p = file_rules.admit(t, im, s, row, csv.line())) {
      reject(std::move(*p));
      ++data_row;
      continue;
    }
    SiteTableBuilder::Point point{data_row, row.time_s, row.chainage_raw_m, row.cloud_fraction, row.georef_rmse_m};
    if (!builder.add(t, im, s, point))
      throw std::logic_error("observation admitted twice for one (transect, image)");
    ++data_row;
  }
  result.data_rows = data_row;
  result.table = std::move(builder).build();
  return result;
}

ObservationFile read_observations_file(const std::string& path, const ObservationReadOptions& options) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, 0, "", "", "cannot open file");
  return read_observations(in, path, options);
}

}  // namespace strandline
