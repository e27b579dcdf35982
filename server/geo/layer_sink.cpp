#include "server/geo/layer_sink.h"

#include <filesystem>

#include "corrections/core/errors.h"
#include "corrections/core/utf8_text.h"
#include "server/geo/result_writer.h"

namespace strandline::geo {

LayerSink::LayerSink(GeoFormat format, const std::string& path, const WorkCrs& work, std::vector<std::string>& files)
    : format_(format), path_(path) {
  ensure_gdal_registered();
  const char* driver_name = format == GeoFormat::geopackage ? "GPKG" : "GeoJSON";
  GDALDriver* driver = GetGDALDriverManager()->GetDriverByName(driver_name);
  if (!driver) throw std::runtime_error(std::string("GDAL has no ") + driver_name + " driver");
  // Written beside the target and renamed into place when complete, so a
  // failed run never leaves a half-written file under the final name.
  const std::filesystem::path target(path);
  temp_path_ = (target.parent_path() / (".partial-" + target.filename().string())).string();
  std::error_code ec;
  std::filesystem::remove(temp_path_, ec);
  CPLErrorReset();
  ds_.reset(driver->Create(temp_path_.c_str(), 0, 0, 0, GDT_Unknown, nullptr));
  if (!ds_) throw InputError(path + ": cannot create (" + printable_text(CPLGetLastErrorMsg()) + ")");
  files.push_back(path);
  if (work_srs_.importFromWkt(work.definition.c_str()) != OGRERR_NONE)
    throw InputError(path + ": the work CRS cannot be written (" + work.name + ")");
  work_srs_.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  lon_lat_.importFromEPSG(4326);
  lon_lat_.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  if (format == GeoFormat::geojson)
    to_lon_lat_.emplace(work.definition, "EPSG:4326", path + ": work CRS to longitude/latitude");
  if (format == GeoFormat::geopackage) ds_->StartTransaction();
}

OGRLayer& LayerSink::create_layer(const std::string& name, OGRwkbGeometryType type) {
  const char* gpkg_options[] = {"SPATIAL_INDEX=YES", nullptr};
  // RFC 7946; 9 decimals of a degree is about 0.1 mm.
  const char* json_options[] = {"RFC7946=YES", "COORDINATE_PRECISION=9", "WRITE_NAME=NO", nullptr};
  const bool gpkg = format_ == GeoFormat::geopackage;
  OGRLayer* layer = ds_->CreateLayer(name.c_str(), gpkg ? &work_srs_ : &lon_lat_, type,
                                     const_cast<char**>(gpkg ? gpkg_options : json_options));
  if (!layer) throw InputError(path_ + ": cannot create layer " + name + " (" + printable_text(CPLGetLastErrorMsg()) + ")");
  return *layer;
}

void LayerSink::add(OGRLayer& layer, OGRFeature& f) {
  if (layer.CreateFeature(&f) != OGRERR_NONE)
    throw InputError(path_ + ": cannot write a feature to layer " + layer.GetName() + " (" + printable_text(CPLGetLastErrorMsg()) +
                     ")");
}

void LayerSink::finish() {
  if (format_ == GeoFormat::geopackage && ds_->CommitTransaction() != OGRERR_NONE)
    throw InputError(path_ + ": cannot commit (" + printable_text(CPLGetLastErrorMsg()) + ")");
  GDALDataset* raw = ds_.release();
  CPLErrorReset();
  GDALClose(GDALDataset::ToHandle(raw));
  if (CPLGetLastErrorType() == CE_Failure)
    throw InputError(path_ + ": write failed (" + printable_text(CPLGetLastErrorMsg()) + ")");
  std::error_code ec;
  std::filesystem::rename(temp_path_, path_, ec);
  if (ec) throw InputError(path_ + ": cannot move the finished file into place (" + ec.message() + ")");
  temp_path_.clear();
}

LayerSink::~LayerSink() {
  ds_.reset();
  if (!temp_path_.empty()) {
    std::error_code ec;
    std::filesystem::remove(temp_path_, ec);
  }
}

}  // namespace strandline::geo
