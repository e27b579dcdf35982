// Sites and their transects.
#include <unistd.h>

#include <cmath>
#include <cstdio>
#include <fstream>

#include "corrections/core/errors.h"
#include "server/geo/crs.h"
#include "server/io/id_rules.h"
#include "server/geo/transect_lon_lat.h"
#include "server/geo/transect_reader.h"
#include "server/app/run_executor.h"
#include "server/http/service_internal.h"

namespace strandline::http {

namespace {

void check_site_id(const std::string& id) {
  if (auto why = site_id_problem(id))
    throw Problem(422, problem_type::invalid_body, "Invalid site id", *why, {{"pointer", "/id"}});
}

Problem schema_problem(const std::string& pointer, const std::string& detail) {
  return Problem(422, problem_type::invalid_body, "Invalid body", pointer + ": " + detail, {{"pointer", pointer}});
}

nlohmann::json site_json(const store::Site& s) {
  nlohmann::json j = {{"id", s.id},
                      {"name", s.name},
                      {"crs", s.crs},
                      {"reference_elevation_m", s.reference_elevation_m},
                      {"default_slope", known(s.default_slope) ? nlohmann::json(s.default_slope) : nlohmann::json()},
                      {"processing_defaults", s.processing_defaults},
                      {"created_at", s.created_at}};
  return j;
}

store::Site site_from_json(const nlohmann::json& body) {
  if (!body.is_object()) throw schema_problem("", "expected a JSON object");
  store::Site s;
  for (auto it = body.begin(); it != body.end(); ++it) {
    const std::string pointer = "/" + it.key();
    const auto& v = it.value();
    if (it.key() == "id" || it.key() == "name" || it.key() == "crs") {
      if (!v.is_string()) throw schema_problem(pointer, "expected a string");
    } else if (it.key() == "reference_elevation_m") {
      if (!v.is_number()) throw schema_problem(pointer, "expected a number (metres on the site datum)");
    } else if (it.key() == "default_slope") {
      if (!v.is_null() && (!v.is_number() || !(v.get<double>() > 0) || v.get<double>() > 1))
        throw schema_problem(pointer, "expected tan(beta) in (0, 1] or null");
    } else if (it.key() == "processing_defaults") {
      if (!v.is_object()) throw schema_problem(pointer, "expected a JSON object (the batch --config shape)");
    } else {
      throw schema_problem(pointer, "unknown member");
    }
  }
  for (const char* required : {"id", "name", "crs"})
    if (!body.contains(required)) throw schema_problem(std::string("/") + required, "required");
  s.id = body["id"];
  check_site_id(s.id);
  s.name = body["name"];
  s.crs = body["crs"];
  try {
    const auto crs = geo::parse_site_crs(s.crs, "/crs");
    if (!crs.projected) throw schema_problem("/crs", "the site CRS must be projected (metres), e.g. a UTM zone");
  } catch (const InputError& e) {
    throw schema_problem("/crs", e.what());
  }
  s.reference_elevation_m = body.value("reference_elevation_m", 0.0);
  if (body.contains("default_slope") && !body["default_slope"].is_null()) s.default_slope = body["default_slope"];
  if (body.contains("processing_defaults")) {
    s.processing_defaults = body["processing_defaults"];
    try {
      app::run_config_for(s, s.processing_defaults);
    } catch (const ConfigError& e) {
      throw Problem(422, problem_type::invalid_config, "Invalid processing defaults",
                    "/processing_defaults" + std::string(e.what()), {{"pointer", "/processing_defaults" + e.pointer}});
    }
  }
  return s;
}

void create_site(Context& c) {
  auto site = site_from_json(c.json_body());
  c.service.store.create_site(site);
  c.res.set_header("Location", "/v1/sites/" + site.id);
  c.reply(201, site_json(*c.service.store.site(site.id)));
}

void list_sites(Context& c) {
  const auto limit = c.query_integer("limit", 100, 1000);
  auto sites = c.service.store.sites(c.query("cursor").value_or(""), static_cast<int>(limit));
  nlohmann::json items = nlohmann::json::array();
  for (const auto& s : sites) items.push_back(site_json(s));
  const bool full = static_cast<std::int64_t>(sites.size()) == limit && limit > 0;
  c.reply(200, {{"items", items}, {"next_cursor", full ? nlohmann::json(sites.back().id) : nlohmann::json()}});
}

void get_site(Context& c) { c.reply(200, site_json(c.site_or_404(c.path_param(0)))); }

nlohmann::json transect_feature(const store::Transect& t) {
  return {{"type", "Feature"},
          {"id", t.id},
          {"geometry", nullptr},
          {"properties",
           {{"transect_id", t.id},
            {"origin_x_m", t.geometry.origin_x_m},
            {"origin_y_m", t.geometry.origin_y_m},
            {"azimuth_deg", t.geometry.azimuth_deg},
            {"length_m", known(t.geometry.length_m) ? nlohmann::json(t.geometry.length_m) : nlohmann::json()}}}};
}

// The body goes through the same GDAL reader as the batch transect files, so
// lines and origin points with azimuth/length are read alike, and lon/lat
// GeoJSON is projected to the site CRS.
std::vector<store::Transect> read_transect_collection(const std::string& body, const store::Site& site) {
  char path[] = "/tmp/strandline-transects-XXXXXX.geojson";
  const int fd = mkstemps(path, 8);
  if (fd < 0) throw std::runtime_error("cannot create a temporary file");
  close(fd);
  struct Remove {
    const char* p;
    ~Remove() { std::remove(p); }
  } remove{path};
  {
    std::ofstream out(path, std::ios::binary);
    out << body;
  }
  geo::TransectReadOptions options;
  options.crs = site.crs;
  options.drivers = {"GeoJSON"};
  geo::TransectSet set;
  try {
    set = geo::read_transects(path, options);
  } catch (const InputError& e) {
    std::string message = e.what();
    const auto at = message.find(path);
    if (at != std::string::npos) message.replace(at, std::string(path).size(), "body");
    throw Problem(422, problem_type::invalid_body, "Invalid transects", message);
  }
  std::vector<store::Transect> out;
  for (const auto& t : set.transects) out.push_back({t.id, t.geometry, transect_feature({t.id, t.geometry, {}})});
  return out;
}

// The stored transects with their RFC 7946 geometry: a lon/lat LineString origin -> end
// (a Point at the origin when the length is unknown) beside the site-CRS properties.
nlohmann::json transect_collection(const store::Site& site, const std::vector<store::Transect>& transects) {
  std::vector<TransectGeometry> geometries;
  for (const auto& t : transects) geometries.push_back(t.geometry);
  const auto lines = geo::transect_lines_lon_lat(site.crs, geometries, "site \"" + site.id + "\" CRS");
  nlohmann::json features = nlohmann::json::array();
  for (std::size_t i = 0; i < transects.size(); ++i) {
    nlohmann::json f = transect_feature(transects[i]);
    nlohmann::json coordinates = nlohmann::json::array();
    for (const geo::XY& p : lines[i]) coordinates.push_back({p.x, p.y});
    f["geometry"] = lines[i].size() == 1 ? nlohmann::json{{"type", "Point"}, {"coordinates", coordinates[0]}}
                                         : nlohmann::json{{"type", "LineString"}, {"coordinates", coordinates}};
    features.push_back(std::move(f));
  }
  return {{"type", "FeatureCollection"}, {"site_crs", site.crs}, {"features", features}};
}

void put_transects(Context& c) {
  const auto site = c.site_or_404(c.path_param(0));
  const auto body = c.json_body();  // checks media type and JSON syntax first
  if (!body.is_object() || body.value("type", "") != "FeatureCollection" || !body.contains("features") ||
      !body["features"].is_array())
    throw schema_problem("/type", "expected a GeoJSON FeatureCollection");
  const auto transects = read_transect_collection(c.req.body, site);
  for (std::size_t i = 0; i < transects.size(); ++i)
    if (auto why = id_problem(transects[i].id, "transect id", true))
      throw Problem(422, problem_type::invalid_body, "Invalid transect id", *why,
                    {{"pointer", "/features/" + std::to_string(i) + "/properties/transect_id"}});
  c.service.store.replace_transects(site.id, transects);
  c.reply(200, transect_collection(site, transects));
}

void get_transects(Context& c) {
  const auto site = c.site_or_404(c.path_param(0));
  c.reply(200, transect_collection(site, c.service.store.transects(site.id)));
}

}  // namespace

std::vector<Route> site_routes() {
  return {
      {{"POST", "/v1/sites"}, Access::write, create_site},
      {{"GET", "/v1/sites"}, Access::read, list_sites},
      {{"GET", "/v1/sites/{site}"}, Access::read, get_site},
      {{"PUT", "/v1/sites/{site}/transects"}, Access::write, put_transects},
      {{"GET", "/v1/sites/{site}/transects"}, Access::read, get_transects},
  };
}

}  // namespace strandline::http
