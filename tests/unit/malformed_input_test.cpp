// Every malformed input gets its own clear message naming file, line and field.
#include <gtest/gtest.h>

#include <sstream>

#include "server/app/steps/step_list.h"
#include "corrections/core/errors.h"
#include "corrections/engine/pipeline.h"
#include "server/io/observations_csv.h"
#include "server/io/transect_params_csv.h"
#include "server/io/water_level_csv.h"

using namespace strandline;

namespace {

ObservationReadOptions read_options(bool skip_invalid, const SensorTable* sensors, std::string hint = "") {
  ObservationReadOptions options;
  options.skip_invalid = skip_invalid;
  options.sensors = sensors;
  options.unknown_sensor_hint = std::move(hint);
  return options;
}

const char* kHeader = "transect_id,time,chainage_m,sensor,image_id,cloud_fraction,georef_rmse_m\n";
const char* kGoodRow = "T1,2019-03-04T10:00:00Z,120.5,landsat8,img1,0.1,4\n";

std::string observation_error(const std::string& text) {
  std::istringstream in(text);
  const SensorTable sensors = SensorTable::defaults();
  try {
    read_observations(in, "obs.csv", read_options(false, &sensors));
  } catch (const InputError& e) {
    return e.what();
  }
  return "(no error)";
}

std::string water_level_error(const std::string& text) {
  std::istringstream in(text);
  try {
    read_water_levels(in, "wl.csv", 0.1);
  } catch (const InputError& e) {
    return e.what();
  }
  return "(no error)";
}

std::string config_error(const std::string& json) {
  try {
    configured_pipeline(nlohmann::json::parse(json));
  } catch (const ConfigError& e) {
    return e.what();
  }
  return "(no error)";
}

}  // namespace

TEST(MalformedObservations, EmptyFile) {
  EXPECT_EQ(observation_error(""), "obs.csv: empty file: expected a header line");
}

TEST(MalformedObservations, MissingRequiredColumn) {
  EXPECT_EQ(observation_error("transect_id,time,sensor,image_id\nT1,2019-01-01T00:00Z,landsat8,a\n"),
            "obs.csv:1: missing required column \"chainage_m\" (header has: transect_id,time,sensor,image_id)");
}

TEST(MalformedObservations, DuplicateColumn) {
  EXPECT_EQ(observation_error("transect_id,time,time,chainage_m,sensor,image_id\n"),
            "obs.csv:1: duplicate column \"time\" in the header");
}

TEST(MalformedObservations, CorrectedOutputRefused) {
  EXPECT_NE(observation_error("transect_id,time,chainage_m,sensor,image_id,correction_m\n")
                .find("this looks like corrected output"),
            std::string::npos);
}

TEST(MalformedObservations, MonthOutOfRange) {
  EXPECT_EQ(observation_error(std::string(kHeader) + kGoodRow + "T1,2019-13-01T00:00Z,1,landsat8,img2,,\n"),
            "obs.csv:3: time \"2019-13-01T00:00Z\": month out of range");
}

TEST(MalformedObservations, TimeWithoutZone) {
  EXPECT_NE(observation_error(std::string(kHeader) + "T1,2019-03-01T10:00:00,1,landsat8,img2,,\n")
                .find("obs.csv:2: time \"2019-03-01T10:00:00\": missing zone designator"),
            std::string::npos);
}

TEST(MalformedObservations, ChainageNotANumber) {
  EXPECT_EQ(observation_error(std::string(kHeader) + "T1,2019-03-01T10:00Z,12o.5,landsat8,img2,,\n"),
            "obs.csv:2: chainage_m \"12o.5\": not a number");
}

TEST(MalformedObservations, ChainageNotFinite) {
  EXPECT_EQ(observation_error(std::string(kHeader) + "T1,2019-03-01T10:00Z,inf,landsat8,img2,,\n"),
            "obs.csv:2: chainage_m \"inf\": not a finite number");
}

TEST(MalformedObservations, EmptyTransectId) {
  EXPECT_EQ(observation_error(std::string(kHeader) + ",2019-03-01T10:00Z,1,landsat8,img2,,\n"),
            "obs.csv:2: transect_id \"\": empty transect id");
}

TEST(MalformedObservations, EmptyImageId) {
  EXPECT_EQ(observation_error(std::string(kHeader) + "T1,2019-03-01T10:00Z,1,landsat8, ,,\n"),
            "obs.csv:2: image_id \" \": empty image id");
}

TEST(MalformedObservations, CloudFractionAsPercentage) {
  EXPECT_EQ(observation_error(std::string(kHeader) + "T1,2019-03-01T10:00Z,1,landsat8,img2,35,\n"),
            "obs.csv:2: cloud_fraction \"35\": must lie between 0 and 1 (a fraction, not a percentage)");
}

TEST(MalformedObservations, NegativeGeorefRmse) {
  EXPECT_EQ(observation_error(std::string(kHeader) + "T1,2019-03-01T10:00Z,1,landsat8,img2,0.1,-2\n"),
            "obs.csv:2: georef_rmse_m \"-2\": must not be negative");
}

TEST(MalformedObservations, UnknownSensor) {
  EXPECT_NE(observation_error(std::string(kHeader) + "T1,2019-03-01T10:00Z,1,landsat42,img2,,\n")
                .find("obs.csv:2: sensor \"landsat42\": sensor not in the sensor table"),
            std::string::npos);
}

TEST(MalformedObservations, WrongFieldCount) {
  EXPECT_EQ(observation_error(std::string(kHeader) + kGoodRow + "T1,2019-03-01T10:00Z,1\n"),
            "obs.csv:3: expected 7 fields as in the header, found 3");
}

TEST(MalformedObservations, DuplicateTransectImage) {
  EXPECT_EQ(observation_error(std::string(kHeader) + kGoodRow + "T1,2019-03-04T10:00:00Z,125,landsat8,img1,0.1,4\n"),
            "obs.csv:3: image_id \"img1\": duplicate: transect T1 already has an observation from this image (line 2)");
}

TEST(MalformedObservations, ImageWithTwoTimes) {
  EXPECT_NE(observation_error(std::string(kHeader) + kGoodRow + "T2,2019-03-05T10:00:00Z,125,landsat8,img1,0.1,4\n")
                .find("obs.csv:3: time \"2019-03-05T10:00:00Z\": image img1 has time 2019-03-04T10:00:00Z on line 2 "
                      "(one image, one time and one sensor)"),
            std::string::npos);
}

TEST(MalformedObservations, UnterminatedQuote) {
  EXPECT_EQ(observation_error(std::string(kHeader) + "\"T1,2019-03-01T10:00Z,1,landsat8,img2,,\n"),
            "obs.csv:2: unterminated quoted field");
}

TEST(MalformedObservations, SkipInvalidCollectsEveryBadRow) {
  std::istringstream in(std::string(kHeader) + kGoodRow + "T1,2019-13-01T00:00Z,1,landsat8,img2,,\n" +
                        "T1,2019-03-05T10:00Z,x,landsat8,img3,,\nT1,2019-03-06T10:00Z,130,landsat8,img4,,\n");
  const SensorTable sensors = SensorTable::defaults();
  const auto f = read_observations(in, "obs.csv", read_options(true, &sensors));
  EXPECT_EQ(f.data_rows, 4u);
  EXPECT_EQ(f.table.size(), 2u);
  ASSERT_EQ(f.rejected.size(), 2u);
  EXPECT_EQ(f.rejected[0].problem.line, 3);
  EXPECT_EQ(f.rejected[0].problem.field, "time");
  EXPECT_EQ(f.rejected[1].problem.field, "chainage_m");
}

TEST(MalformedWaterLevels, RepeatedTime) {
  EXPECT_EQ(water_level_error("time,level_m\n2019-01-01T00:00Z,0.1\n2019-01-01T00:00Z,0.2\n"),
            "wl.csv:3: time \"2019-01-01T00:00Z\": repeats the time of line 2");
}

TEST(MalformedWaterLevels, DecreasingTime) {
  EXPECT_EQ(water_level_error("time,level_m\n2019-01-01T01:00Z,0.1\n2019-01-01T00:00Z,0.2\n"),
            "wl.csv:3: time \"2019-01-01T00:00Z\": earlier than line 2 (times must increase)");
}

TEST(MalformedWaterLevels, LevelNotANumber) {
  EXPECT_EQ(water_level_error("time,level_m\n2019-01-01T01:00Z,high\n"), "wl.csv:2: level_m \"high\": not a number");
}

TEST(MalformedWaterLevels, LevelInMillimetres) {
  // Units rule: the record spans more than 25 m, each value 50 m from the median.
  EXPECT_EQ(water_level_error("time,level_m\n2019-01-01T01:00Z,1200\n2019-01-01T02:00Z,1100\n"),
            "wl.csv:2: level_m \"1200\": 50 m from the record's median level (1150 m), more than the 25 m a gauge "
            "record in metres spans: give levels in metres (centimetres or millimetres?)");
}

TEST(MalformedWaterLevels, LevelsOnAnotherDatumPass) {
  // Far from 0 but a plausible tide around its median: the units rule looks at the spread.
  EXPECT_EQ(water_level_error("time,level_m\n2019-01-01T01:00Z,101.2\n2019-01-01T02:00Z,103.9\n"), "(no error)");
}

TEST(MalformedWaterLevels, SingleSample) {
  EXPECT_EQ(water_level_error("time,level_m\n2019-01-01T01:00Z,0.3\n"), "wl.csv: need at least two water-level samples");
}

TEST(MalformedSlopes, SlopeInDegrees) {
  std::istringstream in("transect_id,slope\nT1,8\n");
  try {
    read_transect_params(in, "slopes.csv", true);
    FAIL();
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()),
              "slopes.csv:2: slope \"8\": slope above 1 (tan(beta) > 45 degrees): give tan(beta), not degrees or percent");
  }
}

TEST(MalformedSlopes, TransectListedTwice) {
  std::istringstream in("transect_id,slope\nT1,0.05\nT1,0.06\n");
  try {
    read_transect_params(in, "slopes.csv", true);
    FAIL();
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()), "slopes.csv:3: transect_id \"T1\": listed twice (first on line 2)");
  }
}

TEST(MalformedConfig, UnknownTopLevelKey) {
  EXPECT_EQ(config_error(R"({"schema_version": 1, "stepz": {}})"), "/stepz: unknown key");
}

TEST(MalformedConfig, UnknownStep) {
  EXPECT_NE(config_error(R"({"steps": {"no_such_step": {}}})").find("/steps/no_such_step: unknown step"),
            std::string::npos);
}

TEST(MalformedConfig, UnknownStepParameter) {
  EXPECT_EQ(config_error(R"({"steps": {"water_level": {"max_gap_hours": 3}}})"),
            "/steps/water_level/max_gap_hours: unknown key");
}

TEST(MalformedConfig, WrongType) {
  EXPECT_EQ(config_error(R"({"steps": {"water_level": {"max_gap_s": "3h"}}})"),
            "/steps/water_level/max_gap_s: expected a number");
}

TEST(MalformedConfig, RequiredStepDisabled) {
  EXPECT_EQ(config_error(R"({"steps": {"correct": {"enabled": false}}})"),
            "/steps/correct/enabled: step \"correct\" is required and cannot be disabled");
}

TEST(MalformedConfig, UnsupportedSchema) {
  EXPECT_NE(config_error(R"({"schema_version": 7})").find("/schema_version: unsupported configuration schema 7"),
            std::string::npos);
}
