#include "server/app/upload_rows.h"

#include <algorithm>
#include <exception>
#include <thread>
#include <unordered_map>

#include "corrections/core/errors.h"
#include "server/io/observation_rules.h"
#include "server/io/series_rules.h"

namespace strandline::app {

namespace {

store::RowIssue issue_of(const RowProblem& p, std::int64_t line) { return {line, "", p.field, p.value, p.reason}; }

store::RowIssue structure_issue(const RowSource& s) { return {s.line, "", s.problem_field, "", s.problem}; }

void sort_by_line(std::vector<store::RowIssue>& issues) {
  std::stable_sort(issues.begin(), issues.end(), [](const auto& a, const auto& b) { return a.line < b.line; });
}

// Drops the rows whose line is in `refused` (sorted), keeping the order.
template <class Row>
void drop_lines(std::vector<Row>& rows, const std::vector<std::int64_t>& refused) {
  if (refused.empty()) return;
  rows.erase(std::remove_if(rows.begin(), rows.end(),
                            [&](const Row& r) { return std::binary_search(refused.begin(), refused.end(), r.line); }),
             rows.end());
}

// Dense indices for ids in first-seen order; consecutive rows mostly repeat an id.
class Interner {
 public:
  std::uint32_t operator()(const std::string& id) {
    if (last_ && *last_ == id) return last_index_;
    const auto it = index_.emplace(id, static_cast<std::uint32_t>(index_.size())).first;
    last_ = &it->first;
    last_index_ = it->second;
    return last_index_;
  }

 private:
  std::unordered_map<std::string, std::uint32_t> index_;
  const std::string* last_ = nullptr;
  std::uint32_t last_index_ = 0;
};

// The body's header through the kind's column rule: CSV extras are reported as
// ignored (JSON members were, row by row, in TabularBody).
template <class Row>
void note_ignored(ParsedUpload<Row>& out, const TabularBody& table, const std::vector<std::size_t>& extra) {
  for (auto i : extra) out.ignored_columns.push_back(table.header()[i]);
  for (const auto& m : table.ignored_members()) out.ignored_columns.push_back(m);
}

// Per-row rules on one part of a body (a whole body, or half of a large CSV one).
ParsedUpload<store::ObservationRow> parse_observation_part(std::string_view body, BodyFormat format,
                                                           const std::set<std::string>& transects,
                                                           const SensorTable& sensors) {
  TabularBody table(body, format, observation_input_columns(), "observations");
  const ObservationColumns columns = ObservationColumns::from_names(table.header(), "body");
  ParsedUpload<store::ObservationRow> out;
  out.rows.reserve(body.size() / 48);  // a row is at least ~48 bytes of CSV: no regrowth copies
  ObservationRow row;
  table.for_each([&](const std::vector<std::string>& fields, const RowSource& source) {
    ++out.received;
    if (!source.problem.empty()) return out.invalid.push_back(structure_issue(source));
    if (auto p = validate_observation_row(fields, columns, &sensors, row))
      return out.invalid.push_back(issue_of(*p, source.line));
    if (!transects.count(row.transect_id))
      return out.invalid.push_back({source.line, "", "transect_id", row.transect_id,
                                    "transect not defined for this site (PUT its transects first)"});
    out.rows.push_back({source.line, row.transect_id, row.image_id, row.sensor, row.time_s, row.chainage_raw_m,
                        row.cloud_fraction, row.georef_rmse_m});
  });
  note_ignored(out, table, columns.extra);
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

// The whole-body observation rules on the valid rows, in body order.
void apply_observation_file_rules(ParsedUpload<store::ObservationRow>& parsed, BodyFormat format) {
  ObservationFileRules rules([format](std::int64_t line) { return row_place(format, "observations", line); });
  Interner transects, images, sensors;
  ObservationRow row;
  std::vector<std::int64_t> refused;
  for (const auto& r : parsed.rows) {
    row.transect_id = r.transect_id;
    row.image_id = r.image_id;
    row.sensor = r.sensor;
    row.time_s = r.time_s;
    if (auto p = rules.admit(transects(r.transect_id), images(r.image_id), sensors(r.sensor), row, r.line)) {
      parsed.invalid.push_back(issue_of(*p, r.line));
      refused.push_back(r.line);
    }
  }
  drop_lines(parsed.rows, refused);
}

}  // namespace

std::string row_place(BodyFormat format, const std::string& array_key, std::int64_t line) {
  if (format == BodyFormat::json) return "/" + array_key + "/" + std::to_string(line - 1);
  return line_place(line);
}

ParsedUpload<store::ObservationRow> parse_observation_upload(std::string_view body, BodyFormat format,
                                                             const std::set<std::string>& transects,
                                                             const SensorTable& sensors) {
  std::optional<ParsedUpload<store::ObservationRow>> parsed;
  if (format == BodyFormat::csv) parsed = parse_in_halves(body, transects, sensors);
  if (!parsed) parsed = parse_observation_part(body, format, transects, sensors);
  auto& out = *parsed;
  std::sort(out.ignored_columns.begin(), out.ignored_columns.end());
  out.ignored_columns.erase(std::unique(out.ignored_columns.begin(), out.ignored_columns.end()),
                            out.ignored_columns.end());
  apply_observation_file_rules(out, format);
  sort_by_line(out.invalid);
  return std::move(out);
}

ParsedUpload<store::WaterLevelRow> parse_water_level_upload(std::string_view body, BodyFormat format) {
  TabularBody table(body, format, water_level_input_columns(), "water_levels");
  const ResolvedColumns c = resolve_columns(table.header(), water_level_input_columns(), "body");
  WaterLevelFileRules rules([format](std::int64_t line) { return row_place(format, "water_levels", line); });
  ParsedUpload<store::WaterLevelRow> out;
  WaterLevelSample sample;
  table.for_each([&](const std::vector<std::string>& f, const RowSource& s) {
    ++out.received;
    if (!s.problem.empty()) return out.invalid.push_back(structure_issue(s));
    const std::string& time_text = f[*c.at[0]];
    if (auto p = water_level_row(time_text, f[*c.at[1]], sample)) return out.invalid.push_back(issue_of(*p, s.line));
    if (auto p = rules.admit(sample, time_text, s.line)) return out.invalid.push_back(issue_of(*p, s.line));
    out.rows.push_back({s.line, sample.time_s, sample.level_m});
  });
  std::vector<std::int64_t> refused;
  for (const auto& p : rules.finish()) {
    if (p.line == 0) {
      out.record_problem = p.reason;
      continue;
    }
    out.invalid.push_back(issue_of(p, p.line));
    refused.push_back(p.line);
  }
  drop_lines(out.rows, refused);
  sort_by_line(out.invalid);
  return out;
}

ParsedUpload<store::WaveRow> parse_wave_upload(std::string_view body, BodyFormat format) {
  TabularBody table(body, format, wave_input_columns(), "waves");
  const ResolvedColumns c = resolve_columns(table.header(), wave_input_columns(), "body");
  WaveFileRules rules([format](std::int64_t line) { return row_place(format, "waves", line); });
  ParsedUpload<store::WaveRow> out;
  WaveFields w;
  table.for_each([&](const std::vector<std::string>& f, const RowSource& s) {
    ++out.received;
    if (!s.problem.empty()) return out.invalid.push_back(structure_issue(s));
    auto cell = [&](std::size_t spec) { return c.at[spec] ? std::string_view(f[*c.at[spec]]) : std::string_view(); };
    const WaveSampleText text{cell(0), cell(1), cell(2), cell(3), cell(4)};
    if (auto p = wave_row(text, w)) return out.invalid.push_back(issue_of(*p, s.line));
    if (auto p = rules.admit(w, text, s.line)) return out.invalid.push_back(issue_of(*p, s.line));
    out.rows.push_back({s.line, w.time_s, w.hs_m, w.tp_s, w.dir_deg, w.depth_m});
  });
  if (auto p = rules.finish()) out.record_problem = p->reason;
  return out;
}

ParsedUpload<store::SlopeRow> parse_slope_upload(std::string_view body, BodyFormat format,
                                                 const std::set<std::string>& transects) {
  TabularBody table(body, format, slope_input_columns(false), "slopes");
  const ResolvedColumns c = resolve_columns(table.header(), slope_input_columns(false), "body");
  SlopeFileRules rules([format](std::int64_t line) { return row_place(format, "slopes", line); });
  ParsedUpload<store::SlopeRow> out;
  SlopeFields slope;
  table.for_each([&](const std::vector<std::string>& f, const RowSource& s) {
    ++out.received;
    if (!s.problem.empty()) return out.invalid.push_back(structure_issue(s));
    const std::string_view sigma = c.at[2] ? std::string_view(f[*c.at[2]]) : std::string_view();
    if (auto p = slope_row(f[*c.at[0]], f[*c.at[1]], sigma, true, slope))
      return out.invalid.push_back(issue_of(*p, s.line));
    if (!transects.count(slope.transect_id))
      return out.invalid.push_back({s.line, "", "transect_id", slope.transect_id, "transect not defined for this site"});
    if (auto p = rules.admit(slope.transect_id, s.line)) return out.invalid.push_back(issue_of(*p, s.line));
    out.rows.push_back({s.line, slope.transect_id, slope.slope, slope.slope_sigma});
  });
  return out;
}

}  // namespace strandline::app
