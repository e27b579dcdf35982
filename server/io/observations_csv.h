// The batch observation format: `transect_id,time,chainage_m,sensor,image_id`,
// optional `cloud_fraction` (0-1) and `georef_rmse_m`; any other column is
// carried through to the outputs untouched. `chainage_m` is the raw position.
//
// The rules (columns, rows, whole file) are observation_rules.h, shared with
// the HTTP uploads, so both faces refuse the same rows with the same reasons.
#pragma once

#include <cstdint>
#include <istream>
#include <optional>
#include <string>
#include <vector>

#include "corrections/core/csv_reader.h"
#include "corrections/core/sensor_table.h"
#include "corrections/core/site_table.h"
#include "server/io/observation_rules.h"

namespace strandline {

struct RejectedRow {
  std::uint32_t input_row;  // 0-based data row
  RowProblem problem;
};

struct ObservationFile {
  SiteTable table;
  std::vector<RejectedRow> rejected;  // only with skip_invalid
  std::size_t data_rows = 0;          // rows read (accepted into the table + rejected)
  std::vector<std::string> header;    // as in the file
  ObservationColumns columns{};
};

struct ObservationReadOptions {
  bool skip_invalid = false;  // collect bad rows instead of failing on the first
  const SensorTable* sensors = nullptr;
  // The face's hint appended to the reason of an unknown sensor, e.g. the CLI's
  // "add it with --sensor-table FILE"; empty: none.
  std::string unknown_sensor_hint;
};

// Streams the file into the compact table. Without skip_invalid the first bad
// row throws InputError (file:line: field "value": reason). Rows breaking a
// whole-file rule (ObservationFileRules) are bad rows naming the earlier line.
ObservationFile read_observations(std::istream& in, const std::string& file, const ObservationReadOptions& options);
ObservationFile read_observations_file(const std::string& path, const ObservationReadOptions& options);

}  // namespace strandline
