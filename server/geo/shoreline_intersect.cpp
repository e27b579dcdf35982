#include "server/geo/shoreline_intersect.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <memory>

#include "corrections/core/errors.h"
#include "server/geo/gdal_support.h"

namespace strandline::geo {

CrossingRule crossing_rule_from_name(const std::string& name) {
  if (name == "outermost") return CrossingRule::outermost;
  if (name == "innermost") return CrossingRule::innermost;
  if (name == "omit") return CrossingRule::omit;
  throw ArgumentError("crossing rule \"" + name + "\": expected outermost, innermost or omit");
}

namespace {

// One image: its attributes and all its polylines in the work CRS.
struct Image {
  std::string id;
  TimeS time_s = 0;
  std::string sensor;
  double cloud_fraction = kUnknown;
  double georef_rmse_m = kUnknown;
  std::int64_t first_fid = -1;
  std::vector<std::unique_ptr<OGRLineString>> parts;
  std::vector<OGREnvelope> envelopes;
};

constexpr std::size_t kSegmentsPerPiece = 64;

bool same_value(double a, double b) { return (std::isnan(a) && std::isnan(b)) || a == b; }

// Chainages of every point of an intersection result (points, or the ends of
// collinear overlaps) along the transect from `origin` in direction (ux, uy).
void collect_chainages(const OGRGeometry& g, XY origin, double ux, double uy, std::vector<double>& out) {
  const auto type = wkbFlatten(g.getGeometryType());
  if (g.IsEmpty()) return;
  if (type == wkbPoint) {
    const OGRPoint& p = *g.toPoint();
    out.push_back((p.getX() - origin.x) * ux + (p.getY() - origin.y) * uy);
  } else if (type == wkbLineString) {
    const OGRLineString& l = *g.toLineString();
    for (int i = 0; i < l.getNumPoints(); ++i)
      out.push_back((l.getX(i) - origin.x) * ux + (l.getY(i) - origin.y) * uy);
  } else if (OGR_GT_IsSubClassOf(type, wkbGeometryCollection)) {
    for (const OGRGeometry* part : *g.toGeometryCollection()) collect_chainages(*part, origin, ux, uy, out);
  }
}

}  // namespace

IntersectResult intersect_shorelines(const std::string& path, const TransectSet& transects,
                                     const IntersectOptions& options) {
  if (!OGRGeometryFactory::haveGEOS())
    throw std::runtime_error("GDAL was built without GEOS: no geometry intersection");
  DatasetPtr ds = open_vector(path, "shorelines file", options.drivers);
  OGRLayer& layer = pick_layer(*ds, path, options.layer);
  const std::string label = layer_label(path, layer);
  const std::optional<CrsInfo> crs = layer_crs(layer);
  if (!crs) throw InputError(label + ": the layer has no CRS (add one, e.g. a .prj file or the layer's SRS)");
  const ShorelineFields& names = options.fields;
  const int time_index = require_field(layer, names.time, label, "image time");
  const int sensor_index = require_field(layer, names.sensor, label, "sensor");
  const int image_index = require_field(layer, names.image, label, "image id");
  std::optional<int> cloud_index = find_field(layer, names.cloud_fraction);
  std::optional<int> rmse_index = find_field(layer, names.georef_rmse);
  if (!cloud_index && names.cloud_fraction_required)
    require_field(layer, names.cloud_fraction, label, "cloud fraction");
  if (!rmse_index && names.georef_rmse_required) require_field(layer, names.georef_rmse, label, "georeference RMSE");

  std::optional<CoordinateTransform> to_work;
  if (crs->definition != transects.crs.definition)
    to_work.emplace(crs->definition, transects.crs.definition, label + ": to the work CRS");

  IntersectResult result;
  result.report.shoreline_crs = crs->name;
  result.report.has_cloud_fraction = cloud_index.has_value();
  result.report.has_georef_rmse = rmse_index.has_value();

  std::map<std::string, Image> images;
  layer.ResetReading();
  for (FeaturePtr f(layer.GetNextFeature()); f; f.reset(layer.GetNextFeature())) {
    ++result.report.features;
    const std::int64_t fid = f->GetFID();
    const std::string where = feature_label(path, layer, fid);
    auto image_id = field_text(*f, image_index);
    if (!image_id || image_id->empty()) throw InputError(where + ": empty image id (" + names.image + ")");
    auto time_text = field_text(*f, time_index);
    if (!time_text || time_text->empty()) throw InputError(where + ": empty time (" + names.time + ")");
    TimeS time_s;
    try {
      time_s = parse_time_utc(*time_text);
    } catch (const FieldError& e) {
      throw InputError(where + ": " + names.time + " \"" + *time_text + "\": " + e.what());
    }
    auto sensor = field_text(*f, sensor_index);
    if (!sensor || sensor->empty()) throw InputError(where + ": empty sensor (" + names.sensor + ")");
    double cloud = kUnknown, rmse = kUnknown;
    if (cloud_index)
      if (auto v = field_number(*f, *cloud_index, where)) cloud = *v;
    if (rmse_index)
      if (auto v = field_number(*f, *rmse_index, where)) rmse = *v;

    auto parts = line_parts(f->GetGeometryRef(), where);
    auto [it, fresh] = images.try_emplace(*image_id);
    Image& img = it->second;
    if (fresh) {
      img = Image{*image_id, time_s, *sensor, cloud, rmse, fid, {}, {}};
    } else {
      const std::string other = " than feature FID " + std::to_string(img.first_fid) + " of the same image \"" +
                                img.id + "\"";
      if (img.time_s != time_s) throw InputError(where + ": another " + names.time + other);
      if (img.sensor != *sensor) throw InputError(where + ": another " + names.sensor + other);
      if (!same_value(img.cloud_fraction, cloud)) throw InputError(where + ": another " + names.cloud_fraction + other);
      if (!same_value(img.georef_rmse_m, rmse)) throw InputError(where + ": another " + names.georef_rmse + other);
    }
    for (auto& part : parts) {
      if (to_work) to_work->apply(part);
      // Long polylines are cut into pieces of kSegmentsPerPiece segments, each
      // with its envelope, so a transect meets only the pieces near it.
      for (std::size_t first = 0; first + 1 < part.size(); first += kSegmentsPerPiece) {
        const std::size_t last = std::min(first + kSegmentsPerPiece, part.size() - 1);
        auto line = std::make_unique<OGRLineString>();
        line->setNumPoints(static_cast<int>(last - first + 1), FALSE);
        for (std::size_t i = first; i <= last; ++i)
          line->setPoint(static_cast<int>(i - first), part[i].x, part[i].y);
        OGREnvelope env;
        line->getEnvelope(&env);
        img.parts.push_back(std::move(line));
        img.envelopes.push_back(env);
      }
    }
  }
  result.report.images = images.size();

  // Images in time order (then id), so each transect's rows come out sorted.
  std::vector<const Image*> ordered;
  for (const auto& [id, img] : images) ordered.push_back(&img);
  std::stable_sort(ordered.begin(), ordered.end(),
                   [](const Image* a, const Image* b) { return a->time_s < b->time_s; });

  std::vector<double> chainages;
  for (const GeoTransect& t : transects.transects) {
    const TransectGeometry& g = t.geometry;
    const XY origin{g.origin_x_m, g.origin_y_m};
    const XY end = point_at_chainage(g, g.length_m);
    const double ux = (end.x - origin.x) / g.length_m, uy = (end.y - origin.y) / g.length_m;
    OGRLineString segment;
    segment.addPoint(origin.x, origin.y);
    segment.addPoint(end.x, end.y);
    OGREnvelope segment_env;
    segment.getEnvelope(&segment_env);
    bool crossed_once = false;
    for (const Image* img : ordered) {
      chainages.clear();
      for (std::size_t i = 0; i < img->parts.size(); ++i) {
        if (!segment_env.Intersects(img->envelopes[i])) continue;
        std::unique_ptr<OGRGeometry> hit(segment.Intersection(img->parts[i].get()));
        if (hit) collect_chainages(*hit, origin, ux, uy, chainages);
      }
      // A crossing through a vertex shared by two polylines (or two pieces of
      // one) counts once.
      std::sort(chainages.begin(), chainages.end());
      chainages.erase(std::unique(chainages.begin(), chainages.end(),
                                  [](double a, double b) { return std::abs(a - b) < 1e-6; }),
                      chainages.end());
      if (chainages.empty()) {
        ++result.report.uncrossed_pairs;
        continue;
      }
      crossed_once = true;
      const int n = static_cast<int>(chainages.size());
      if (n > 1) {
        ++result.report.ambiguous_pairs;
        if (options.rule == CrossingRule::omit) {
          ++result.report.left_out_ambiguous;
          continue;
        }
      }
      const double chosen = options.rule == CrossingRule::innermost ? chainages.front() : chainages.back();
      result.rows.push_back(
          {t.id, img->time_s, chosen, img->sensor, img->id, img->cloud_fraction, img->georef_rmse_m, n});
    }
    if (!crossed_once) result.report.never_crossed.push_back(t.id);
  }
  result.report.rows = result.rows.size();
  return result;
}

}  // namespace strandline::geo
