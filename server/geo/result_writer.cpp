#include "server/geo/result_writer.h"

#include <charconv>
#include <filesystem>
#include <unordered_map>

#include "corrections/core/errors.h"
#include "server/geo/gdal_support.h"
#include "server/geo/layer_sink.h"

namespace strandline::geo {

std::optional<std::size_t> PlainTable::column(const std::string& name) const {
  for (std::size_t i = 0; i < columns.size(); ++i)
    if (columns[i] == name) return i;
  return std::nullopt;
}

std::optional<GeoFormat> geo_format_for(const std::string& path) {
  const std::string ext = std::filesystem::path(path).extension().string();
  if (ext == ".gpkg") return GeoFormat::geopackage;
  if (ext == ".geojson") return GeoFormat::geojson;
  return std::nullopt;
}

std::string geojson_transects_path(const std::string& points_path) {
  std::filesystem::path p(points_path);
  return (p.parent_path() / (p.stem().string() + "_transects" + p.extension().string())).string();
}

namespace {

// A column is numeric when every non-null cell is a number.
std::vector<OGRFieldType> column_types(const PlainTable& t) {
  std::vector<OGRFieldType> types(t.columns.size(), OFTReal);
  for (const auto& row : t.rows)
    for (std::size_t c = 0; c < row.size() && c < types.size(); ++c)
      if (std::holds_alternative<std::string>(row[c])) types[c] = OFTString;
  return types;
}

std::string number_text(double v) {
  char buf[32];
  auto r = std::to_chars(buf, buf + sizeof buf, v);
  return std::string(buf, r.ptr);
}

void set_cell(OGRFeature& f, int field, const Cell& cell, OGRFieldType type) {
  if (std::holds_alternative<std::monostate>(cell)) {
    f.SetFieldNull(field);
  } else if (const double* v = std::get_if<double>(&cell)) {
    if (!known(*v)) f.SetFieldNull(field);
    else if (type == OFTReal) f.SetField(field, *v);
    else f.SetField(field, number_text(*v).c_str());
  } else {
    f.SetField(field, std::get<std::string>(cell).c_str());
  }
}

std::string cell_text(const Cell& cell) {
  if (const auto* s = std::get_if<std::string>(&cell)) return *s;
  if (const auto* v = std::get_if<double>(&cell)) return known(*v) ? number_text(*v) : "";
  return "";
}

void add_fields(OGRLayer& layer, const std::vector<std::string>& names, const std::vector<OGRFieldType>& types,
                const std::string& path) {
  for (std::size_t c = 0; c < names.size(); ++c) {
    OGRFieldDefn defn(names[c].c_str(), types[c]);
    if (layer.CreateField(&defn) != OGRERR_NONE)
      throw InputError(path + ": cannot create field " + names[c] + " in layer " + layer.GetName());
  }
}

void write_points(LayerSink& sink, const std::string& path, const TransectSet& transects, const GeoLayers& layers,
                  GeoWriteReport& report) {
  const PlainTable& table = *layers.points;
  const auto id_col = table.column(layers.transect_id_column);
  const auto chainage_col = table.column(layers.chainage_column);
  if (!id_col || !chainage_col)
    throw InputError("point table for " + path + ": needs columns " + layers.transect_id_column + " and " +
                     layers.chainage_column);
  std::unordered_map<std::string, const TransectGeometry*> geometry_of;
  for (const auto& t : transects.transects) geometry_of.emplace(t.id, &t.geometry);

  OGRLayer& layer = sink.create_layer(layers.points_layer, wkbPoint);
  const auto types = column_types(table);
  add_fields(layer, table.columns, types, path);
  for (std::size_t r = 0; r < table.rows.size(); ++r) {
    const auto& row = table.rows[r];
    if (row.size() != table.columns.size())
      throw InputError("point table for " + path + ": row " + std::to_string(r + 1) + " has " +
                       std::to_string(row.size()) + " cells for " + std::to_string(table.columns.size()) + " columns");
    FeaturePtr f(OGRFeature::CreateFeature(layer.GetLayerDefn()));
    for (std::size_t c = 0; c < row.size(); ++c) set_cell(*f, static_cast<int>(c), row[c], types[c]);
    const auto it = geometry_of.find(cell_text(row[*id_col]));
    const double* chainage = std::get_if<double>(&row[*chainage_col]);
    if (it != geometry_of.end() && it->second->present() && chainage && known(*chainage)) {
      const XY p = sink.place(point_at_chainage(*it->second, *chainage));
      f->SetGeometryDirectly(new OGRPoint(p.x, p.y));
    } else {
      ++report.points_without_geometry;
    }
    sink.add(layer, *f);
    ++report.points;
  }
}

void write_transects(LayerSink& sink, const std::string& path, const TransectSet& transects,
                     const GeoLayers& layers, GeoWriteReport& report) {
  OGRLayer& layer = sink.create_layer(layers.transects_layer, wkbLineString);
  std::vector<std::string> names = {layers.transect_id_column, "azimuth_deg", "length_m"};
  std::vector<OGRFieldType> types = {OFTString, OFTReal, OFTReal};
  // Summary columns (the id column is matched, not repeated).
  std::unordered_map<std::string, std::size_t> summary_row;
  std::vector<std::size_t> summary_cols;
  std::vector<OGRFieldType> summary_types;
  if (const PlainTable* s = layers.transect_summary) {
    const auto id_col = s->column(layers.transect_id_column);
    if (!id_col) throw InputError("summary table for " + path + ": needs column " + layers.transect_id_column);
    summary_types = column_types(*s);
    for (std::size_t c = 0; c < s->columns.size(); ++c) {
      if (c == *id_col || s->columns[c] == "azimuth_deg" || s->columns[c] == "length_m") continue;
      summary_cols.push_back(c);
      names.push_back(s->columns[c]);
      types.push_back(summary_types[c]);
    }
    for (std::size_t r = 0; r < s->rows.size(); ++r) summary_row.emplace(cell_text(s->rows[r][*id_col]), r);
  }
  add_fields(layer, names, types, path);
  for (const GeoTransect& t : transects.transects) {
    FeaturePtr f(OGRFeature::CreateFeature(layer.GetLayerDefn()));
    f->SetField(0, t.id.c_str());
    set_cell(*f, 1, t.geometry.azimuth_deg, OFTReal);
    set_cell(*f, 2, t.geometry.length_m, OFTReal);
    if (auto it = summary_row.find(t.id); it != summary_row.end()) {
      const auto& row = layers.transect_summary->rows[it->second];
      for (std::size_t k = 0; k < summary_cols.size(); ++k)
        set_cell(*f, static_cast<int>(3 + k), row[summary_cols[k]], summary_types[summary_cols[k]]);
    }
    if (t.geometry.present() && known(t.geometry.length_m)) {
      auto line = new OGRLineString();
      const XY a = sink.place({t.geometry.origin_x_m, t.geometry.origin_y_m});
      const XY b = sink.place(point_at_chainage(t.geometry, t.geometry.length_m));
      line->addPoint(a.x, a.y);
      line->addPoint(b.x, b.y);
      f->SetGeometryDirectly(line);
    }
    sink.add(layer, *f);
    ++report.transects;
  }
}

}  // namespace

GeoWriteReport write_geo_layers(const std::string& path, const TransectSet& transects, const GeoLayers& layers) {
  const auto format = geo_format_for(path);
  if (!format) throw ArgumentError(path + ": unknown geodata format (use .gpkg or .geojson)");
  GeoWriteReport report;
  if (*format == GeoFormat::geopackage) {
    LayerSink sink(*format, path, transects.crs, report.files);
    if (layers.points) write_points(sink, path, transects, layers, report);
    write_transects(sink, path, transects, layers, report);
    sink.finish();
  } else if (layers.points) {
    LayerSink points(*format, path, transects.crs, report.files);
    write_points(points, path, transects, layers, report);
    points.finish();
    const std::string sibling = geojson_transects_path(path);
    LayerSink lines(*format, sibling, transects.crs, report.files);
    write_transects(lines, sibling, transects, layers, report);
    lines.finish();
  } else {
    LayerSink lines(*format, path, transects.crs, report.files);
    write_transects(lines, path, transects, layers, report);
    lines.finish();
  }
  return report;
}

}  // namespace strandline::geo
