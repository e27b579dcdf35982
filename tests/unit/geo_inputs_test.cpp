// Geodata inputs: transects, shorelines and baselines that are wrong in one way
// each must fail with a message naming the layer and the feature (FID); plus the
// geometric conventions (azimuth clockwise from grid north, UTM zone numbers).
#include <filesystem>
#include <fstream>
#include <string>

#include <gdal_priv.h>
#include <gtest/gtest.h>
#include <ogrsf_frmts.h>

#include "corrections/core/errors.h"
#include "server/geo/baseline_transects.h"
#include "server/geo/crs.h"
#include "server/geo/shoreline_intersect.h"
#include "server/geo/transect_reader.h"

namespace fs = std::filesystem;
using namespace strandline;
using namespace strandline::geo;

namespace {

class GeoInputs : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() / ("strandline_geo_" + std::to_string(::getpid()) + "_" +
                                        ::testing::UnitTest::GetInstance()->current_test_info()->name());
    fs::create_directories(dir_);
  }
  void TearDown() override { fs::remove_all(dir_); }

  // A GeoJSON FeatureCollection in `crs` (legacy member) or RFC 7946 lon/lat.
  std::string geojson(const std::string& name, const std::string& features, const std::string& crs = "") {
    const fs::path p = dir_ / name;
    std::ofstream out(p);
    out << "{\"type\":\"FeatureCollection\",";
    if (!crs.empty()) out << "\"crs\":{\"type\":\"name\",\"properties\":{\"name\":\"" << crs << "\"}},";
    out << "\"features\":[" << features << "]}";
    return p.string();
  }

  static std::string line(const std::string& props, const std::string& coords) {
    return "{\"type\":\"Feature\",\"properties\":{" + props + "},\"geometry\":{\"type\":\"LineString\",\"coordinates\":[" +
           coords + "]}}";
  }

  TransectSet utm_transects() {
    return read_transects(geojson("t.geojson",
                                  line("\"transect_id\":\"A\"", "[500000,5000000],[500000,4999600]") + "," +
                                      line("\"transect_id\":\"B\"", "[500100,5000000],[500100,4999600]"),
                                  "urn:ogc:def:crs:EPSG::32631"),
                          {});
  }

  fs::path dir_;
};

// Expects InputError whose message contains every piece.
template <class F>
void expect_input_error(F&& f, std::initializer_list<std::string> pieces) {
  try {
    f();
    FAIL() << "no error";
  } catch (const InputError& e) {
    const std::string msg = e.what();
    for (const auto& p : pieces) EXPECT_NE(msg.find(p), std::string::npos) << "\"" << p << "\" not in: " << msg;
  }
}

}  // namespace

TEST_F(GeoInputs, LineTransectAzimuthIsClockwiseFromGridNorth) {
  // Invented geometry in EPSG:32631: the line from the origin towards the east
  // has azimuth 90, towards the south 180 (definition of a bearing).
  auto set = read_transects(geojson("t.geojson",
                                    line("\"transect_id\":\"E\"", "[500000,5000000],[500300,5000000]") + "," +
                                        line("\"transect_id\":\"S\"", "[500000,5000000],[500000,4999600]"),
                                    "urn:ogc:def:crs:EPSG::32631"),
                            {});
  ASSERT_EQ(set.transects.size(), 2u);
  EXPECT_EQ(set.crs.authority, "EPSG:32631");
  EXPECT_NEAR(set.transects[0].geometry.azimuth_deg, 90.0, 1e-12);
  EXPECT_NEAR(set.transects[0].geometry.length_m, 300.0, 1e-9);
  EXPECT_NEAR(set.transects[1].geometry.azimuth_deg, 180.0, 1e-12);
  EXPECT_DOUBLE_EQ(set.transects[1].geometry.origin_y_m, 5000000.0);
}

TEST_F(GeoInputs, UtmZoneNumbers) {
  // Zone n spans longitudes [-180 + 6(n-1), -180 + 6n) (definition of the UTM grid).
  EXPECT_EQ(utm_zone_number(3.0), 31);
  EXPECT_EQ(utm_zone_number(-0.1), 30);
  EXPECT_EQ(utm_zone_number(-180.0), 1);
  EXPECT_EQ(utm_zone_number(179.99), 60);
  EXPECT_EQ(utm_authority_for(3.0, 45.0), "EPSG:32631");
  EXPECT_EQ(utm_authority_for(151.2, -33.9), "EPSG:32756");
}

TEST_F(GeoInputs, GeographicTransectsGetUtmWorkCrsReported) {
  auto set = read_transects(
      geojson("t.geojson", line("\"transect_id\":\"A\"", "[3.1,45.0],[3.1,44.996]")), {});
  EXPECT_EQ(set.crs.authority, "EPSG:32631");
  EXPECT_NE(set.crs.choice.find("UTM zone"), std::string::npos);
  EXPECT_NEAR(set.transects[0].geometry.azimuth_deg, 180.0, 0.2);  // grid convergence ~0.06 deg here
}

TEST_F(GeoInputs, MissingFileIsNamed) {
  expect_input_error([&] { read_transects((dir_ / "absent.gpkg").string(), {}); }, {"absent.gpkg", "no such file"});
}

TEST_F(GeoInputs, MissingIdAttributeNamesLayerAndField) {
  const auto p = geojson("t.geojson", line("\"name\":\"A\"", "[3.1,45.0],[3.1,44.996]"));
  expect_input_error([&] { read_transects(p, {}); }, {"layer t", "missing attribute \"transect_id\"", "name"});
}

TEST_F(GeoInputs, ConfigurableIdAttribute) {
  const auto p = geojson("t.geojson", line("\"name\":\"A\"", "[3.1,45.0],[3.1,44.996]"));
  TransectReadOptions o;
  o.id_field = "name";
  EXPECT_EQ(read_transects(p, o).transects.at(0).id, "A");
}

TEST_F(GeoInputs, DuplicateIdNamesBothFeatures) {
  const auto p = geojson("t.geojson", line("\"transect_id\":\"A\"", "[3.1,45.0],[3.1,44.996]") + "," +
                                          line("\"transect_id\":\"A\"", "[3.2,45.0],[3.2,44.996]"));
  expect_input_error([&] { read_transects(p, {}); }, {"feature FID 1", "already used by feature FID 0"});
}

TEST_F(GeoInputs, WrongGeometryTypeNamed) {
  const auto p = geojson("t.geojson",
                         "{\"type\":\"Feature\",\"properties\":{\"transect_id\":\"A\"},\"geometry\":{\"type\":"
                         "\"Polygon\",\"coordinates\":[[[3,45],[3.1,45],[3.1,45.1],[3,45]]]}}");
  expect_input_error([&] { read_transects(p, {}); }, {"feature FID 0", "Polygon", "expected a LineString"});
}

TEST_F(GeoInputs, EmptyGeometryNamed) {
  const auto p = geojson("t.geojson",
                         "{\"type\":\"Feature\",\"properties\":{\"transect_id\":\"A\"},\"geometry\":null}");
  expect_input_error([&] { read_transects(p, {}); }, {"feature FID 0", "empty geometry"});
}

TEST_F(GeoInputs, BentTransectRefused) {
  const auto p = geojson("t.geojson", line("\"transect_id\":\"A\"", "[500000,5000000],[500050,4999800],[500000,4999600]"),
                         "urn:ogc:def:crs:EPSG::32631");
  expect_input_error([&] { read_transects(p, {}); }, {"feature FID 0", "not straight"});
}

TEST_F(GeoInputs, PointTransectsNeedAzimuthAndLength) {
  const auto p = geojson("t.geojson",
                         "{\"type\":\"Feature\",\"properties\":{\"transect_id\":\"A\",\"length_m\":300},"
                         "\"geometry\":{\"type\":\"Point\",\"coordinates\":[3.1,45.0]}}");
  expect_input_error([&] { read_transects(p, {}); }, {"layer t", "missing attribute \"azimuth_deg\""});
}

TEST_F(GeoInputs, NonProjectedCrsOptionRefused) {
  const auto p = geojson("t.geojson", line("\"transect_id\":\"A\"", "[3.1,45.0],[3.1,44.996]"));
  TransectReadOptions o;
  o.crs = "EPSG:4326";
  expect_input_error([&] { read_transects(p, o); }, {"work CRS", "not a projected CRS"});
  o.crs = "no such crs";
  expect_input_error([&] { read_transects(p, o); }, {"work CRS", "not a coordinate reference system"});
}

TEST_F(GeoInputs, LayerWithoutCrsRefused) {
  GDALAllRegister();
  const std::string shp = (dir_ / "nocrs.shp").string();
  {
    GDALDriver* drv = GetGDALDriverManager()->GetDriverByName("ESRI Shapefile");
    GDALDataset* ds = drv->Create(shp.c_str(), 0, 0, 0, GDT_Unknown, nullptr);
    OGRLayer* layer = ds->CreateLayer("nocrs", nullptr, wkbLineString, nullptr);
    OGRFieldDefn id("transect_id", OFTString);
    layer->CreateField(&id);
    OGRFeature* f = OGRFeature::CreateFeature(layer->GetLayerDefn());
    f->SetField(0, "A");
    OGRLineString l;
    l.addPoint(0, 0);
    l.addPoint(0, 100);
    f->SetGeometry(&l);
    ASSERT_EQ(layer->CreateFeature(f), OGRERR_NONE);
    OGRFeature::DestroyFeature(f);
    GDALClose(ds);
  }
  expect_input_error([&] { read_transects(shp, {}); }, {"layer nocrs", "no CRS"});
}

TEST_F(GeoInputs, ShorelineMissingTimeAttributeNamed) {
  const auto t = utm_transects();
  const auto s = geojson("s.geojson", line("\"sensor\":\"s1\",\"image_id\":\"i1\"", "[2.99,45.1],[3.01,45.1]"));
  expect_input_error([&] { intersect_shorelines(s, t, {}); }, {"layer s", "missing attribute \"time\""});
}

TEST_F(GeoInputs, ShorelineBadTimeNamesFeature) {
  const auto t = utm_transects();
  const auto s = geojson("s.geojson",
                         line("\"time\":\"2020-01-01 10:00\",\"sensor\":\"s1\",\"image_id\":\"i1\"", "[2.99,45.1],[3.01,45.1]"));
  expect_input_error([&] { intersect_shorelines(s, t, {}); }, {"feature FID 0", "time \"2020-01-01T10:00", "missing zone designator"});
}

TEST_F(GeoInputs, ShorelinePolygonRefused) {
  const auto t = utm_transects();
  const auto s = geojson("s.geojson",
                         "{\"type\":\"Feature\",\"properties\":{\"time\":\"2020-01-01T10:00:00Z\",\"sensor\":\"s1\","
                         "\"image_id\":\"i1\"},\"geometry\":{\"type\":\"Point\",\"coordinates\":[3,45]}}");
  expect_input_error([&] { intersect_shorelines(s, t, {}); }, {"feature FID 0", "Point"});
}

TEST_F(GeoInputs, ShorelinesOfOneImageMustAgree) {
  const auto t = utm_transects();
  const auto s = geojson("s.geojson", line("\"time\":\"2020-01-01T10:00:00Z\",\"sensor\":\"s1\",\"image_id\":\"i1\"",
                                           "[2.99,45.1],[3.01,45.1]") +
                                          "," +
                                          line("\"time\":\"2020-01-02T10:00:00Z\",\"sensor\":\"s1\",\"image_id\":\"i1\"",
                                               "[2.99,45.2],[3.01,45.2]"));
  expect_input_error([&] { intersect_shorelines(s, t, {}); },
                     {"feature FID 1", "another time than feature FID 0", "\"i1\""});
}

TEST_F(GeoInputs, UntransformableShorelineCrsRefused) {
  // An engineering (local) CRS has no relation to the earth: PROJ cannot
  // transform it to the work CRS.
  GDALAllRegister();
  const auto t = utm_transects();
  const std::string gpkg = (dir_ / "local.gpkg").string();
  {
    GDALDriver* drv = GetGDALDriverManager()->GetDriverByName("GPKG");
    GDALDataset* ds = drv->Create(gpkg.c_str(), 0, 0, 0, GDT_Unknown, nullptr);
    OGRSpatialReference local;
    local.SetFromUserInput("LOCAL_CS[\"site grid\",UNIT[\"metre\",1],AXIS[\"X\",EAST],AXIS[\"Y\",NORTH]]");
    OGRLayer* layer = ds->CreateLayer("lines", &local, wkbLineString, nullptr);
    for (const char* name : {"time", "sensor", "image_id"}) {
      OGRFieldDefn d(name, OFTString);
      layer->CreateField(&d);
    }
    OGRFeature* f = OGRFeature::CreateFeature(layer->GetLayerDefn());
    f->SetField(0, "2020-01-01T10:00:00Z");
    f->SetField(1, "s1");
    f->SetField(2, "i1");
    OGRLineString l;
    l.addPoint(0, 0);
    l.addPoint(100, 0);
    f->SetGeometry(&l);
    ASSERT_EQ(layer->CreateFeature(f), OGRERR_NONE);
    OGRFeature::DestroyFeature(f);
    GDALClose(ds);
  }
  expect_input_error([&] { intersect_shorelines(gpkg, t, {}); }, {"layer lines", "no coordinate transformation"});
}

TEST_F(GeoInputs, CrossingsCountedAndChosen) {
  // A zig-zag crossing transect A (x = 500000, origin y = 5000000, azimuth 180)
  // at chainages 100 and 300: outermost keeps 300, innermost 100.
  const auto t = utm_transects();
  const auto s = geojson("s.geojson",
                         line("\"time\":\"2020-01-01T10:00:00Z\",\"sensor\":\"s1\",\"image_id\":\"i1\"",
                              "[499990,4999900],[500010,4999900],[500010,4999700],[499990,4999700]"),
                         "urn:ogc:def:crs:EPSG::32631");
  IntersectOptions o;
  auto r = intersect_shorelines(s, t, o);
  ASSERT_EQ(r.rows.size(), 1u);
  EXPECT_EQ(r.rows[0].transect_id, "A");
  EXPECT_EQ(r.rows[0].crossings, 2);
  EXPECT_NEAR(r.rows[0].chainage_m, 300.0, 1e-9);
  EXPECT_EQ(r.report.never_crossed, std::vector<std::string>{"B"});
  o.rule = CrossingRule::innermost;
  EXPECT_NEAR(intersect_shorelines(s, t, o).rows.at(0).chainage_m, 100.0, 1e-9);
  o.rule = CrossingRule::omit;
  auto flagged = intersect_shorelines(s, t, o);
  EXPECT_TRUE(flagged.rows.empty());
  EXPECT_EQ(flagged.report.left_out_ambiguous, 1u);
}

TEST_F(GeoInputs, LongPolylineCrossingsAllFound) {
  // A zig-zag of 200 vertices (x = 500000 -/+ 10 m, 1.5 m apart in y) crosses
  // transect A once per segment, at the segment midpoints: chainages
  // 10 + 1.5 (i + 0.5), i = 0..198 (the polyline is cut into pieces inside).
  const auto t = utm_transects();
  std::string coords;
  for (int i = 0; i < 200; ++i) {
    if (i) coords += ",";
    coords += "[" + std::to_string(i % 2 ? 500010 : 499990) + "," + std::to_string(4999990.0 - 1.5 * i) + "]";
  }
  const auto s = geojson("s.geojson", line("\"time\":\"2020-01-01T10:00:00Z\",\"sensor\":\"s1\",\"image_id\":\"i1\"", coords),
                         "urn:ogc:def:crs:EPSG::32631");
  auto r = intersect_shorelines(s, t, {});
  ASSERT_EQ(r.rows.size(), 1u);
  EXPECT_EQ(r.rows[0].crossings, 199);
  EXPECT_NEAR(r.rows[0].chainage_m, 10 + 1.5 * 198.5, 1e-9);
}

TEST_F(GeoInputs, BaselineTransectsAreNormalOnTheSeaSide) {
  // A straight baseline due east: the sea on the right means transects point
  // south (azimuth 180), one every 50 m including both ends.
  const auto p = geojson("b.geojson", line("", "[500000,5000000],[500200,5000000]"), "urn:ogc:def:crs:EPSG::32631");
  BaselineOptions o;
  o.spacing_m = 50;
  o.length_m = 400;
  o.sea_side = SeaSide::right;
  auto made = transects_from_baseline(p, o);
  ASSERT_EQ(made.set.transects.size(), 5u);
  for (std::size_t i = 0; i < 5; ++i) {
    const auto& g = made.set.transects[i].geometry;
    EXPECT_NEAR(g.azimuth_deg, 180.0, 1e-9);
    EXPECT_NEAR(g.origin_x_m, 500000.0 + 50.0 * static_cast<double>(i), 1e-6);
    EXPECT_NEAR(g.origin_y_m, 5000000.0, 1e-6);
  }
  EXPECT_EQ(made.set.transects[0].id, "T0001");
  o.sea_side = SeaSide::left;
  EXPECT_NEAR(transects_from_baseline(p, o).set.transects[0].geometry.azimuth_deg, 0.0, 1e-9);
}

TEST_F(GeoInputs, SelfIntersectingBaselineRefused) {
  const auto p = geojson("b.geojson", line("", "[500000,5000000],[500200,5000000],[500100,5000100],[500100,4999900]"),
                         "urn:ogc:def:crs:EPSG::32631");
  BaselineOptions o;
  expect_input_error([&] { transects_from_baseline(p, o); }, {"feature FID 0", "intersects itself"});
}

// Found by fuzz_transects_geojson (the input is kept in its corpus): a GeoJSON
// body holding "<OGRVRTDataSource" in a property name was opened by GDAL's VRT
// driver, whose error quoted the body's raw bytes into our message and so into
// the reply (not UTF-8). Messages are now printable, and a body the service
// reads opens with the GeoJSON driver only.
TEST_F(GeoInputs, OpenErrorsArePrintableAndDriversCanBeRestricted) {
  const std::string finding =
      std::string(STRANDLINE_SOURCE_DIR) + "/tests/fuzz/corpus/fuzz_transects_geojson/finding_vrt_sniffed_in_geojson_body";
  TransectReadOptions any;
  any.crs = "EPSG:32631";
  try {
    read_transects(finding, any);
    FAIL() << "the finding was read as transects";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("cannot open"), std::string::npos) << e.what();
    EXPECT_EQ(std::string(e.what()).find('\xFF'), std::string::npos) << e.what();
  }
  // A VRT naming another file on disk: any driver reads that file; GeoJSON only refuses the body.
  const std::string target = geojson("elsewhere.geojson", line("\"transect_id\":\"A\"", "[500000,5000000],[500000,4999600]"),
                                     "urn:ogc:def:crs:EPSG::32631");
  const fs::path body = dir_ / "body.geojson";
  {
    std::ofstream out(body);
    out << "<OGRVRTDataSource><OGRVRTLayer name=\"elsewhere\"><SrcDataSource>" << target
        << "</SrcDataSource></OGRVRTLayer></OGRVRTDataSource>";
  }
  EXPECT_EQ(read_transects(body.string(), any).transects.size(), 1u);
  TransectReadOptions geojson_only = any;
  geojson_only.drivers = {"GeoJSON"};
  EXPECT_THROW(read_transects(body.string(), geojson_only), InputError);
}
