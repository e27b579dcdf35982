#include "server/geo/crs.h"

#include <cmath>
#include <regex>
#include <sstream>

#include <ogr_spatialref.h>
#include <proj.h>

#include "corrections/core/errors.h"
#include "corrections/core/utf8_text.h"
#include "server/geo/gdal_support.h"

namespace strandline::geo {

CrsInfo parse_crs(const std::string& text, const std::string& context) {
  std::string input = text;
  if (!input.empty() && input.find_first_not_of("0123456789") == std::string::npos) input = "EPSG:" + input;
  OGRSpatialReference srs;
  const char* const options[] = {"ALLOW_NETWORK_ACCESS=NO", "ALLOW_FILE_ACCESS=NO", nullptr};
  if (input.empty() || srs.SetFromUserInput(input.c_str(), options) != OGRERR_NONE)
    throw InputError(context + " \"" + text + "\": not a coordinate reference system "
                     "(give an EPSG code, WKT or a PROJ string)");
  return crs_info_from(srs);
}

CrsInfo parse_site_crs(const std::string& text, const std::string& context) {
  static const std::regex authority_code(R"(^([A-Za-z][A-Za-z0-9_]*:)?[0-9]{1,9}$)");
  static const std::regex wkt_opening(R"(^\s*[A-Za-z_0-9]+\s*\[)");
  static const std::regex file_reference(R"(PARAMETERFILE|\+[a-z_]*grids?\b|\+init\b|@)", std::regex::icase);
  const bool code = std::regex_match(text, authority_code);
  if (!code && !std::regex_search(text, wkt_opening))
    throw InputError(context + " \"" + printable_text(text) +
                     "\": a site CRS is an authority code (e.g. EPSG:32631) or WKT; PROJ strings are not accepted");
  if (!code && std::regex_search(text, file_reference))
    throw InputError(context + ": a site CRS may not refer to files (PARAMETERFILE, grids); give an authority code");
  return parse_crs(text, context);
}

int utm_zone_number(double lon_deg) {
  double lon = std::fmod(lon_deg + 180.0, 360.0);
  if (lon < 0) lon += 360.0;
  int zone = static_cast<int>(std::floor(lon / 6.0)) + 1;
  return zone > 60 ? 60 : zone;
}

std::string utm_authority_for(double lon_deg, double lat_deg) {
  const int zone = utm_zone_number(lon_deg);
  return "EPSG:" + std::to_string((lat_deg >= 0 ? 32600 : 32700) + zone);
}

struct CoordinateTransform::Impl {
  PJ_CONTEXT* ctx = nullptr;
  PJ* op = nullptr;
  std::string context;
  ~Impl() {
    if (op) proj_destroy(op);
    if (ctx) proj_context_destroy(ctx);
  }
};

namespace {

PJ* create_crs(PJ_CONTEXT* ctx, const std::string& definition, const std::string& context) {
  PJ* crs = proj_create(ctx, definition.c_str());
  if (!crs) {
    const int err = proj_context_errno(ctx);
    throw InputError(context + ": PROJ cannot read the CRS (" + proj_context_errno_string(ctx, err) + ")");
  }
  return crs;
}

}  // namespace

CoordinateTransform::CoordinateTransform(const std::string& from_definition,
                                         const std::string& to_definition, std::string context)
    : impl_(std::make_unique<Impl>()) {
  impl_->context = std::move(context);
  impl_->ctx = proj_context_create();
  proj_context_use_proj4_init_rules(impl_->ctx, 1);
  PJ* from = create_crs(impl_->ctx, from_definition, impl_->context);
  PJ* to = nullptr;
  try {
    to = create_crs(impl_->ctx, to_definition, impl_->context);
  } catch (...) {
    proj_destroy(from);
    throw;
  }
  PJ* op = proj_create_crs_to_crs_from_pj(impl_->ctx, from, to, nullptr, nullptr);
  const std::string from_name = proj_get_name(from) ? proj_get_name(from) : "?";
  const std::string to_name = proj_get_name(to) ? proj_get_name(to) : "?";
  proj_destroy(from);
  proj_destroy(to);
  if (!op)
    throw InputError(impl_->context + ": no coordinate transformation from \"" + from_name + "\" to \"" +
                     to_name + "\"");
  // x = longitude/easting, y = latitude/northing, whatever the authority says.
  PJ* normalised = proj_normalize_for_visualization(impl_->ctx, op);
  proj_destroy(op);
  if (!normalised)
    throw InputError(impl_->context + ": cannot normalise the axis order of the transformation to \"" +
                     to_name + "\"");
  impl_->op = normalised;
}

CoordinateTransform::~CoordinateTransform() = default;
CoordinateTransform::CoordinateTransform(CoordinateTransform&&) noexcept = default;
CoordinateTransform& CoordinateTransform::operator=(CoordinateTransform&&) noexcept = default;

XY CoordinateTransform::apply(XY p) const {
  PJ_COORD c = proj_coord(p.x, p.y, 0.0, HUGE_VAL);
  PJ_COORD r = proj_trans(impl_->op, PJ_FWD, c);
  if (!std::isfinite(r.xy.x) || !std::isfinite(r.xy.y)) {
    std::ostringstream msg;
    msg.precision(12);
    msg << impl_->context << ": point (" << p.x << ", " << p.y << ") cannot be transformed";
    const int err = proj_errno(impl_->op);
    if (err) msg << " (" << proj_context_errno_string(impl_->ctx, err) << ")";
    proj_errno_reset(impl_->op);
    throw InputError(msg.str());
  }
  return {r.xy.x, r.xy.y};
}

void CoordinateTransform::apply(std::vector<XY>& points) const {
  for (auto& p : points) p = apply(p);
}

}  // namespace strandline::geo
