// GDAL/OGR helpers used by the readers and writers of this folder only (the one
// header that names GDAL types; nothing outside server/geo/ includes it).
// Messages name the file, the layer and the feature id (FID).
#pragma once

#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include <gdal_priv.h>
#include <ogrsf_frmts.h>

#include "server/geo/crs.h"
#include "server/geo/geo_types.h"

namespace strandline::geo {

struct DatasetCloser {
  void operator()(GDALDataset* ds) const { GDALClose(GDALDataset::ToHandle(ds)); }
};
using DatasetPtr = std::unique_ptr<GDALDataset, DatasetCloser>;

struct FeatureDeleter {
  void operator()(OGRFeature* f) const { OGRFeature::DestroyFeature(f); }
};
using FeaturePtr = std::unique_ptr<OGRFeature, FeatureDeleter>;

void ensure_gdal_registered();

// Opens a vector dataset for reading; `what` names the role ("transects file").
// `drivers`: the GDAL drivers allowed to open it (empty: any). A body from the
// service is GeoJSON only: other drivers sniff content (a VRT names other files).
DatasetPtr open_vector(const std::string& path, const std::string& what, const std::vector<std::string>& drivers = {});

// The layer named `layer_name`, or the only layer when none is named.
OGRLayer& pick_layer(GDALDataset& ds, const std::string& path, const std::optional<std::string>& layer_name);

std::string layer_label(const std::string& path, OGRLayer& layer);  // "f.gpkg, layer lines"
std::string feature_label(const std::string& path, OGRLayer& layer, std::int64_t fid);

CrsInfo crs_info_from(const OGRSpatialReference& srs);
std::optional<CrsInfo> layer_crs(OGRLayer& layer);

// Index of attribute `name`; throws InputError "missing attribute" listing the fields.
int require_field(OGRLayer& layer, const std::string& name, const std::string& label, const std::string& role);
std::optional<int> find_field(OGRLayer& layer, const std::string& name);

// Field text; null or unset gives nullopt. Date-times come out as ISO 8601 with
// the zone the file stored ("Z", "+01:00"; none when the file has none).
std::optional<std::string> field_text(OGRFeature& f, int index);
// Numeric field (numbers, or text holding a number); null/empty gives nullopt.
// Throws InputError naming `label` and the field when the value is not a number.
std::optional<double> field_number(OGRFeature& f, int index, const std::string& label);

// The vertices of a LineString or of each part of a MultiLineString (x, y only).
// Throws InputError naming `label` for empty geometry or another geometry type.
std::vector<std::vector<XY>> line_parts(const OGRGeometry* g, const std::string& label);

}  // namespace strandline::geo
