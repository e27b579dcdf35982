// Upload bodies → store rows, every bad row collected with its reason. The
// rules are the batch readers' (server/io/observation_rules.h,
// series_rules.h): per-row rules, then the whole-body rules on the valid rows
// in body order. Large CSV observation bodies are parsed on two threads.
#pragma once

#include <optional>
#include <set>
#include <string>
#include <string_view>
#include <vector>

#include "corrections/core/sensor_table.h"
#include "server/io/tabular_body.h"
#include "server/store/store.h"

namespace strandline::app {

template <class Row>
struct ParsedUpload {
  std::vector<Row> rows;                 // valid rows, in body order
  std::vector<store::RowIssue> invalid;  // rows refused, by line
  std::int64_t received = 0;
  std::vector<std::string> ignored_columns;  // extra columns/members left out (column rule)
  std::optional<std::string> record_problem;  // a whole-record rule broken by the valid rows
};

// Where a row sits, for messages naming an earlier row: "line N" (CSV) or the
// JSON pointer "/<array_key>/<index>".
std::string row_place(BodyFormat format, const std::string& array_key, std::int64_t line);

// `transects`: the site's defined transects (a row naming another is invalid).
ParsedUpload<store::ObservationRow> parse_observation_upload(std::string_view body, BodyFormat format,
                                                             const std::set<std::string>& transects,
                                                             const SensorTable& sensors);
ParsedUpload<store::WaterLevelRow> parse_water_level_upload(std::string_view body, BodyFormat format);
ParsedUpload<store::WaveRow> parse_wave_upload(std::string_view body, BodyFormat format);
ParsedUpload<store::SlopeRow> parse_slope_upload(std::string_view body, BodyFormat format,
                                                 const std::set<std::string>& transects);

}  // namespace strandline::app
