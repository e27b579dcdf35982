#include "server/geo/transect_reader.h"

#include <cmath>
#include <numbers>
#include <unordered_map>

#include "corrections/core/errors.h"
#include "server/geo/gdal_support.h"
#include "server/geo/work_crs.h"

namespace strandline::geo {

namespace {

// A transect as read, in the layer's CRS, before the work CRS is known.
struct RawTransect {
  std::string id;
  std::int64_t fid;
  std::vector<XY> vertices;  // lines: all vertices; points: the origin only
  double azimuth_deg = kUnknown;
  double length_m = kUnknown;
};

double azimuth_of(XY from, XY to) {
  double a = std::atan2(to.x - from.x, to.y - from.y) * 180.0 / std::numbers::pi;
  return a < 0 ? a + 360.0 : a;
}

double normalised_azimuth(double a) {
  a = std::fmod(a, 360.0);
  return a < 0 ? a + 360.0 : a;
}

// Largest distance of an interior vertex from the chord first-last.
double max_offset_from_chord(const std::vector<XY>& v) {
  const XY a = v.front(), b = v.back();
  const double dx = b.x - a.x, dy = b.y - a.y, len = std::hypot(dx, dy);
  double worst = 0;
  for (std::size_t i = 1; i + 1 < v.size(); ++i) {
    const double cross = (v[i].x - a.x) * dy - (v[i].y - a.y) * dx;
    const double along = ((v[i].x - a.x) * dx + (v[i].y - a.y) * dy) / len;
    double off = std::abs(cross) / len;
    if (along < 0) off = std::max(off, -along);          // behind the origin
    if (along > len) off = std::max(off, along - len);  // beyond the end
    worst = std::max(worst, off);
  }
  return worst;
}

}  // namespace

TransectSet read_transects(const std::string& path, const TransectReadOptions& options) {
  DatasetPtr ds = open_vector(path, "transects file", options.drivers);
  OGRLayer& layer = pick_layer(*ds, path, options.layer);
  const std::string label = layer_label(path, layer);
  const std::optional<CrsInfo> crs = layer_crs(layer);
  if (!crs) throw InputError(label + ": the layer has no CRS (add one, e.g. a .prj file or the layer's SRS)");
  const int id_index = require_field(layer, options.id_field, label, "transect id");
  const std::optional<int> azimuth_index = find_field(layer, options.azimuth_field);
  const std::optional<int> length_index = find_field(layer, options.length_field);

  std::vector<RawTransect> raw;
  std::unordered_map<std::string, std::int64_t> fid_of_id;
  std::vector<XY> all_points;
  layer.ResetReading();
  for (FeaturePtr f(layer.GetNextFeature()); f; f.reset(layer.GetNextFeature())) {
    RawTransect t;
    t.fid = f->GetFID();
    const std::string where = feature_label(path, layer, t.fid);
    auto id = field_text(*f, id_index);
    if (!id || id->empty()) throw InputError(where + ": empty transect id (" + options.id_field + ")");
    t.id = *id;
    if (auto [it, fresh] = fid_of_id.try_emplace(t.id, t.fid); !fresh)
      throw InputError(where + ": transect id \"" + t.id + "\" already used by feature FID " +
                       std::to_string(it->second));
    const OGRGeometry* g = f->GetGeometryRef();
    if (!g || g->IsEmpty()) throw InputError(where + ": empty geometry");
    if (wkbFlatten(g->getGeometryType()) == wkbPoint) {
      const OGRPoint* p = g->toPoint();
      t.vertices = {{p->getX(), p->getY()}};
      if (!azimuth_index) require_field(layer, options.azimuth_field, label, "azimuth of point transects");
      if (!length_index) require_field(layer, options.length_field, label, "length of point transects");
      auto az = field_number(*f, *azimuth_index, where);
      auto len = field_number(*f, *length_index, where);
      if (!az) throw InputError(where + ": " + options.azimuth_field + " is empty");
      if (!len) throw InputError(where + ": " + options.length_field + " is empty");
      if (!(*len > 0)) throw InputError(where + ": " + options.length_field + " must be positive");
      t.azimuth_deg = normalised_azimuth(*az);
      t.length_m = *len;
    } else {
      auto parts = line_parts(g, where);
      if (parts.size() != 1)
        throw InputError(where + ": a transect must be one line, this one has " + std::to_string(parts.size()) +
                         " parts");
      t.vertices = std::move(parts.front());
    }
    all_points.insert(all_points.end(), t.vertices.begin(), t.vertices.end());
    raw.push_back(std::move(t));
  }
  if (raw.empty()) throw InputError(label + ": no transects");

  TransectSet set;
  set.source = label;
  set.crs = choose_work_crs(*crs, options.crs, all_points, label);
  const bool same_crs = set.crs.definition == crs->definition;
  std::optional<CoordinateTransform> to_work;
  if (!same_crs) to_work.emplace(crs->definition, set.crs.definition, label + ": to the work CRS");

  for (RawTransect& t : raw) {
    const std::string where = feature_label(path, layer, t.fid);
    if (to_work) to_work->apply(t.vertices);
    GeoTransect out{t.id, {}, t.fid};
    out.geometry.origin_x_m = t.vertices.front().x;
    out.geometry.origin_y_m = t.vertices.front().y;
    if (t.vertices.size() == 1) {
      out.geometry.azimuth_deg = t.azimuth_deg;
      out.geometry.length_m = t.length_m;
    } else {
      const XY a = t.vertices.front(), b = t.vertices.back();
      const double len = std::hypot(b.x - a.x, b.y - a.y);
      if (!(len > 0)) throw InputError(where + ": transect line has zero length");
      const double off = max_offset_from_chord(t.vertices);
      if (off > options.straightness_tolerance_m)
        throw InputError(where + ": transect is not straight (a vertex lies " + std::to_string(off) +
                         " m off the line from its first to its last vertex)");
      out.geometry.azimuth_deg = azimuth_of(a, b);
      out.geometry.length_m = len;
    }
    set.transects.push_back(std::move(out));
  }
  return set;
}

}  // namespace strandline::geo
