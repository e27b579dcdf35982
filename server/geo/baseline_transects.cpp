#include "server/geo/baseline_transects.h"

#include <cmath>
#include <cstdio>
#include <numbers>

#include "corrections/core/errors.h"
#include "server/geo/gdal_support.h"
#include "server/geo/work_crs.h"

namespace strandline::geo {

SeaSide sea_side_from_name(const std::string& name) {
  if (name == "left") return SeaSide::left;
  if (name == "right") return SeaSide::right;
  throw ArgumentError("seaward side \"" + name + "\": expected left or right");
}

namespace {

struct RawBaseline {
  std::int64_t fid;
  std::vector<XY> vertices;
};

std::string transect_id(const std::string& prefix, std::size_t n) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%04zu", n);
  return prefix + buf;
}

OGRLineString segment_of(const TransectGeometry& g) {
  OGRLineString s;
  s.addPoint(g.origin_x_m, g.origin_y_m);
  const XY end = point_at_chainage(g, g.length_m);
  s.addPoint(end.x, end.y);
  return s;
}

}  // namespace

BaselineTransects transects_from_baseline(const std::string& path, const BaselineOptions& options) {
  if (!(options.spacing_m > 0)) throw ArgumentError("transect spacing must be positive (metres)");
  if (!(options.length_m > 0)) throw ArgumentError("transect length must be positive (metres)");
  if (!(options.landward_m >= 0) || options.landward_m >= options.length_m)
    throw ArgumentError("landward part of a transect must be at least 0 and less than its length");
  const double window_m = known(options.direction_window_m) ? options.direction_window_m : options.spacing_m;
  if (!(window_m > 0)) throw ArgumentError("baseline direction window must be positive (metres)");

  DatasetPtr ds = open_vector(path, "baseline file");
  OGRLayer& layer = pick_layer(*ds, path, options.layer);
  const std::string label = layer_label(path, layer);
  const std::optional<CrsInfo> crs = layer_crs(layer);
  if (!crs) throw InputError(label + ": the layer has no CRS (add one, e.g. a .prj file or the layer's SRS)");

  std::vector<RawBaseline> raw;
  std::vector<XY> all_points;
  layer.ResetReading();
  for (FeaturePtr f(layer.GetNextFeature()); f; f.reset(layer.GetNextFeature())) {
    const std::string where = feature_label(path, layer, f->GetFID());
    auto parts = line_parts(f->GetGeometryRef(), where);
    if (parts.size() != 1)
      throw InputError(where + ": a baseline must be one line, this one has " + std::to_string(parts.size()) +
                       " parts");
    all_points.insert(all_points.end(), parts.front().begin(), parts.front().end());
    raw.push_back({f->GetFID(), std::move(parts.front())});
  }
  if (raw.empty()) throw InputError(label + ": no baseline");

  BaselineTransects out;
  out.set.source = label;
  out.set.crs = choose_work_crs(*crs, options.crs, all_points, label);
  std::optional<CoordinateTransform> to_work;
  if (out.set.crs.definition != crs->definition)
    to_work.emplace(crs->definition, out.set.crs.definition, label + ": to the work CRS");

  const double side = options.sea_side == SeaSide::left ? -90.0 : 90.0;
  const double h = window_m / 2.0;
  std::size_t count = 0;
  for (RawBaseline& b : raw) {
    const std::string where = feature_label(path, layer, b.fid);
    if (to_work) to_work->apply(b.vertices);
    OGRLineString line;
    for (const XY& p : b.vertices) line.addPoint(p.x, p.y);
    // Normals of a self-intersecting baseline would fan across each other.
    if (!line.IsSimple()) throw InputError(where + ": the baseline intersects itself");
    const double total_m = line.get_Length();
    if (!(total_m > 0)) throw InputError(where + ": the baseline has zero length");
    const std::size_t first = out.set.transects.size();
    for (double s = 0; s <= total_m + 1e-9; s += options.spacing_m) {
      OGRPoint at, behind, ahead;
      line.Value(std::min(s, total_m), &at);
      line.Value(std::max(0.0, s - h), &behind);
      line.Value(std::min(total_m, s + h), &ahead);
      double tangent = std::atan2(ahead.getX() - behind.getX(), ahead.getY() - behind.getY()) * 180.0 /
                       std::numbers::pi;
      double azimuth = std::fmod(tangent + side + 720.0, 360.0);
      TransectGeometry g;
      g.azimuth_deg = azimuth;
      g.length_m = options.length_m;
      g.origin_x_m = at.getX();
      g.origin_y_m = at.getY();
      const XY origin = point_at_chainage(g, -options.landward_m);
      g.origin_x_m = origin.x;
      g.origin_y_m = origin.y;
      out.set.transects.push_back({transect_id(options.id_prefix, ++count), g, b.fid});
    }
    for (std::size_t i = first + 1; i < out.set.transects.size(); ++i) {
      OGRLineString a = segment_of(out.set.transects[i - 1].geometry);
      OGRLineString c = segment_of(out.set.transects[i].geometry);
      if (a.Intersects(&c)) ++out.crossing_neighbours;
    }
  }
  return out;
}

}  // namespace strandline::geo
