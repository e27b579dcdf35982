// A new GeoPackage or GeoJSON file being written (internal to server/geo/),
// replacing any file of that name only when complete:
// GeoPackage layers in the work CRS inside one transaction, GeoJSON in WGS 84
// longitude/latitude per RFC 7946 with coordinates transformed by PROJ.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "server/geo/gdal_support.h"
#include "server/geo/result_writer.h"

namespace strandline::geo {



class LayerSink {
 public:
  // Replaces `path`; appends it to `files` once created.
  LayerSink(GeoFormat format, const std::string& path, const WorkCrs& work, std::vector<std::string>& files);
  ~LayerSink();  // removes the partial file when finish() was not reached
  LayerSink(const LayerSink&) = delete;
  LayerSink& operator=(const LayerSink&) = delete;

  OGRLayer& create_layer(const std::string& name, OGRwkbGeometryType type);
  // Work-CRS coordinates to the file's CRS.
  XY place(XY work_xy) const { return to_lon_lat_ ? to_lon_lat_->apply(work_xy) : work_xy; }
  void add(OGRLayer& layer, OGRFeature& f);
  // Commits, closes and renames into place; throws InputError when the file
  // cannot be completed.
  void finish();

 private:
  GeoFormat format_;
  std::string path_;
  std::string temp_path_;  // empty once renamed into place
  DatasetPtr ds_;
  OGRSpatialReference work_srs_, lon_lat_;
  std::optional<CoordinateTransform> to_lon_lat_;
};

}  // namespace strandline::geo
