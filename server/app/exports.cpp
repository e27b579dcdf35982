#include "server/app/exports.h"

#include <iostream>
#include <memory>
#include <unordered_map>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"
#include "server/geo/plain_table_io.h"
#include "server/geo/result_writer.h"
#include "server/geo/transect_reader.h"
#include "server/io/atomic_file.h"

namespace strandline::app {

geo::TransectSet attach_transect_geometry(const std::string& path, SiteTable& table) {
  geo::TransectSet set = geo::read_transects(path, {});
  std::unordered_map<std::string, const TransectGeometry*> by_id;
  for (const auto& t : set.transects) by_id.emplace(t.id, &t.geometry);
  std::size_t missing = 0;
  std::string missing_ids;  // the first few, for the message
  for (TransectInfo& t : table.transects) {
    auto it = by_id.find(t.id);
    if (it == by_id.end()) {
      if (++missing <= 5) missing_ids += (missing_ids.empty() ? "" : ", ") + t.id;
    } else {
      t.geometry = *it->second;
    }
  }
  // Not one id in common: the wrong file, or ids spelt differently. Every output would
  // lack geometry (it was exit 0 with points without geometry).
  if (!table.transects.empty() && missing == table.transects.size()) {
    std::string file_ids;
    for (std::size_t k = 0; k < set.transects.size() && k < 5; ++k)
      file_ids += (k ? ", " : "") + set.transects[k].id;
    throw InputError(path + ": none of the observations' transect ids (" + missing_ids +
                     (missing > 5 ? ", ..." : "") + ") is in this file (its ids: " +
                     (file_ids.empty() ? "none" : file_ids) + (set.transects.size() > 5 ? ", ..." : "") + ")");
  }
  std::cerr << "work CRS: " << set.crs.name << (set.crs.authority.empty() ? "" : " (" + set.crs.authority + ")")
            << " - " << set.crs.choice << "\n";
  if (missing)
    std::cerr << "warning: " << missing << " transects of the observations are not in " << path << " ("
              << missing_ids << (missing > 5 ? ", ..." : "") << "): their points have no geometry\n";
  return set;
}

std::vector<geo::Cell> point_cells(const std::vector<CellValue>& values, const std::vector<ColumnSpec>& columns) {
  std::vector<geo::Cell> cells(columns.size());
  for (std::size_t c = 0; c < columns.size(); ++c) {
    const std::string text = format_cell(values[c], columns[c]);
    if (text.empty()) continue;  // unknown: null
    if (columns[c].kind == ColumnSpec::Kind::text) cells[c] = text;
    else cells[c] = parse_number(text);  // the CSV's rounding
  }
  return cells;
}

void append_result_points(geo::PlainTable& points, const std::vector<CleanedRow>& rows) {
  const auto& columns = cleaned_columns();
  if (points.columns.empty())
    for (const auto& c : columns) points.columns.push_back(c.name);
  std::vector<CellValue> values;
  for (const auto& r : rows) {
    cleaned_values(r, values);
    points.rows.push_back(point_cells(values, columns));
  }
}

void write_cleaned_geodata(const CleanedRowStream& rows, const geo::TransectSet& transects,
                           const nlohmann::json& summary, const std::string& out_path,
                           const std::string& rejected_path) {
  const auto cols = rows.columns();
  geo::PlainTable points;
  for (const auto& c : cols) points.columns.push_back(c.name);
  RejectedRowsFile rejected(rejected_path, rows.input_header());
  rows.stream(
      [&](std::size_t, const std::vector<CellValue>& values) { points.rows.push_back(point_cells(values, cols)); },
      [&](const std::vector<std::string>& fields, const RowProblem& p) { rejected.add(fields, p); });
  const geo::PlainTable per_transect = geo::summary_plain_table(summary, "summary");
  geo::GeoLayers layers;
  layers.points = &points;
  layers.transect_summary = &per_transect;
  const auto report = geo::write_geo_layers(out_path, transects, layers);
  rejected.commit();
  std::cerr << "geodata: " << report.points << " points (" << report.points_without_geometry
            << " without geometry), " << report.transects << " transects in";
  for (const auto& f : report.files) std::cerr << " " << f;
  std::cerr << "\n";
}

}  // namespace strandline::app
