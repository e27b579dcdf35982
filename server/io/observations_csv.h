// The batch observation format: `transect_id,time,chainage_m,sensor,image_id`,
// optional `cloud_fraction` (0-1) and `georef_rmse_m`; any other column is
// carried through to the outputs untouched. `chainage_m` is the raw position.
//
// Row validation is one function (validate_observation_row) shared by the CLI
// reader below and the HTTP upload handler, so both reject the same rows with
// the same reasons.
#pragma once

#include <cstdint>
#include <istream>
#include <optional>
#include <string>
#include <vector>

#include "corrections/core/csv_reader.h"
#include "corrections/core/sensor_table.h"
#include "corrections/core/site_table.h"

namespace strandline {

// Column positions of the observation format in one file's header.
struct ObservationColumns {
  std::size_t transect_id, time, chainage_m, sensor, image_id;
  std::optional<std::size_t> cloud_fraction, georef_rmse_m;
  std::vector<std::size_t> extra;  // carried-through columns, in file order

  // Throws InputError for a missing required column or a `correction_m` column
  // (the file looks like corrected output: nothing is corrected twice).
  static ObservationColumns from_header(const CsvHeader& header, const std::string& file);
};

struct ObservationRow {
  std::string transect_id;
  TimeS time_s = 0;
  double chainage_raw_m = 0;
  std::string sensor;
  std::string image_id;
  double cloud_fraction = kUnknown;
  double georef_rmse_m = kUnknown;
};

// Why a row was refused: the column and its text, and the reason.
struct RowProblem {
  std::int64_t line = 0;  // 1-based line in the file (0 for JSON uploads)
  std::string field;
  std::string value;
  std::string reason;
};

// Parses and checks one record; returns the problem instead of throwing so that
// callers can collect every bad row. `sensors` may be null (no sensor check).
std::optional<RowProblem> validate_observation_row(const std::vector<std::string>& fields,
                                                   const ObservationColumns& columns,
                                                   const SensorTable* sensors, ObservationRow& out);

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
};

// Streams the file into the compact table. Without skip_invalid the first bad
// row throws InputError (file:line: field "value": reason). Duplicate
// (transect, image) rows are bad rows naming the first occurrence's line.
ObservationFile read_observations(std::istream& in, const std::string& file, const ObservationReadOptions& options);
ObservationFile read_observations_file(const std::string& path, const ObservationReadOptions& options);

}  // namespace strandline
