// The observation rules, written once and applied by the batch reader
// (observations_csv.h) and the HTTP uploads (server/app/upload_rows.h):
//   columns  transect_id,time,chainage_m,sensor,image_id required;
//            cloud_fraction, georef_rmse_m optional; misspelt names refused,
//            other columns extra (column_rules.h); correction_m or
//            chainage_raw_m refused (corrected output is never corrected twice);
//   per row  validate_observation_row;
//   per file ObservationFileRules: one image has one time and one sensor, one
//            row per (transect, image).
// Messages speak of rows, fields and values; each face adds its own hints.
#pragma once

#include <cstdint>
#include <functional>
#include <optional>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

#include "corrections/core/csv_reader.h"
#include "corrections/core/sensor_table.h"
#include "corrections/core/site_table.h"
#include "server/io/column_rules.h"

namespace strandline {

const InputColumns& observation_input_columns();

// Column positions of the observation format in one header.
struct ObservationColumns {
  std::size_t transect_id, time, chainage_m, sensor, image_id;
  std::optional<std::size_t> cloud_fraction, georef_rmse_m;
  std::vector<std::size_t> extra;  // carried-through (batch) or ignored (service) columns, in header order

  // Throws ColumnError (an InputError) for a missing or misspelt column, or a
  // correction_m / chainage_raw_m column.
  static ObservationColumns from_names(const std::vector<std::string>& names, const std::string& source);
  static ObservationColumns from_header(const CsvHeader& header, const std::string& source);
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
  std::int64_t line = 0;  // 1-based line in the file (0 when the caller sets it)
  std::string field;
  std::string value;
  std::string reason;
};

// The reason given for a sensor missing from the table (no face hint).
std::string unknown_sensor_reason(const SensorTable& sensors);

// Parses and checks one record; returns the problem instead of throwing so that
// callers can collect every bad row. `sensors` may be null (no sensor check).
std::optional<RowProblem> validate_observation_row(const std::vector<std::string>& fields,
                                                   const ObservationColumns& columns,
                                                   const SensorTable* sensors, ObservationRow& out);

// Names the place of an earlier row in a message: "line 12" for CSV, a JSON
// pointer for a JSON body.
using RowPlace = std::function<std::string(std::int64_t line)>;
std::string line_place(std::int64_t line);

// The whole-file rules, fed the valid rows in file order. Transects, images and
// sensors are dense indices (0, 1, 2... in first-seen order) interned by the
// caller, so the batch reuses its table's interning.
class ObservationFileRules {
 public:
  explicit ObservationFileRules(RowPlace place = line_place) : place_(std::move(place)) {}

  // The problem of a row breaking a rule (the row is then not recorded), else nullopt.
  std::optional<RowProblem> admit(std::uint32_t transect, std::uint32_t image, std::uint32_t sensor,
                                  const ObservationRow& row, std::int64_t line);

 private:
  struct ImageSeen {
    TimeS time_s;
    std::uint32_t sensor;
    std::int64_t line;
  };
  RowPlace place_;
  std::vector<ImageSeen> images_;  // by image index
  std::unordered_map<std::uint64_t, std::int64_t> rows_;  // (transect, image) -> line
};

// The rule against a stored record of the same image (service): the reason
// when `row` disagrees with the image's stored time or sensor, with the field.
std::optional<RowProblem> stored_image_problem(const ObservationRow& row, TimeS stored_time_s,
                                               const std::string& stored_sensor);

}  // namespace strandline
