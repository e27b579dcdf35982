#include "server/geo/observation_polylines.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <map>
#include <unordered_map>

#include "corrections/core/errors.h"
#include "server/geo/layer_sink.h"

namespace strandline::geo {

namespace {

void set_number(OGRFeature& f, int field, double v) {
  if (known(v)) f.SetField(field, v);
  else f.SetFieldNull(field);
}

void set_time(OGRFeature& f, int field, TimeS t) {
  const std::string text = format_time_utc(t);  // YYYY-MM-DDTHH:MM:SS[.sss]Z
  int y = 0, mo = 0, d = 0, h = 0, mi = 0;
  float s = 0;
  std::sscanf(text.c_str(), "%d-%d-%dT%d:%d:%fZ", &y, &mo, &d, &h, &mi, &s);
  f.SetField(field, y, mo, d, h, mi, s, 100);  // 100: UTC
}

}  // namespace

PolylineWriteReport write_position_polylines(const std::string& path, const TransectSet& transects,
                                             const std::vector<ImagePosition>& positions, double tick_half_length_m,
                                             const std::string& layer_name) {
  const auto format = geo_format_for(path);
  if (!format) throw ArgumentError(path + ": unknown geodata format (use .gpkg or .geojson)");
  std::unordered_map<std::string, std::size_t> order;
  for (std::size_t i = 0; i < transects.transects.size(); ++i) order.emplace(transects.transects[i].id, i);

  PolylineWriteReport report;
  // image id -> (transect index -> position)
  std::map<std::string, std::map<std::size_t, const ImagePosition*>> by_image;
  for (const ImagePosition& p : positions) {
    auto it = order.find(p.transect_id);
    if (it == order.end() || !known(p.chainage_m)) {
      ++report.unknown_transects;
      continue;
    }
    by_image[p.image_id][it->second] = &p;
  }

  LayerSink sink(*format, path, transects.crs, report.files);
  OGRLayer& layer = sink.create_layer(layer_name, wkbLineString);
  const std::pair<const char*, OGRFieldType> fields[] = {{"time", OFTDateTime},
                                                         {"sensor", OFTString},
                                                         {"image_id", OFTString},
                                                         {"cloud_fraction", OFTReal},
                                                         {"georef_rmse_m", OFTReal}};
  for (const auto& [name, type] : fields) {
    OGRFieldDefn defn(name, type);
    if (layer.CreateField(&defn) != OGRERR_NONE) throw InputError(path + ": cannot create field " + name);
  }

  for (const auto& image : by_image) {
    // Named references, not a structured binding: the lambda below captures the id
    // (clang 14, which builds the fuzz targets, cannot capture bindings).
    const auto& image_id = image.first;
    const auto& on_transect = image.second;
    ++report.images;
    const ImagePosition& first = *on_transect.begin()->second;
    auto emit = [&](const std::vector<XY>& vertices) {
      FeaturePtr f(OGRFeature::CreateFeature(layer.GetLayerDefn()));
      set_time(*f, 0, first.time_s);
      f->SetField(1, first.sensor.c_str());
      f->SetField(2, image_id.c_str());
      set_number(*f, 3, first.cloud_fraction);
      set_number(*f, 4, first.georef_rmse_m);
      auto* line = new OGRLineString();
      for (const XY& v : vertices) {
        const XY p = sink.place(v);
        line->addPoint(p.x, p.y);
      }
      f->SetGeometryDirectly(line);
      sink.add(layer, *f);
      ++report.features;
    };
    std::vector<XY> run;
    std::size_t previous = 0;
    const TransectGeometry* run_geometry = nullptr;
    auto flush = [&] {
      if (run.size() == 1) {  // a tick across the transect, centred on the position
        TransectGeometry across = *run_geometry;
        across.origin_x_m = run[0].x;
        across.origin_y_m = run[0].y;
        across.azimuth_deg += 90.0;
        emit({point_at_chainage(across, -tick_half_length_m), point_at_chainage(across, tick_half_length_m)});
        ++report.ticks;
      } else if (run.size() > 1) {
        // Both ends continue a little past the end transects: a line ending
        // exactly on a transect touches it only to rounding and may miss it.
        auto extend = [&](XY from, XY to) {
          const double d = std::hypot(to.x - from.x, to.y - from.y);
          return XY{to.x + (to.x - from.x) / d * tick_half_length_m, to.y + (to.y - from.y) / d * tick_half_length_m};
        };
        run.insert(run.begin(), extend(run[1], run[0]));
        run.push_back(extend(run[run.size() - 2], run.back()));
        emit(run);
      }
      run.clear();
    };
    for (const auto& [index, p] : on_transect) {
      if (!run.empty() && index != previous + 1) flush();
      const TransectGeometry& g = transects.transects[index].geometry;
      run.push_back(point_at_chainage(g, p->chainage_m));
      run_geometry = &g;
      previous = index;
    }
    flush();
  }
  sink.finish();
  return report;
}

}  // namespace strandline::geo
