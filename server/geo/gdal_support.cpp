#include "server/geo/gdal_support.h"

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <mutex>

#include <cpl_conv.h>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"
#include "corrections/core/utf8_text.h"

namespace strandline::geo {

void ensure_gdal_registered() {
  static std::once_flag once;
  std::call_once(once, [] {
    GDALAllRegister();
    // GDAL's messages reach the user inside ours (CPLGetLastErrorMsg), with the
    // file, layer and feature named; printing them again would only add noise.
    CPLSetErrorHandler(CPLQuietErrorHandler);
  });
}

DatasetPtr open_vector(const std::string& path, const std::string& what, const std::vector<std::string>& drivers) {
  ensure_gdal_registered();
  std::error_code ec;
  // GDAL virtual paths (/vsizip/, /vsicurl/, ...) are left to GDAL.
  if (path.rfind("/vsi", 0) != 0 && !std::filesystem::exists(path, ec))
    throw InputError(what + " " + path + ": no such file");
  CPLErrorReset();
  std::vector<const char*> allowed;
  for (const auto& d : drivers) allowed.push_back(d.c_str());
  allowed.push_back(nullptr);
  GDALDataset* ds = GDALDataset::Open(path.c_str(), GDAL_OF_VECTOR | GDAL_OF_READONLY,
                                      drivers.empty() ? nullptr : allowed.data(), nullptr, nullptr);
  if (!ds) {
    // GDAL quotes the file's bytes in its messages: made printable before they reach a reply.
    std::string reason = printable_text(CPLGetLastErrorMsg());
    if (reason.empty()) reason = "not a readable vector file";
    throw InputError(what + " " + path + ": cannot open (" + reason + ")");
  }
  return DatasetPtr(ds);
}

OGRLayer& pick_layer(GDALDataset& ds, const std::string& path, const std::optional<std::string>& layer_name) {
  if (layer_name) {
    OGRLayer* layer = ds.GetLayerByName(layer_name->c_str());
    if (!layer) throw InputError(path + ": no layer named \"" + *layer_name + "\"");
    return *layer;
  }
  const int n = ds.GetLayerCount();
  if (n == 0) throw InputError(path + ": no vector layer");
  if (n > 1) {
    std::string names;
    for (int i = 0; i < n; ++i) names += std::string(i ? ", " : "") + ds.GetLayer(i)->GetName();
    throw InputError(path + ": " + std::to_string(n) + " layers (" + names + "); name one with the layer option");
  }
  return *ds.GetLayer(0);
}

std::string layer_label(const std::string& path, OGRLayer& layer) {
  return path + ", layer " + layer.GetName();
}

std::string feature_label(const std::string& path, OGRLayer& layer, std::int64_t fid) {
  return layer_label(path, layer) + ", feature FID " + std::to_string(fid);
}

CrsInfo crs_info_from(const OGRSpatialReference& source) {
  OGRSpatialReference srs(source);
  if (srs.IsCompound()) srs.StripVertical();  // all work is horizontal
  CrsInfo info;
  char* wkt = nullptr;
  const char* const options[] = {"FORMAT=WKT2_2019", nullptr};
  if (srs.exportToWkt(&wkt, options) == OGRERR_NONE && wkt) info.definition = wkt;
  CPLFree(wkt);
  if (const char* name = srs.GetName()) info.name = name;
  const char* auth = srs.GetAuthorityName(nullptr);
  const char* code = srs.GetAuthorityCode(nullptr);
  if (auth && code) info.authority = std::string(auth) + ":" + code;
  info.projected = srs.IsProjected();
  info.geographic = srs.IsGeographic();
  return info;
}

std::optional<CrsInfo> layer_crs(OGRLayer& layer) {
  const OGRSpatialReference* srs = layer.GetSpatialRef();
  if (!srs) return std::nullopt;
  return crs_info_from(*srs);
}

std::optional<int> find_field(OGRLayer& layer, const std::string& name) {
  const int i = layer.GetLayerDefn()->GetFieldIndex(name.c_str());
  if (i < 0) return std::nullopt;
  return i;
}

int require_field(OGRLayer& layer, const std::string& name, const std::string& label, const std::string& role) {
  if (auto i = find_field(layer, name)) return *i;
  OGRFeatureDefn* defn = layer.GetLayerDefn();
  std::string names;
  for (int i = 0; i < defn->GetFieldCount(); ++i)
    names += std::string(i ? ", " : "") + defn->GetFieldDefn(i)->GetNameRef();
  throw InputError(label + ": missing attribute \"" + name + "\" (" + role + "); attributes found: " +
                   (names.empty() ? "none" : names));
}

std::optional<std::string> field_text(OGRFeature& f, int index) {
  if (!f.IsFieldSetAndNotNull(index)) return std::nullopt;
  const OGRFieldType type = f.GetFieldDefnRef(index)->GetType();
  if (type == OFTDateTime || type == OFTDate) {
    int y = 0, mo = 0, d = 0, h = 0, mi = 0, tz = 0;
    float s = 0;
    f.GetFieldAsDateTime(index, &y, &mo, &d, &h, &mi, &s, &tz);
    char buf[64];
    const double whole = std::floor(s);
    const int ms = static_cast<int>(std::lround((s - whole) * 1000.0));
    if (ms > 0)
      std::snprintf(buf, sizeof buf, "%04d-%02d-%02dT%02d:%02d:%02d.%03d", y, mo, d, h, mi, static_cast<int>(whole), ms);
    else
      std::snprintf(buf, sizeof buf, "%04d-%02d-%02dT%02d:%02d:%02d", y, mo, d, h, mi, static_cast<int>(whole));
    std::string text = buf;
    // GDAL zone flag: 0 unknown, 1 local time, 100 UTC, 100 + n: n quarter hours east.
    if (tz == 100) {
      text += "Z";
    } else if (tz > 1) {
      const int minutes = (tz - 100) * 15;
      const int a = std::abs(minutes);
      std::snprintf(buf, sizeof buf, "%c%02d:%02d", minutes < 0 ? '-' : '+', a / 60, a % 60);
      text += buf;
    }
    return text;
  }
  return std::string(f.GetFieldAsString(index));
}

std::optional<double> field_number(OGRFeature& f, int index, const std::string& label) {
  if (!f.IsFieldSetAndNotNull(index)) return std::nullopt;
  OGRFieldDefn* defn = f.GetFieldDefnRef(index);
  switch (defn->GetType()) {
    case OFTInteger:
    case OFTInteger64:
    case OFTReal:
      return f.GetFieldAsDouble(index);
    case OFTString:
      try {
        return parse_optional_number(f.GetFieldAsString(index));
      } catch (const FieldError& e) {
        throw InputError(label + ": attribute " + defn->GetNameRef() + " \"" + f.GetFieldAsString(index) +
                         "\": " + e.what());
      }
    default:
      throw InputError(label + ": attribute " + defn->GetNameRef() + " is of type " +
                       OGRFieldDefn::GetFieldTypeName(defn->GetType()) + ", expected a number");
  }
}

namespace {

std::vector<XY> vertices(const OGRLineString& line) {
  std::vector<XY> v(static_cast<std::size_t>(line.getNumPoints()));
  for (int i = 0; i < line.getNumPoints(); ++i) v[static_cast<std::size_t>(i)] = {line.getX(i), line.getY(i)};
  return v;
}

}  // namespace

std::vector<std::vector<XY>> line_parts(const OGRGeometry* g, const std::string& label) {
  if (!g) throw InputError(label + ": no geometry");
  if (g->IsEmpty()) throw InputError(label + ": empty geometry");
  const auto type = wkbFlatten(g->getGeometryType());
  std::vector<std::vector<XY>> parts;
  if (type == wkbLineString) {
    parts.push_back(vertices(*g->toLineString()));
  } else if (type == wkbMultiLineString) {
    for (const OGRLineString* part : *g->toMultiLineString())
      if (!part->IsEmpty()) parts.push_back(vertices(*part));
  } else {
    throw InputError(label + ": geometry is a " + OGRGeometryTypeToName(g->getGeometryType()) +
                     ", expected a LineString or MultiLineString");
  }
  for (const auto& p : parts)
    if (p.size() < 2) throw InputError(label + ": a line part has fewer than two vertices");
  return parts;
}

}  // namespace strandline::geo
