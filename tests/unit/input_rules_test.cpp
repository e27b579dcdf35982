// One rule set per input kind: the same malformed content through the batch
// reader (server/io) and through the upload path (server/app) must be refused
// with the same field and reason. Also the defects the shared rules closed.
#include <gtest/gtest.h>

#include <filesystem>
#include <sstream>
#include <unistd.h>

#include "corrections/core/errors.h"
#include "server/app/upload_rows.h"
#include "server/app/uploads.h"
#include "server/geo/baseline_transects.h"
#include "server/geo/shoreline_intersect.h"
#include "server/io/observations_csv.h"
#include "server/io/transect_params_csv.h"
#include "server/io/water_level_csv.h"
#include "server/io/wave_csv.h"
#include "server/store/store.h"

using namespace strandline;

namespace {

ObservationReadOptions read_options(bool skip_invalid, const SensorTable* sensors, std::string hint = "") {
  ObservationReadOptions options;
  options.skip_invalid = skip_invalid;
  options.sensors = sensors;
  options.unknown_sensor_hint = std::move(hint);
  return options;
}

const char* kObsHeader = "transect_id,time,chainage_m,sensor,image_id,cloud_fraction,georef_rmse_m\n";
const std::set<std::string> kTransects = {"T1", "T2"};

struct Refusal {
  std::int64_t line = 0;
  std::string field, reason;
};

bool operator==(const Refusal& a, const Refusal& b) {
  return a.line == b.line && a.field == b.field && a.reason == b.reason;
}

std::ostream& operator<<(std::ostream& out, const Refusal& r) {
  return out << "line " << r.line << " field " << r.field << ": " << r.reason;
}

Refusal of(const InputError& e) { return {e.line, e.field, e.reason}; }
Refusal of(const store::RowIssue& i) { return {i.line, i.field, i.reason}; }

const SensorTable& sensors() {
  static const SensorTable table = SensorTable::defaults();
  return table;
}

Refusal batch_observations(const std::string& text) {
  std::istringstream in(text);
  try {
    read_observations(in, "obs.csv", read_options(false, &sensors()));
  } catch (const InputError& e) {
    return of(e);
  }
  return {0, "", "(accepted)"};
}

template <class Parsed>
Refusal first_issue(const Parsed& parsed) {
  if (parsed.invalid.empty()) return {0, "", parsed.record_problem.value_or("(accepted)")};
  return of(parsed.invalid.front());
}

Refusal upload_observations(const std::string& text) {
  return first_issue(app::parse_observation_upload(text, BodyFormat::csv, kTransects, sensors()));
}

Refusal batch_water_levels(const std::string& text) {
  std::istringstream in(text);
  try {
    read_water_levels(in, "wl.csv", 0.1);
  } catch (const InputError& e) {
    return of(e);
  }
  return {0, "", "(accepted)"};
}

Refusal upload_water_levels(const std::string& text) {
  return first_issue(app::parse_water_level_upload(text, BodyFormat::csv));
}

Refusal batch_waves(const std::string& text) {
  std::istringstream in(text);
  try {
    read_wave_csv(in, "waves.csv");
  } catch (const InputError& e) {
    return of(e);
  }
  return {0, "", "(accepted)"};
}

Refusal upload_waves(const std::string& text) { return first_issue(app::parse_wave_upload(text, BodyFormat::csv)); }

// The same content refused alike by both faces, and refused at all.
void expect_same(const Refusal& batch, const Refusal& upload) {
  EXPECT_EQ(batch, upload);
  EXPECT_NE(batch.reason, "(accepted)");
}

}  // namespace

TEST(InputRules, ObservationRowRulesAreShared) {
  const std::string good = std::string(kObsHeader) + "T1,2019-03-04T10:00:00Z,120.5,landsat8,img1,0.1,4\n";
  for (const std::string bad : {"T1,2019-03-05T10:00:00Z,1,landsat8,img2,35,\n",    // a percentage
                                "T1,2019-03-05T10:00:00,1,landsat8,img2,,\n",       // no zone
                                "T1,2019-03-05T10:00:00Z,far,landsat8,img2,,\n",    // not a number
                                "T1,2019-03-05T10:00:00Z,1,landsat42,img2,,\n"}) {  // unknown sensor
    SCOPED_TRACE(bad);
    expect_same(batch_observations(good + bad), upload_observations(good + bad));
  }
}

TEST(InputRules, OneImageOneTimeAndOneSensorInBothFaces) {
  const std::string head = std::string(kObsHeader) + "T1,2019-03-04T10:00:00Z,120.5,landsat8,img1,0.1,4\n";
  const std::string other_time = head + "T2,2019-03-05T10:00:00Z,125,landsat8,img1,0.1,4\n";
  const std::string other_sensor = head + "T2,2019-03-04T10:00:00Z,125,landsat9,img1,0.1,4\n";
  const std::string duplicate = head + "T1,2019-03-04T10:00:00Z,125,landsat8,img1,0.1,4\n";
  expect_same(batch_observations(other_time), upload_observations(other_time));
  expect_same(batch_observations(other_sensor), upload_observations(other_sensor));
  expect_same(batch_observations(duplicate), upload_observations(duplicate));
  // The upload refused these before the shared rules: pin the field and the line named.
  EXPECT_EQ(upload_observations(other_time).field, "time");
  EXPECT_EQ(upload_observations(other_sensor).field, "sensor");
  EXPECT_NE(upload_observations(other_sensor).reason.find("line 2"), std::string::npos);
}

TEST(InputRules, JsonUploadNamesTheEarlierRowByPointer) {
  const std::string body =
      R"([{"transect_id":"T1","time":"2019-03-04T10:00:00Z","chainage_m":1,"sensor":"landsat8","image_id":"i"},
          {"transect_id":"T2","time":"2019-03-05T10:00:00Z","chainage_m":1,"sensor":"landsat8","image_id":"i"}])";
  const auto parsed = app::parse_observation_upload(body, BodyFormat::json, kTransects, sensors());
  ASSERT_EQ(parsed.invalid.size(), 1u);
  EXPECT_EQ(parsed.invalid[0].line, 2);
  EXPECT_NE(parsed.invalid[0].reason.find("/observations/0"), std::string::npos) << parsed.invalid[0].reason;
}

TEST(InputRules, MisspeltColumnRefusedByBothFacesNamingTheIntendedOne) {
  const std::string text = "transect_id,time,chainage_m,sensor,image_id,cloud_fration\n"
                           "T1,2019-03-04T10:00:00Z,120.5,landsat8,img1,0.95\n";
  std::string batch, upload;
  try {
    std::istringstream in(text);
    read_observations(in, "obs.csv", read_options(false, &sensors()));
  } catch (const ColumnError& e) {
    EXPECT_EQ(e.column, "cloud_fration");
    batch = e.reason;
  }
  try {
    app::parse_observation_upload(text, BodyFormat::csv, kTransects, sensors());
  } catch (const ColumnError& e) {
    EXPECT_EQ(e.column, "cloud_fration");
    upload = e.reason;
  }
  EXPECT_NE(batch.find("\"cloud_fration\" looks like \"cloud_fraction\" misspelt"), std::string::npos) << batch;
  EXPECT_EQ(batch, upload);
  // Case and separators count as misspellings too; a JSON member as well.
  EXPECT_TRUE(misspelt_column_of("Cloud-Fraction", observation_input_columns(), {}));
  const auto json = app::parse_observation_upload(
      R"([{"transect_id":"T1","time":"2019-03-04T10:00:00Z","chainage_m":1,"sensor":"landsat8","image_id":"i","georef_rmse":3}])",
      BodyFormat::json, kTransects, sensors());
  ASSERT_EQ(json.invalid.size(), 1u);
  EXPECT_EQ(json.invalid[0].field, "georef_rmse");
}

TEST(InputRules, GenuineExtraColumnsAreCarriedByTheBatchAndIgnoredByTheService) {
  const std::string text = "transect_id,time,chainage_m,sensor,image_id,crossings,tide\n"
                           "T1,2019-03-04T10:00:00Z,120.5,landsat8,img1,2,0.4\n";
  std::istringstream in(text);
  const auto file = read_observations(in, "obs.csv", read_options(false, &sensors()));
  ASSERT_EQ(file.columns.extra.size(), 2u);
  const auto parsed = app::parse_observation_upload(text, BodyFormat::csv, kTransects, sensors());
  EXPECT_TRUE(parsed.invalid.empty());
  EXPECT_EQ(parsed.rows.size(), 1u);
  EXPECT_EQ(parsed.ignored_columns, (std::vector<std::string>{"crossings", "tide"}));
}

TEST(InputRules, WaterLevelUnitsRuleInBothFaces) {
  for (const std::string wild : {"500", "1e6"}) {
    SCOPED_TRACE(wild);
    const std::string text = "time,level_m\n2019-01-01T00:00Z,0.4\n2019-01-01T01:00Z," + wild +
                             "\n2019-01-01T02:00Z,0.6\n2019-01-01T03:00Z,0.5\n";
    const Refusal upload = upload_water_levels(text);
    expect_same(batch_water_levels(text), upload);
    EXPECT_EQ(upload.line, 3);
    EXPECT_EQ(upload.field, "level_m");
    EXPECT_NE(upload.reason.find("centimetres"), std::string::npos);
  }
  // A spread over 25 m with no single value far from the median: the whole record.
  const std::string spread = "time,level_m\n2019-01-01T00:00Z,-13\n2019-01-01T01:00Z,13\n2019-01-01T02:00Z,0\n";
  expect_same(batch_water_levels(spread), upload_water_levels(spread));
  EXPECT_NE(upload_water_levels(spread).reason.find("span 26 m"), std::string::npos);
}

TEST(InputRules, WaterLevelOrderAndCountRulesInBothFaces) {
  const std::string repeat = "time,level_m\n2019-01-01T00:00Z,0.1\n2019-01-01T00:00Z,0.2\n";
  const std::string single = "time,level_m\n2019-01-01T00:00Z,0.1\n";
  expect_same(batch_water_levels(repeat), upload_water_levels(repeat));
  expect_same(batch_water_levels(single), upload_water_levels(single));
}

TEST(InputRules, WavesSameColumnsAndRangesInBothFaces) {
  const std::string no_direction = "time,hs_m,tp_s\n2021-01-01T00:00:00Z,1.5,10\n";
  EXPECT_EQ(batch_waves(no_direction).reason, "(accepted)");
  EXPECT_EQ(upload_waves(no_direction).reason, "(accepted)");
  for (const std::string bad : {"time,hs_m,tp_s\n2021-01-01T00:00:00Z,45,10\n",
                                "time,hs_m,tp_s\n2021-01-01T00:00:00Z,1.5,95\n",
                                "time,hs_m,tp_s,dir_deg\n2021-01-01T00:00:00Z,1.5,10,400\n",
                                "time,hs_m,tp_s\n2021-01-01T01:00:00Z,1,10\n2021-01-01T00:00:00Z,1,10\n",
                                "time,hs_m,tp_s,depth_m\n2021-01-01T00:00:00Z,1,10,\n2021-01-01T01:00:00Z,1,10,8\n"}) {
    SCOPED_TRACE(bad);
    expect_same(batch_waves(bad), upload_waves(bad));
  }
  EXPECT_NE(upload_waves("time,hs_m,tp_s\n2021-01-01T00:00:00Z,45,10\n").reason.find("centimetres"), std::string::npos);
}

TEST(InputRules, SlopeRulesInBothFaces) {
  for (const std::string bad : {"transect_id,slope\nT1,8\n", "transect_id,slope\nT1,0.05\nT1,0.06\n",
                                "transect_id,slope,slope_sigma\nT1,0.05,-1\n"}) {
    SCOPED_TRACE(bad);
    Refusal batch{0, "", "(accepted)"};
    std::istringstream in(bad);
    try {
      read_transect_params(in, "slopes.csv", true);
    } catch (const InputError& e) {
      batch = of(e);
    }
    expect_same(batch, first_issue(app::parse_slope_upload(bad, BodyFormat::csv, kTransects)));
  }
}

TEST(InputRules, MessagesNameNoCliOption) {
  const Refusal r = upload_observations(std::string(kObsHeader) + "T1,2019-03-05T10:00:00Z,1,landsat42,img2,,\n");
  EXPECT_EQ(r.field, "sensor");
  EXPECT_EQ(r.reason.find("--"), std::string::npos) << r.reason;
  // The CLI face may add its own hint.
  std::istringstream in(std::string(kObsHeader) + "T1,2019-03-05T10:00:00Z,1,landsat42,img2,,\n");
  try {
    read_observations(in, "obs.csv", read_options(false, &sensors(), "add it with --sensor-table FILE"));
    FAIL();
  } catch (const InputError& e) {
    EXPECT_NE(e.reason.find("(add it with --sensor-table FILE)"), std::string::npos) << e.reason;
  }
  // The geo library refuses bad arguments as input errors (exit 2 / 4xx), not CLI usage errors.
  EXPECT_THROW(geo::crossing_rule_from_name("nearest"), InputError);
  try {
    geo::sea_side_from_name("up");
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()).find("--"), std::string::npos) << e.what();
  }
}

namespace {

class StoredImageTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = std::filesystem::temp_directory_path() / ("strandline-rules-" + std::to_string(getpid()));
    std::filesystem::remove_all(dir_);
    std::filesystem::create_directories(dir_);
    store_ = store::open_sqlite_store((dir_ / "test.db").string());
    store::Site site;
    site.id = "s1";
    site.name = "Invented Cove";
    site.crs = "EPSG:32631";
    store_->create_site(site);
    store_->replace_transects("s1", {{"T1", {0, 0, 90, 300}, {}}, {"T2", {0, 100, 90, 300}, {}}});
  }
  void TearDown() override {
    store_.reset();
    std::filesystem::remove_all(dir_);
  }
  store::UploadResult upload(const std::string& body, app::OnInvalid mode = app::OnInvalid::reject) {
    app::UploadRequest request;
    request.body = body;
    request.on_invalid = mode;
    request.meta.content_type = "text/csv";
    request.meta.sha256 = "x";
    request.meta.uploaded_by = "tester";
    return app::upload_observations(*store_, "s1", request, sensors()).result;
  }
  std::filesystem::path dir_;
  std::unique_ptr<store::Store> store_;
};

}  // namespace

TEST_F(StoredImageTest, UploadRowContradictingAStoredImageIsRefused) {
  const std::string header = "transect_id,time,chainage_m,sensor,image_id\n";
  ASSERT_EQ(upload(header + "T1,2020-01-01T10:00:00Z,100,landsat8,IMG1\n").inserted, 1);
  // Another transect, the same image at another time or with another sensor.
  for (const std::string row : {"T2,2020-01-02T10:00:00Z,100,landsat8,IMG1\n",
                                "T2,2020-01-01T10:00:00Z,100,landsat9,IMG1\n"}) {
    SCOPED_TRACE(row);
    try {
      upload(header + "T2,2020-01-05T10:00:00Z,90,landsat8,IMG2\n" + row);
      FAIL() << "accepted";
    } catch (const app::InvalidRows& e) {
      ASSERT_EQ(e.rows.size(), 1u);
      EXPECT_EQ(e.rows[0].line, 3);
      EXPECT_NE(e.rows[0].reason.find("is stored for this site"), std::string::npos) << e.rows[0].reason;
    }
  }
  // Consistent with the stored image: stored; skipping keeps the valid rows.
  EXPECT_EQ(upload(header + "T2,2020-01-01T10:00:00Z,100,landsat8,IMG1\n").inserted, 1);
  const auto r = upload(header + "T1,2020-01-05T10:00:00Z,90,landsat8,IMG3\nT2,2020-02-01T10:00:00Z,1,landsat8,IMG1\n",
                        app::OnInvalid::skip);
  EXPECT_EQ(r.inserted, 1);
  ASSERT_EQ(r.rejected.size(), 1u);
  EXPECT_EQ(r.rejected[0].field, "time");
}
