#include "server/io/cleaned_rows.h"

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <stdexcept>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"
#include "server/io/atomic_file.h"

namespace strandline {

const std::vector<ColumnSpec>& cleaned_columns() {
  using K = ColumnSpec::Kind;
  static const std::vector<ColumnSpec> columns = {
      {"transect_id", K::text},         {"time", K::text},
      {"sensor", K::text},              {"image_id", K::text},
      {"chainage_raw_m", K::real, 3},   {"water_level_m", K::real, 3},
      {"setup_m", K::real, 3},          {"runup_m", K::real, 3},
      {"wave_level_m", K::real, 3},     {"z_ref_m", K::real, 3},
      {"slope", K::real, 5},            {"correction_m", K::real, 3},
      {"chainage_m", K::real, 3},       {"sigma_m", K::real, 2},
      {"sigma_sensor_m", K::real, 2},   {"sigma_water_level_m", K::real, 2},
      {"sigma_slope_m", K::real, 2},    {"sigma_wave_m", K::real, 2},
      {"cloud_fraction", K::real, 3},   {"georef_rmse_m", K::real, 2},
      {"flags", K::text},               {"accepted", K::integer},
      // Appended (formats reference, Compatibility): the applied sensor offset and its term.
      {"sensor_offset_m", K::real, 3},  {"sigma_sensor_offset_m", K::real, 2},
  };
  return columns;
}

namespace {
CellValue real(double v) { return known(v) ? CellValue{v} : CellValue{}; }

// JSON carries the CSV's value: the number the CSV text spells, so both
// formats agree to the last digit (a rounding of its own would differ on ties)
// and no reply spends 17 digits on a position known to a few metres.
double as_written(double v, int decimals) {
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.*f", decimals, v);
  return std::strtod(buf, nullptr);
}
}  // namespace

void cleaned_values(const CleanedRow& r, std::vector<CellValue>& out) {
  out.clear();
  out.emplace_back(r.transect_id);
  out.emplace_back(format_time_utc(r.time_s));
  out.emplace_back(r.sensor);
  out.emplace_back(r.image_id);
  for (double v : {r.chainage_raw_m, r.water_level_m, r.setup_m, r.runup_m, r.wave_level_m, r.z_ref_m, r.slope,
                   r.correction_m, r.chainage_m, r.sigma_m, r.sigma_sensor_m, r.sigma_water_level_m, r.sigma_slope_m,
                   r.sigma_wave_m, r.cloud_fraction, r.georef_rmse_m})
    out.push_back(real(v));
  out.emplace_back(flag_list(r.flags));
  out.emplace_back(std::int64_t{r.accepted ? 1 : 0});
  out.push_back(real(r.sensor_offset_m));
  out.push_back(real(r.sigma_sensor_offset_m));
}

nlohmann::json cleaned_row_json(const CleanedRow& r) {
  std::vector<CellValue> values;
  cleaned_values(r, values);
  const auto& cols = cleaned_columns();
  nlohmann::json j = nlohmann::json::object();
  for (std::size_t c = 0; c < cols.size(); ++c) {
    const auto& v = values[c];
    if (cols[c].name == "flags") {
      nlohmann::json names = nlohmann::json::array();
      for (auto n : flag_names(r.flags)) names.push_back(std::string(n));
      j["flags"] = names;
    } else if (cols[c].name == "accepted") {
      j["accepted"] = r.accepted;
    } else if (std::holds_alternative<std::monostate>(v)) {
      j[cols[c].name] = nullptr;
    } else if (auto* d = std::get_if<double>(&v)) {
      j[cols[c].name] = as_written(*d, cols[c].decimals);
    } else if (auto* n = std::get_if<std::int64_t>(&v)) {
      j[cols[c].name] = *n;
    } else {
      j[cols[c].name] = std::get<std::string>(v);
    }
  }
  return j;
}

std::string format_cell(const CellValue& value, const ColumnSpec& spec) {
  if (std::holds_alternative<std::monostate>(value)) return "";
  if (auto* d = std::get_if<double>(&value)) {
    char buf[64];
    std::snprintf(buf, sizeof buf, "%.*f", spec.decimals, *d);
    return buf;
  }
  if (auto* n = std::get_if<std::int64_t>(&value)) return std::to_string(*n);
  return std::get<std::string>(value);
}

void append_csv_record(std::string& out, const std::vector<CellValue>& values, const std::vector<ColumnSpec>& columns) {
  for (std::size_t c = 0; c < columns.size(); ++c) {
    if (c) out += ',';
    out += columns[c].kind == ColumnSpec::Kind::text ? csv_escape(format_cell(values[c], columns[c]))
                                                      : format_cell(values[c], columns[c]);
  }
  out += '\n';
}

std::string cleaned_rows_csv(const std::vector<CleanedRow>& rows) {
  const auto& columns = cleaned_columns();
  std::string out;
  for (std::size_t c = 0; c < columns.size(); ++c) out += (c ? "," : "") + columns[c].name;
  out += '\n';
  std::vector<CellValue> values;
  for (const auto& r : rows) {
    cleaned_values(r, values);
    append_csv_record(out, values, columns);
  }
  return out;
}

nlohmann::json cleaned_rows_json(const std::vector<CleanedRow>& rows) {
  nlohmann::json out = nlohmann::json::array();
  for (const auto& r : rows) out.push_back(cleaned_row_json(r));
  return out;
}

CleanedRowStream::CleanedRowStream(const std::string& input_path, const ObservationFile& observations,
                                   const SiteTable& table)
    : input_path_(input_path), observations_(observations), table_(table) {
  table_row_of_input_.assign(observations.data_rows, -1);
  for (std::size_t i = 0; i < table.size(); ++i) table_row_of_input_.at(table.input_row[i]) = static_cast<std::int64_t>(i);
}

std::vector<ColumnSpec> CleanedRowStream::columns() const {
  std::vector<ColumnSpec> cols = cleaned_columns();
  for (auto c : observations_.columns.extra) {
    std::string name = observations_.header[c];
    // An input column that shares an engine column's name is kept under a prefix.
    for (const auto& e : cleaned_columns())
      if (e.name == name) name = "input_" + name;
    cols.push_back({name, ColumnSpec::Kind::text});
  }
  return cols;
}

void CleanedRowStream::stream(const RowFn& on_row, const RejectedFn& on_rejected) const {
  std::ifstream in(input_path_, std::ios::binary);
  if (!in) throw std::runtime_error("cannot re-read " + input_path_);
  CsvReader reader(in, input_path_);
  std::vector<std::string> fields;
  reader.next(fields);  // header
  std::vector<CellValue> values;
  std::size_t rejected_index = 0;
  for (std::size_t data_row = 0; data_row < table_row_of_input_.size(); ++data_row) {
    if (!reader.next(fields)) throw std::runtime_error(input_path_ + " changed while it was being processed");
    const std::int64_t row = table_row_of_input_[data_row];
    if (row < 0) {
      while (rejected_index < observations_.rejected.size() &&
             observations_.rejected[rejected_index].input_row < data_row)
        ++rejected_index;
      static const RowProblem unknown{0, "", "", "rejected"};
      const RowProblem& p = rejected_index < observations_.rejected.size() &&
                                    observations_.rejected[rejected_index].input_row == data_row
                                ? observations_.rejected[rejected_index].problem
                                : unknown;
      if (on_rejected) on_rejected(fields, p);
      continue;
    }
    cleaned_values(cleaned_row(table_, static_cast<std::size_t>(row)), values);
    for (auto c : observations_.columns.extra) values.emplace_back(c < fields.size() ? fields[c] : std::string());
    on_row(static_cast<std::size_t>(row), values);
  }
}

RejectedRowsFile::RejectedRowsFile(const std::string& path, const std::vector<std::string>& input_header) {
  if (path.empty()) return;
  file_ = std::make_unique<AtomicFile>(path);
  auto& r = file_->stream();
  r << "line,field,value,reason";
  for (const auto& h : input_header) r << ',' << csv_escape(h);
  r << '\n';
}

RejectedRowsFile::~RejectedRowsFile() = default;

void RejectedRowsFile::add(const std::vector<std::string>& input_fields, const RowProblem& p) {
  if (!file_) return;
  auto& r = file_->stream();
  r << p.line << ',' << csv_escape(p.field) << ',' << csv_escape(p.value) << ',' << csv_escape(p.reason);
  for (const auto& f : input_fields) r << ',' << csv_escape(f);
  r << '\n';
}

void RejectedRowsFile::commit() {
  if (file_) file_->commit();
}

void write_cleaned_csv(const CleanedRowStream& rows, const std::string& out_path, const std::string& rejected_path) {
  const auto cols = rows.columns();
  AtomicFile out(out_path);
  auto& o = out.stream();
  for (std::size_t c = 0; c < cols.size(); ++c) o << (c ? "," : "") << csv_escape(cols[c].name);
  o << '\n';
  RejectedRowsFile rejected(rejected_path, rows.input_header());
  std::string line;
  rows.stream(
      [&](std::size_t, const std::vector<CellValue>& values) {
        line.clear();
        append_csv_record(line, values, cols);
        o << line;
      },
      [&](const std::vector<std::string>& fields, const RowProblem& p) { rejected.add(fields, p); });
  out.commit();
  rejected.commit();
}

}  // namespace strandline
