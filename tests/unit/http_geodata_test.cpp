// Geodata over HTTP on a real loopback server: the export of a run as
// GeoPackage / GeoJSON, shoreline polyline uploads intersected with the site's
// transects. Files are opened with GDAL itself and coordinates re-projected
// with GDAL/OSR, independently of the service's own PROJ adapter.
#include <gtest/gtest.h>
#include <unistd.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <thread>

#include <gdal_priv.h>
#include <ogr_spatialref.h>
#include <ogrsf_frmts.h>
#include <httplib.h>
#include <nlohmann/json.hpp>

#include "corrections/core/time_utc.h"
#include "server/http/service.h"
#include "server/store/api_keys.h"

using namespace strandline;
using nlohmann::json;

namespace {

// Two shore-normal transects in EPSG:32631 pointing south (azimuth 180°), so a
// point at chainage c lies at (x0, 5902000 - c).
const char* kTransects = R"({"type":"FeatureCollection",
 "crs":{"type":"name","properties":{"name":"urn:ogc:def:crs:EPSG::32631"}},
 "features":[
  {"type":"Feature","properties":{"transect_id":"T1"},"geometry":{"type":"LineString","coordinates":[[431000,5902000],[431000,5901600]]}},
  {"type":"Feature","properties":{"transect_id":"T2"},"geometry":{"type":"LineString","coordinates":[[431100,5902000],[431100,5901600]]}}]})";
constexpr double kOriginY = 5902000;

std::string observations_csv(int images) {
  std::ostringstream out;
  out << "transect_id,time,chainage_m,sensor,image_id\n";
  for (int i = 0; i < images; ++i)
    for (const char* t : {"T1", "T2"})
      out << t << "," << format_time_utc(1577872800.0 + 3600.0 * i) << "," << 150 + i * 0.5 << ",sentinel2a,IMG" << i
          << "\n";
  return out.str();
}

std::string water_levels_csv() {
  std::ostringstream out;
  out << "time,level_m\n";
  for (int d = 1; d <= 3; ++d)
    for (int h = 0; h < 24; ++h) {
      char time[32];
      std::snprintf(time, sizeof time, "2020-01-%02dT%02d:00:00Z", d, h);
      out << time << "," << 0.5 * std::sin(h * 0.5) << "\n";
    }
  return out.str();
}

// One shoreline feature: a straight line across both transects at northing y.
json shoreline_feature(double y, const std::string& image, const std::string& time) {
  return {{"type", "Feature"},
          {"properties", {{"time", time}, {"sensor", "sentinel2a"}, {"image_id", image}, {"cloud_fraction", 0.2}}},
          {"geometry", {{"type", "LineString"}, {"coordinates", {{430900, y}, {431200, y}}}}}};
}

json utm_collection(json features) {
  return {{"type", "FeatureCollection"},
          {"crs", {{"type", "name"}, {"properties", {{"name", "urn:ogc:def:crs:EPSG::32631"}}}}},
          {"features", features}};
}

// EPSG:32631 easting/northing -> WGS 84 lon/lat with GDAL's OSR (traditional GIS axis order).
std::pair<double, double> utm31_to_lonlat(double x, double y) {
  OGRSpatialReference utm, wgs;
  utm.importFromEPSG(32631);
  wgs.importFromEPSG(4326);
  utm.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  wgs.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  std::unique_ptr<OGRCoordinateTransformation> ct(OGRCreateCoordinateTransformation(&utm, &wgs));
  EXPECT_TRUE(ct);
  ct->Transform(1, &x, &y);
  return {x, y};
}

class HttpGeodata : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = std::filesystem::temp_directory_path() /
           ("strandline-http-geodata-" + std::to_string(getpid()) + "-" +
            ::testing::UnitTest::GetInstance()->current_test_info()->name());
    std::filesystem::remove_all(dir_);
    std::filesystem::create_directories(dir_);
    store_ = store::open_sqlite_store((dir_ / "service.db").string());
    auto w = store::generate_api_key("writer", "write");
    store_->add_key(w.record);
    write_key_ = w.secret;
    service_ = std::make_unique<http::Service>(*store_, http::ServiceOptions{});
    port_ = service_->bind("127.0.0.1", 0);
    ASSERT_GT(port_, 0);
    service_->start();
    auto r = post("/v1/sites", R"({"id":"cove","name":"Invented Cove","crs":"EPSG:32631","default_slope":0.1})",
                  "application/json");
    ASSERT_TRUE(r && r->status == 201);
    auto t = client().Put("/v1/sites/cove/transects", auth(), kTransects, "application/json");
    ASSERT_TRUE(t && t->status == 200) << (t ? t->body : "");
  }
  void TearDown() override {
    if (service_) service_->stop();
    service_.reset();
    store_.reset();
    std::filesystem::remove_all(dir_);
  }
  httplib::Client client() const {
    httplib::Client c("127.0.0.1", port_);
    c.set_read_timeout(60);
    return c;
  }
  httplib::Headers auth() const { return {{"Authorization", "Bearer " + write_key_}}; }
  httplib::Result post(const std::string& path, const std::string& body, const std::string& type) {
    return client().Post(path.c_str(), auth(), body, type.c_str());
  }
  std::int64_t run_to_completion() {
    EXPECT_EQ(post("/v1/sites/cove/observations", observations_csv(40), "text/csv")->status, 201);
    EXPECT_EQ(post("/v1/sites/cove/water-levels", water_levels_csv(), "text/csv")->status, 201);
    auto started = post("/v1/sites/cove/runs", "{}", "application/json");
    EXPECT_TRUE(started && started->status == 202);
    const auto id = json::parse(started->body)["run_id"].get<std::int64_t>();
    for (int i = 0; i < 600; ++i) {
      auto j = json::parse(client().Get(("/v1/runs/" + std::to_string(id)).c_str())->body);
      if (j["state"] == "done") return id;
      EXPECT_NE(j["state"], "failed") << j.dump();
      std::this_thread::sleep_for(std::chrono::milliseconds(50));
    }
    ADD_FAILURE() << "run did not finish";
    return id;
  }
  static void expect_problem(const httplib::Result& r, int status, const std::string& type) {
    ASSERT_TRUE(r);
    EXPECT_EQ(r->status, status) << r->body;
    EXPECT_EQ(r->get_header_value("Content-Type"), "application/problem+json");
    EXPECT_EQ(json::parse(r->body)["type"], type);
  }

  std::filesystem::path dir_;
  std::unique_ptr<store::Store> store_;
  std::unique_ptr<http::Service> service_;
  std::string write_key_;
  int port_ = 0;
};

TEST_F(HttpGeodata, ExportAnswers404WithoutRunAnd400ForABadFormat) {
  expect_problem(client().Get("/v1/sites/nowhere/export?format=gpkg"), 404, "/problems/not-found");
  expect_problem(client().Get("/v1/sites/cove/export?format=gpkg"), 404, "/problems/not-found");
  expect_problem(client().Get("/v1/sites/cove/export?format=shp"), 400, "/problems/bad-request");
  expect_problem(client().Get("/v1/sites/cove/export?format=gpkg&layer=transects"), 400, "/problems/bad-request");
  expect_problem(client().Get("/v1/sites/cove/export?format=gpkg&run=x"), 400, "/problems/bad-request");
}

TEST_F(HttpGeodata, GeoPackageExportHasBothLayersInTheSiteCrs) {
  const auto run_id = run_to_completion();
  auto r = client().Get(("/v1/sites/cove/export?format=gpkg&run=" + std::to_string(run_id)).c_str());
  ASSERT_TRUE(r);
  ASSERT_EQ(r->status, 200) << r->body;
  EXPECT_EQ(r->get_header_value("Content-Type"), "application/geopackage+sqlite3");
  const auto path = (dir_ / "export.gpkg").string();
  std::ofstream(path, std::ios::binary) << r->body;

  GDALAllRegister();
  std::unique_ptr<GDALDataset> ds(GDALDataset::Open(path.c_str(), GDAL_OF_VECTOR | GDAL_OF_READONLY));
  ASSERT_TRUE(ds) << "GDAL cannot open the export";
  OGRLayer* points = ds->GetLayerByName("shoreline_points");
  OGRLayer* transects = ds->GetLayerByName("transects");
  ASSERT_TRUE(points && transects);
  EXPECT_EQ(points->GetFeatureCount(), 80);
  EXPECT_EQ(transects->GetFeatureCount(), 2);
  for (OGRLayer* layer : {points, transects}) {
    const OGRSpatialReference* srs = layer->GetSpatialRef();
    ASSERT_TRUE(srs);
    EXPECT_STREQ(srs->GetAuthorityName(nullptr), "EPSG");
    EXPECT_STREQ(srs->GetAuthorityCode(nullptr), "32631");
  }
  // Each point sits on its transect at its chainage (azimuth 180°: straight south of the origin).
  int checked = 0;
  points->ResetReading();
  for (std::unique_ptr<OGRFeature> f(points->GetNextFeature()); f; f.reset(points->GetNextFeature())) {
    const std::string id = f->GetFieldAsString("transect_id");
    const double chainage = f->GetFieldAsDouble("chainage_m");
    const auto* p = f->GetGeometryRef()->toPoint();
    EXPECT_NEAR(p->getX(), id == "T1" ? 431000.0 : 431100.0, 1e-6);
    EXPECT_NEAR(p->getY(), kOriginY - chainage, 1e-6);
    ++checked;
  }
  EXPECT_EQ(checked, 80);
  // The transect layer carries the run's per-transect summary.
  EXPECT_GE(transects->GetLayerDefn()->GetFieldIndex("run_id"), 0);
  transects->ResetReading();
  std::unique_ptr<OGRFeature> t(transects->GetNextFeature());
  ASSERT_TRUE(t);
  EXPECT_EQ(t->GetFieldAsInteger64("run_id"), run_id);
  EXPECT_GT(transects->GetLayerDefn()->GetFieldCount(), 4);
}

TEST_F(HttpGeodata, GeoJsonExportIsLonLat) {
  run_to_completion();
  auto r = client().Get("/v1/sites/cove/export?format=geojson");
  ASSERT_TRUE(r);
  ASSERT_EQ(r->status, 200) << r->body;
  EXPECT_EQ(r->get_header_value("Content-Type"), "application/geo+json");
  const auto doc = json::parse(r->body);
  EXPECT_EQ(doc["type"], "FeatureCollection");
  ASSERT_EQ(doc["features"].size(), 80u);
  for (const auto& f : doc["features"]) {
    const double chainage = f["properties"]["chainage_m"].get<double>();
    const double x = f["properties"]["transect_id"] == "T1" ? 431000.0 : 431100.0;
    const auto [lon, lat] = utm31_to_lonlat(x, kOriginY - chainage);  // GDAL/OSR as the reference
    const auto& c = f["geometry"]["coordinates"];
    EXPECT_NEAR(c[0].get<double>(), lon, 1e-7);  // 1e-7 degrees: about a centimetre
    EXPECT_NEAR(c[1].get<double>(), lat, 1e-7);
  }
  auto t = client().Get("/v1/sites/cove/export?format=geojson&layer=transects");
  ASSERT_TRUE(t && t->status == 200);
  const auto tdoc = json::parse(t->body);
  ASSERT_EQ(tdoc["features"].size(), 2u);
  EXPECT_EQ(tdoc["features"][0]["geometry"]["type"], "LineString");
  const auto [lon0, lat0] = utm31_to_lonlat(431000, kOriginY);
  bool found = false;
  for (const auto& f : tdoc["features"])
    if (f["properties"]["transect_id"] == "T1") {
      found = true;
      EXPECT_NEAR(f["geometry"]["coordinates"][0][0].get<double>(), lon0, 1e-7);
      EXPECT_NEAR(f["geometry"]["coordinates"][0][1].get<double>(), lat0, 1e-7);
    }
  EXPECT_TRUE(found);
}

TEST_F(HttpGeodata, ShorelineUploadStoresCrossingsAsObservations) {
  // Image A crosses both transects 150 m seaward (projected body); image B is
  // given in lon/lat (no crs member: RFC 7946) 212.5 m seaward.
  json features = json::array({shoreline_feature(kOriginY - 150, "IMG-A", "2020-01-01T10:00:00Z")});
  auto r = post("/v1/sites/cove/shorelines", utm_collection(features).dump(), "application/geo+json");
  ASSERT_TRUE(r);
  ASSERT_EQ(r->status, 201) << r->body;
  auto report = json::parse(r->body);
  EXPECT_EQ(report["kind"], "observations");
  EXPECT_EQ(report["inserted"], 2);
  EXPECT_EQ(report["duplicates"], 0);

  const auto [lon_w, lat_w] = utm31_to_lonlat(430900, kOriginY - 212.5);
  const auto [lon_e, lat_e] = utm31_to_lonlat(431200, kOriginY - 212.5);
  json lonlat = {{"type", "FeatureCollection"},
                 {"features", {{{"type", "Feature"},
                                {"properties", {{"time", "2020-01-02T10:00:00Z"}, {"sensor", "landsat8"}, {"image_id", "IMG-B"}}},
                                {"geometry", {{"type", "LineString"}, {"coordinates", {{lon_w, lat_w}, {lon_e, lat_e}}}}}}}}};
  auto b = post("/v1/sites/cove/shorelines", lonlat.dump(), "application/json");
  ASSERT_TRUE(b);
  ASSERT_EQ(b->status, 201) << b->body;
  EXPECT_EQ(json::parse(b->body)["inserted"], 2);

  const auto rows = store_->live_observations("cove", {});
  ASSERT_EQ(rows.size(), 4u);
  for (const auto& row : rows) {
    if (row.image_id == "IMG-A") {
      EXPECT_NEAR(row.chainage_m, 150.0, 1e-6);
      EXPECT_EQ(row.time_s, parse_time_utc("2020-01-01T10:00:00Z"));
      EXPECT_EQ(row.sensor, "sentinel2a");
      EXPECT_NEAR(row.cloud_fraction, 0.2, 1e-12);
    } else {
      EXPECT_EQ(row.image_id, "IMG-B");
      // The lon/lat line is straight in the work CRS between re-projected
      // vertices, so the crossing is 212.5 m to well under a millimetre.
      EXPECT_NEAR(row.chainage_m, 212.5, 1e-3);
      EXPECT_EQ(row.sensor, "landsat8");
    }
  }

  // The same body again: duplicates, nothing new.
  auto again = post("/v1/sites/cove/shorelines", utm_collection(features).dump(), "application/geo+json");
  ASSERT_TRUE(again && again->status == 201) << again->body;
  EXPECT_EQ(json::parse(again->body)["inserted"], 0);
  EXPECT_EQ(json::parse(again->body)["duplicates"], 2);

  // The same image with another position contradicts the stored rows.
  json moved = json::array({shoreline_feature(kOriginY - 160, "IMG-A", "2020-01-01T10:00:00Z")});
  expect_problem(post("/v1/sites/cove/shorelines", utm_collection(moved).dump(), "application/geo+json"), 409,
                 "/problems/conflict");
  EXPECT_EQ(store_->live_observations("cove", {}).size(), 4u);
}

TEST_F(HttpGeodata, BadShorelinesAre422NamingTheFeature) {
  json point = {{"type", "Feature"},
                {"properties", {{"time", "2020-01-01T10:00:00Z"}, {"sensor", "sentinel2a"}, {"image_id", "IMG-P"}}},
                {"geometry", {{"type", "Point"}, {"coordinates", {431000, 5901850}}}}};
  json features = json::array({shoreline_feature(kOriginY - 150, "IMG-A", "2020-01-01T10:00:00Z"), point});
  auto r = post("/v1/sites/cove/shorelines", utm_collection(features).dump(), "application/geo+json");
  expect_problem(r, 422, "/problems/invalid-body");
  auto problem = json::parse(r->body);
  EXPECT_EQ(problem["pointer"], "/features/1") << problem.dump();
  EXPECT_NE(problem["detail"].get<std::string>().find("FID 1"), std::string::npos) << problem.dump();
  EXPECT_EQ(problem["detail"].get<std::string>().find("/tmp"), std::string::npos) << problem.dump();

  json no_time = shoreline_feature(kOriginY - 150, "IMG-C", "");
  auto t = post("/v1/sites/cove/shorelines", utm_collection(json::array({shoreline_feature(kOriginY - 150, "IMG-D", "2020-01-01T10:00:00Z"), no_time})).dump(),
                "application/geo+json");
  expect_problem(t, 422, "/problems/invalid-body");
  EXPECT_EQ(json::parse(t->body)["pointer"], "/features/1");

  expect_problem(post("/v1/sites/cove/shorelines", R"({"type":"Feature"})", "application/geo+json"), 422,
                 "/problems/invalid-body");
  expect_problem(post("/v1/sites/cove/shorelines", "{", "application/geo+json"), 400, "/problems/bad-json");
  expect_problem(post("/v1/sites/cove/shorelines", "a,b\n", "text/csv"), 415, "/problems/unsupported-media-type");
  EXPECT_TRUE(store_->live_observations("cove", {}).empty());
}

TEST_F(HttpGeodata, InvalidCrossingRowsFollowTheObservationRules) {
  // A sensor missing from the sensor table makes both crossings of image U invalid rows.
  json unknown = shoreline_feature(kOriginY - 140, "IMG-U", "2020-01-03T10:00:00Z");
  unknown["properties"]["sensor"] = "no-such-sensor";
  const std::string body =
      utm_collection(json::array({shoreline_feature(kOriginY - 150, "IMG-A", "2020-01-01T10:00:00Z"), unknown})).dump();
  auto rejected = post("/v1/sites/cove/shorelines", body, "application/geo+json");
  expect_problem(rejected, 422, "/problems/invalid-rows");
  const auto rows = json::parse(rejected->body)["rows"];
  ASSERT_EQ(rows.size(), 2u) << rows.dump();
  for (const auto& r : rows) {
    EXPECT_EQ(r["image_id"], "IMG-U");
    EXPECT_EQ(r["field"], "sensor");
  }
  EXPECT_TRUE(store_->live_observations("cove", {}).empty());

  auto skipped = post("/v1/sites/cove/shorelines?on_invalid=skip", body, "application/geo+json");
  ASSERT_TRUE(skipped && skipped->status == 201) << skipped->body;
  const auto report = json::parse(skipped->body);
  EXPECT_EQ(report["inserted"], 2);
  EXPECT_EQ(report["rejected"], 2);
  EXPECT_EQ(store_->live_observations("cove", {}).size(), 2u);
}

TEST_F(HttpGeodata, BothRoutesAreInTheOpenApiDocument) {
  auto doc = client().Get("/v1/openapi.json");
  ASSERT_TRUE(doc && doc->status == 200);
  const auto openapi = json::parse(doc->body);
  EXPECT_TRUE(openapi["paths"]["/v1/sites/{site}/export"].contains("get"));
  EXPECT_TRUE(openapi["paths"]["/v1/sites/{site}/shorelines"].contains("post"));
}

}  // namespace
