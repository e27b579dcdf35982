#include "server/http/upload_rows.h"

#include <algorithm>
#include <cmath>
#include <exception>
#include <optional>
#include <thread>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"
#include "corrections/core/time_utc.h"
#include "server/http/problem.h"
#include "server/io/observations_csv.h"
#include "server/io/transect_params_csv.h"

namespace strandline::http {

namespace {

// Column positions by name in a body header; missing required columns are a
// whole-body error (422), unknown columns too (a typo never passes silently).
struct Columns {
  std::vector<std::optional<std::size_t>> at;
  Columns(const std::vector<std::string>& header, const std::vector<std::string>& known,
          const std::vector<std::string>& required) {
    for (const auto& name : known) {
      std::optional<std::size_t> pos;
      for (std::size_t i = 0; i < header.size(); ++i)
        if (header[i] == name) pos = i;
      at.push_back(pos);
    }
    for (const auto& r : required) {
      bool found = false;
      for (const auto& h : header) found = found || h == r;
      if (!found)
        throw Problem(422, problem_type::invalid_body, "Missing column", "missing required column \"" + r + "\"",
                      {{"field", r}});
    }
    for (const auto& h : header) {
      bool found = false;
      for (const auto& k : known) found = found || h == k;
      if (!found)
        throw Problem(422, problem_type::invalid_body, "Unknown column", "unknown column \"" + h + "\"", {{"field", h}});
    }
  }
  std::string_view get(const std::vector<std::string>& fields, std::size_t column) const {
    return at[column] ? std::string_view(fields[*at[column]]) : std::string_view();
  }
};

store::RowIssue structure_issue(const RowSource& s) {
  return {s.line, "", s.json_problem_field.value_or(""), "", s.json_problem};
}

// Parses a required number; records the issue and returns false when invalid.
bool number_field(std::string_view text, const char* name, std::int64_t line, double& out,
                  std::vector<store::RowIssue>& issues, bool optional = false) {
  try {
    if (optional) {
      auto v = parse_optional_number(text);
      out = v ? *v : kUnknown;
    } else {
      out = parse_number(text);
    }
    return true;
  } catch (const FieldError& e) {
    issues.push_back({line, "", name, std::string(text), e.what()});
    return false;
  }
}

bool time_field(std::string_view text, std::int64_t line, TimeS& out, std::vector<store::RowIssue>& issues) {
  try {
    out = parse_time_utc(text);
    return true;
  } catch (const FieldError& e) {
    issues.push_back({line, "", "time", std::string(text), e.what()});
    return false;
  }
}

bool in_range(double v, double lo, double hi, const char* name, std::int64_t line, const std::string& reason,
              std::vector<store::RowIssue>& issues) {
  if (std::isnan(v) || (v >= lo && v <= hi)) return true;
  issues.push_back({line, "", name, std::to_string(v), reason});
  return false;
}

ParsedUpload<store::ObservationRow> parse_observation_part(std::string_view body, BodyFormat format,
                                                           const std::set<std::string>& transects,
                                                           const SensorTable& sensors) {
  static const std::vector<std::string> kColumns = {"transect_id", "time",           "chainage_m",   "sensor",
                                                    "image_id",    "cloud_fraction", "georef_rmse_m"};
  TabularBody table(body, format, kColumns, "observations");
  CsvHeader header(table.header(), "body");
  ObservationColumns columns;
  try {
    columns = ObservationColumns::from_header(header, "body");
  } catch (const InputError& e) {
    throw Problem(422, problem_type::invalid_body, "Invalid columns", e.what());
  }
  ParsedUpload<store::ObservationRow> out;
  out.rows.reserve(body.size() / 48);  // a row is at least ~48 bytes of CSV: no regrowth copies
  ObservationRow row;
  table.for_each([&](const std::vector<std::string>& fields, const RowSource& source) {
    ++out.received;
    if (fields.empty()) {
      out.invalid.push_back(structure_issue(source));
      return;
    }
    if (auto p = validate_observation_row(fields, columns, &sensors, row)) {
      out.invalid.push_back({source.line, "", p->field, p->value, p->reason});
      return;
    }
    if (!transects.count(row.transect_id)) {
      out.invalid.push_back({source.line, "", "transect_id", row.transect_id,
                             "transect not defined for this site (PUT its transects first)"});
      return;
    }
    out.rows.push_back({source.line, row.transect_id, row.image_id, row.sensor, row.time_s, row.chainage_raw_m,
                        row.cloud_fraction, row.georef_rmse_m});
  });
  return out;
}

constexpr std::size_t kSplitBytes = 8u << 20;  // bodies above this are parsed on two threads

// A large CSV body without quotes (so no record spans a line break) splits at a
// line break into two halves parsed at once; the second half gets a copy of the
// header, and its line numbers are shifted back to the body's.
std::optional<ParsedUpload<store::ObservationRow>> parse_in_halves(std::string_view body,
                                                                   const std::set<std::string>& transects,
                                                                   const SensorTable& sensors) {
  if (body.size() < kSplitBytes || body.find('"') != std::string_view::npos) return std::nullopt;
  const auto header_end = body.find('\n');
  if (header_end == std::string_view::npos) return std::nullopt;
  const auto split = body.find('\n', header_end + 1 + (body.size() - header_end) / 2);
  if (split == std::string_view::npos || split + 1 >= body.size()) return std::nullopt;
  const std::string_view first = body.substr(0, split + 1);
  std::string second(body.substr(0, header_end + 1));
  second.append(body.substr(split + 1));
  const auto first_lines = static_cast<std::int64_t>(std::count(first.begin(), first.end(), '\n'));

  ParsedUpload<store::ObservationRow> a, b;
  std::exception_ptr failure;
  std::thread worker([&] {
    try {
      b = parse_observation_part(second, BodyFormat::csv, transects, sensors);
    } catch (...) {
      failure = std::current_exception();
    }
  });
  try {
    a = parse_observation_part(first, BodyFormat::csv, transects, sensors);
  } catch (...) {
    worker.join();
    throw;
  }
  worker.join();
  if (failure) std::rethrow_exception(failure);
  const std::int64_t shift = first_lines - 1;  // the copied header line
  for (auto& r : b.rows) r.line += shift;
  for (auto& i : b.invalid) i.line += shift;
  a.received += b.received;
  a.rows.insert(a.rows.end(), std::make_move_iterator(b.rows.begin()), std::make_move_iterator(b.rows.end()));
  a.invalid.insert(a.invalid.end(), std::make_move_iterator(b.invalid.begin()),
                   std::make_move_iterator(b.invalid.end()));
  return a;
}

}  // namespace

ParsedUpload<store::ObservationRow> parse_observation_upload(std::string_view body, BodyFormat format,
                                                             const std::set<std::string>& transects,
                                                             const SensorTable& sensors) {
  if (format == BodyFormat::csv)
    if (auto halves = parse_in_halves(body, transects, sensors)) return std::move(*halves);
  return parse_observation_part(body, format, transects, sensors);
}

ParsedUpload<store::WaterLevelRow> parse_water_level_upload(std::string_view body, BodyFormat format) {
  static const std::vector<std::string> kColumns = {"time", "level_m"};
  TabularBody table(body, format, kColumns, "water_levels");
  Columns c(table.header(), kColumns, kColumns);
  ParsedUpload<store::WaterLevelRow> out;
  table.for_each([&](const std::vector<std::string>& f, const RowSource& s) {
    ++out.received;
    if (f.empty()) return out.invalid.push_back(structure_issue(s));
    store::WaterLevelRow r{s.line};
    if (!time_field(c.get(f, 0), s.line, r.time_s, out.invalid)) return;
    if (!number_field(c.get(f, 1), "level_m", s.line, r.level_m, out.invalid)) return;
    out.rows.push_back(r);
  });
  return out;
}

ParsedUpload<store::WaveRow> parse_wave_upload(std::string_view body, BodyFormat format) {
  static const std::vector<std::string> kColumns = {"time", "hs_m", "tp_s", "dir_deg", "depth_m"};
  TabularBody table(body, format, kColumns, "waves");
  Columns c(table.header(), kColumns, {"time", "hs_m", "tp_s"});
  ParsedUpload<store::WaveRow> out;
  table.for_each([&](const std::vector<std::string>& f, const RowSource& s) {
    ++out.received;
    if (f.empty()) return out.invalid.push_back(structure_issue(s));
    store::WaveRow r{s.line};
    auto& bad = out.invalid;
    if (!time_field(c.get(f, 0), s.line, r.time_s, bad)) return;
    if (!number_field(c.get(f, 1), "hs_m", s.line, r.hs_m, bad) ||
        !in_range(r.hs_m, 0, 30, "hs_m", s.line, "must lie in [0, 30] m", bad))
      return;
    if (!number_field(c.get(f, 2), "tp_s", s.line, r.tp_s, bad) ||
        !in_range(r.tp_s, 1, 40, "tp_s", s.line, "must lie in [1, 40] s", bad))
      return;
    if (!number_field(c.get(f, 3), "dir_deg", s.line, r.dir_deg, bad, true) ||
        !in_range(r.dir_deg, 0, 360, "dir_deg", s.line, "must lie in [0, 360] degrees", bad))
      return;
    if (!number_field(c.get(f, 4), "depth_m", s.line, r.depth_m, bad, true)) return;
    if (!std::isnan(r.depth_m) && !(r.depth_m > 0)) {
      bad.push_back({s.line, "", "depth_m", std::string(c.get(f, 4)), "must be positive (or empty for deep water)"});
      return;
    }
    out.rows.push_back(r);
  });
  return out;
}

ParsedUpload<store::SlopeRow> parse_slope_upload(std::string_view body, BodyFormat format,
                                                 const std::set<std::string>& transects) {
  static const std::vector<std::string> kColumns = {"transect_id", "slope", "slope_sigma"};
  TabularBody table(body, format, kColumns, "slopes");
  Columns c(table.header(), kColumns, {"transect_id", "slope"});
  ParsedUpload<store::SlopeRow> out;
  table.for_each([&](const std::vector<std::string>& f, const RowSource& s) {
    ++out.received;
    if (f.empty()) return out.invalid.push_back(structure_issue(s));
    store::SlopeRow r{s.line, std::string(c.get(f, 0))};
    auto& bad = out.invalid;
    if (!transects.count(r.transect_id))
      return bad.push_back({s.line, "", "transect_id", r.transect_id, "transect not defined for this site"});
    if (!number_field(c.get(f, 1), "slope", s.line, r.slope, bad)) return;
    if (auto why = slope_problem(r.slope)) return bad.push_back({s.line, "", "slope", std::string(c.get(f, 1)), *why});
    if (!number_field(c.get(f, 2), "slope_sigma", s.line, r.slope_sigma, bad, true)) return;
    if (!std::isnan(r.slope_sigma) && r.slope_sigma < 0)
      return bad.push_back({s.line, "", "slope_sigma", std::string(c.get(f, 2)), "must not be negative"});
    out.rows.push_back(r);
  });
  return out;
}

nlohmann::json row_issue_json(const store::RowIssue& issue, BodyFormat format, const std::string& array_key) {
  nlohmann::json j;
  if (format == BodyFormat::json)
    j["pointer"] = "/" + array_key + "/" + std::to_string(issue.line - 1);
  else
    j["line"] = issue.line;
  if (!issue.key.empty()) j["key"] = issue.key;
  if (!issue.field.empty()) j["field"] = issue.field;
  if (!issue.value.empty()) j["value"] = issue.value;
  j["reason"] = issue.reason;
  return j;
}

}  // namespace strandline::http
