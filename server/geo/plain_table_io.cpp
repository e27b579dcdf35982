#include "server/geo/plain_table_io.h"

#include <fstream>
#include <set>
#include <unordered_map>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"

namespace strandline::geo {

PlainTable read_csv_plain_table(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path + ": cannot open");
  CsvTable csv(in, path);
  PlainTable table;
  table.columns = csv.header().names();
  const std::set<std::string> text_columns = {"transect_id", "image_id", "sensor", "time", "flags"};
  std::vector<bool> numeric(table.columns.size());
  for (std::size_t c = 0; c < numeric.size(); ++c) numeric[c] = !text_columns.count(table.columns[c]);
  std::vector<std::vector<std::string>> text_rows;
  std::vector<std::string> fields;
  while (csv.next(fields)) {
    for (std::size_t c = 0; c < fields.size(); ++c) {
      if (!numeric[c]) continue;
      try {
        parse_optional_number(fields[c]);
      } catch (const FieldError&) {
        numeric[c] = false;
      }
    }
    text_rows.push_back(fields);
  }
  table.rows.reserve(text_rows.size());
  for (const auto& row : text_rows) {
    std::vector<Cell> cells(row.size());
    for (std::size_t c = 0; c < row.size(); ++c) {
      if (row[c].empty()) continue;  // null
      if (numeric[c]) cells[c] = *parse_optional_number(row[c]);
      else cells[c] = row[c];
    }
    table.rows.push_back(std::move(cells));
  }
  return table;
}

namespace {

std::optional<Cell> scalar_cell(const nlohmann::json& v) {
  if (v.is_null()) return Cell{};
  if (v.is_number()) return Cell{v.get<double>()};
  if (v.is_string()) return Cell{v.get<std::string>()};
  if (v.is_boolean()) return Cell{std::string(v.get<bool>() ? "true" : "false")};
  return std::nullopt;
}

}  // namespace

PlainTable summary_plain_table(const nlohmann::json& summary, const std::string& file) {
  if (!summary.is_object() || !summary.contains("transects") || !summary["transects"].is_array())
    throw InputError(file + ": /transects: expected an array of per-transect summaries");
  PlainTable table;
  std::unordered_map<std::string, std::size_t> column_of;
  std::vector<std::unordered_map<std::size_t, Cell>> sparse;
  auto put = [&](std::unordered_map<std::size_t, Cell>& row, const std::string& name, Cell cell) {
    auto [it, fresh] = column_of.try_emplace(name, table.columns.size());
    if (fresh) table.columns.push_back(name);
    row[it->second] = std::move(cell);
  };
  for (std::size_t i = 0; i < summary["transects"].size(); ++i) {
    const auto& t = summary["transects"][i];
    if (!t.is_object()) throw InputError(file + ": /transects/" + std::to_string(i) + ": expected an object");
    if (!t.contains("transect_id"))
      throw InputError(file + ": /transects/" + std::to_string(i) + ": missing transect_id");
    auto& row = sparse.emplace_back();
    for (const auto& [key, value] : t.items()) {
      if (auto cell = scalar_cell(value)) {
        put(row, key, *cell);
      } else if (value.is_array() && value.size() == 2 && value[0].is_number() && value[1].is_number()) {
        put(row, key + "_low", value[0].get<double>());
        put(row, key + "_high", value[1].get<double>());
      } else if (value.is_object() && value.size() <= 32) {
        for (const auto& [sub, sub_value] : value.items())
          if (auto cell = scalar_cell(sub_value)) put(row, key + "_" + sub, *cell);
      }
    }
  }
  for (auto& s : sparse) {
    std::vector<Cell> cells(table.columns.size());
    for (auto& [c, cell] : s) cells[c] = std::move(cell);
    table.rows.push_back(std::move(cells));
  }
  return table;
}

}  // namespace strandline::geo
