// The cleaned-output row model shared by every writer (CSV here, GeoPackage and
// GeoJSON in server/geo, JSON over HTTP): the engine's columns for a table row,
// then the input's carried-through columns. Unknown values are empty cells in
// CSV and null in JSON; flags are `;`-joined in CSV and arrays in JSON.
#pragma once

#include <cstdint>
#include <functional>
#include <memory>
#include <string>
#include <variant>
#include <vector>

#include <nlohmann/json.hpp>

#include "corrections/core/cleaned_row.h"
#include "corrections/core/site_table.h"
#include "server/io/atomic_file.h"
#include "server/io/observations_csv.h"

namespace strandline {

using CellValue = std::variant<std::monostate, double, std::int64_t, std::string>;

struct ColumnSpec {
  std::string name;
  enum class Kind { text, real, integer } kind;
  int decimals = 3;  // for real columns in text outputs (CSV and JSON)
};

// The engine's columns, in output order.
const std::vector<ColumnSpec>& cleaned_columns();

// Values of the engine's columns for one row (same order as cleaned_columns()).
void cleaned_values(const CleanedRow& row, std::vector<CellValue>& out);

// One row as JSON (flags as an array, unknown values null, sigma terms listed,
// reals rounded to the column's decimals as in CSV).
nlohmann::json cleaned_row_json(const CleanedRow& row);

// Text form of a cell (reals to the column's decimals; unknown = empty), not
// escaped: the CSV writer escapes, other writers take the text as it is.
std::string format_cell(const CellValue& value, const ColumnSpec& spec);

// Appends one CSV record (each cell escaped once, RFC 4180) and a line break.
void append_csv_record(std::string& out, const std::vector<CellValue>& values, const std::vector<ColumnSpec>& columns);

// A transect's rows as CSV with a header line, and as a JSON array.
std::string cleaned_rows_csv(const std::vector<CleanedRow>& rows);
nlohmann::json cleaned_rows_json(const std::vector<CleanedRow>& rows);

// Streams the observation file again, in input order, joining each valid row
// with its table row (extra columns carried through) and each rejected row with
// its problem. Memory stays bounded by the table: input text is never held.
class CleanedRowStream {
 public:
  CleanedRowStream(const std::string& input_path, const ObservationFile& observations, const SiteTable& table);

  // Engine columns followed by the input's extra columns.
  std::vector<ColumnSpec> columns() const;
  const std::vector<std::string>& input_header() const { return observations_.header; }

  using RowFn = std::function<void(std::size_t table_row, const std::vector<CellValue>& values)>;
  using RejectedFn = std::function<void(const std::vector<std::string>& input_fields, const RowProblem& problem)>;
  void stream(const RowFn& on_row, const RejectedFn& on_rejected) const;

 private:
  std::string input_path_;
  const ObservationFile& observations_;
  const SiteTable& table_;
  std::vector<std::int64_t> table_row_of_input_;  // -1 for rejected rows
};

// The rejected-rows file of a batch run (`line,field,value,reason` followed by
// the input's fields), written atomically; no file when the path is empty.
class RejectedRowsFile {
 public:
  RejectedRowsFile(const std::string& path, const std::vector<std::string>& input_header);
  ~RejectedRowsFile();
  void add(const std::vector<std::string>& input_fields, const RowProblem& problem);
  void commit();

 private:
  std::unique_ptr<AtomicFile> file_;
};

// Writes cleaned.csv (every valid row) and, when `rejected_path` is not empty,
// the rejected rows with their reasons; both atomically.
void write_cleaned_csv(const CleanedRowStream& rows, const std::string& out_path, const std::string& rejected_path);

}  // namespace strandline
