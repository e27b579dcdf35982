// Upload bodies → store rows, every bad row collected with its reason. The
// observation rules are the batch reader's (validate_observation_row); series
// rules follow the batch readers' ranges.
#pragma once

#include <set>
#include <string>
#include <string_view>
#include <vector>

#include "corrections/core/sensor_table.h"
#include "server/http/tabular_body.h"
#include "server/store/store.h"

namespace strandline::http {

template <class Row>
struct ParsedUpload {
  std::vector<Row> rows;                 // valid rows
  std::vector<store::RowIssue> invalid;  // rows refused, with reasons
  std::int64_t received = 0;
};

// `transects`: the site's defined transects (a row naming another is invalid).
ParsedUpload<store::ObservationRow> parse_observation_upload(std::string_view body, BodyFormat format,
                                                             const std::set<std::string>& transects,
                                                             const SensorTable& sensors);
ParsedUpload<store::WaterLevelRow> parse_water_level_upload(std::string_view body, BodyFormat format);
ParsedUpload<store::WaveRow> parse_wave_upload(std::string_view body, BodyFormat format);
ParsedUpload<store::SlopeRow> parse_slope_upload(std::string_view body, BodyFormat format,
                                                 const std::set<std::string>& transects);

// The report form of a row issue: {"line", "field", "value", "reason"} (JSON
// bodies: "pointer" to the array element instead of "line").
nlohmann::json row_issue_json(const store::RowIssue& issue, BodyFormat format, const std::string& array_key);

}  // namespace strandline::http
