// waves.csv reader and the WaveRecord source: parsing, errors naming
// file/line/field, interpolation (direction on the circle) and the gap limit.
#include <sstream>

#include <gtest/gtest.h>

#include "corrections/core/errors.h"
#include "server/io/wave_csv.h"

namespace strandline {
namespace {

WaveRecord parse(const std::string& text) {
  std::istringstream in(text);
  return read_wave_csv(in, "waves.csv");
}

std::string error_of(const std::string& text) {
  try {
    parse(text);
  } catch (const InputError& e) {
    return e.what();
  }
  return "(no error)";
}

TEST(WaveCsv, ReadsDeepWaterRecord) {
  const WaveRecord r = parse(
      "time,hs_m,tp_s,dir_deg\n"
      "2021-01-01T00:00:00Z,1.5,10,270\n"
      "2021-01-01T01:00:00Z,2.5,12,\n");
  ASSERT_EQ(r.samples().size(), 2u);
  EXPECT_DOUBLE_EQ(r.samples()[0].hs_m, 1.5);
  EXPECT_DOUBLE_EQ(r.samples()[1].tp_s, 12.0);
  EXPECT_FALSE(known(r.samples()[1].dir_deg));
  EXPECT_FALSE(known(r.samples()[0].depth_m));
  EXPECT_EQ(r.describe()["record_depth"], "deep water");
}

TEST(WaveCsv, DirectionColumnIsOptional) {
  const WaveRecord r = parse("time,hs_m,tp_s\n2021-01-01T00:00:00Z,1.5,10\n");
  ASSERT_EQ(r.samples().size(), 1u);
  EXPECT_FALSE(known(r.samples()[0].dir_deg));
}

TEST(WaveCsv, ReadsNearshoreRecordWithDepth) {
  const WaveRecord r = parse(
      "time,hs_m,tp_s,dir_deg,depth_m\n"
      "2021-01-01T00:00:00Z,1.5,10,270,18.5\n");
  EXPECT_DOUBLE_EQ(r.samples()[0].depth_m, 18.5);
}

TEST(WaveCsv, ErrorsNameFileLineAndField) {
  EXPECT_EQ(error_of("time,hs_m,tp_s,dir_deg\n2021-01-01T00:00:00Z,abc,10,270\n"),
            "waves.csv:2: hs_m \"abc\": not a number");
  EXPECT_EQ(error_of("time,hs_m,tp_s,dir_deg\n2021-01-01T00:00:00Z,1,10,270\n2021-01-01T00:00:00Z,1,10,270\n"),
            "waves.csv:3: time \"2021-01-01T00:00:00Z\": not after the previous row (line 2): times must be "
            "strictly increasing");
  EXPECT_NE(error_of("time,hs_m,tp_s,dir_deg\n2021-01-01T00:00:00,1,10,270\n").find("waves.csv:2: time"),
            std::string::npos);
  EXPECT_EQ(error_of("time,hs_m,tp_s,dir_deg\n2021-01-01T00:00:00Z,1,0.5,270\n"),
            "waves.csv:2: tp_s \"0.5\": outside [1, 40] s");
  EXPECT_EQ(error_of("time,hs_m,tp_s,dir_deg\n2021-01-01T00:00:00Z,1,10,400\n"),
            "waves.csv:2: dir_deg \"400\": outside [0, 360] degrees");
  // One record is taken at one place: a depth on every row or on none.
  EXPECT_EQ(error_of("time,hs_m,tp_s,dir_deg,depth_m\n2021-01-01T00:00:00Z,1,10,270,12\n"
                     "2021-01-01T01:00:00Z,1,10,270,\n"),
            "waves.csv:3: depth_m \"\": empty, but line 2 has a depth: one wave record has a depth on every row "
            "(nearshore) or on none (deep water)");
  EXPECT_EQ(error_of("time,hs_m,tp_s,dir_deg,depth_m\n2021-01-01T00:00:00Z,1,10,270,0\n"),
            "waves.csv:2: depth_m \"0\": must be positive (the depth of the record; empty for deep water)");
  EXPECT_NE(error_of("time,hs_m,dir_deg\n2021-01-01T00:00:00Z,1,10\n").find("missing required column \"tp_s\""),
            std::string::npos);
  // Units: a height in centimetres or a period in tenths of a second says so.
  EXPECT_NE(error_of("time,hs_m,tp_s\n2021-01-01T00:00:00Z,145,10\n").find("hs_m \"145\": outside [0, 30] m: give"),
            std::string::npos);
  EXPECT_NE(error_of("time,hs_m,tp_s\n2021-01-01T00:00:00Z,1.4,95\n").find("tp_s \"95\": outside [1, 40] s: give"),
            std::string::npos);
  EXPECT_NE(error_of("time,hs_m,tp_s,dir_deg,hm0\n2021-01-01T00:00:00Z,1,10,270,1\n").find("unknown column \"hm0\""),
            std::string::npos);
  EXPECT_EQ(error_of("time,hs_m,tp_s,dir_deg\n"), "waves.csv: no wave rows after the header");
  EXPECT_EQ(error_of("time,hs_m,tp_s,dir_deg\n2021-01-01T00:00:00Z,1,10\n"),
            "waves.csv:2: expected 4 fields as in the header, found 3");
}

TEST(WaveRecord, InterpolatesLinearlyAndDirectionOnTheCircle) {
  const WaveRecord r = parse(
      "time,hs_m,tp_s,dir_deg\n"
      "2021-01-01T00:00:00Z,1.0,10,350\n"
      "2021-01-01T02:00:00Z,3.0,14,10\n");
  const TimeS t0 = parse_time_utc("2021-01-01T00:00:00Z");
  auto mid = r.at(t0 + 3600, 3 * 3600);
  ASSERT_TRUE(mid);
  EXPECT_DOUBLE_EQ(mid->hs_m, 2.0);
  EXPECT_DOUBLE_EQ(mid->tp_s, 12.0);
  EXPECT_NEAR(mid->dir_deg, 0.0, 1e-12);
  auto quarter = r.at(t0 + 1800, 3 * 3600);
  EXPECT_NEAR(quarter->dir_deg, 355.0, 1e-12);
  EXPECT_DOUBLE_EQ(r.at(t0, 1.0)->hs_m, 1.0);  // exact sample: no gap question
  EXPECT_DOUBLE_EQ(r.at(t0 + 7200, 1.0)->hs_m, 3.0);
  EXPECT_FALSE(r.at(t0 + 3600, 3599.0));  // samples 2 h apart, limit 1 h
  EXPECT_FALSE(r.at(t0 - 1, 1e9));        // never extrapolated
  EXPECT_FALSE(r.at(t0 + 7201, 1e9));
}

TEST(WaveRecord, DirectionInterpolationAcrossNorthBothWays) {
  EXPECT_NEAR(interpolate_direction_deg(10, 350, 0.25), 5.0, 1e-12);
  EXPECT_NEAR(interpolate_direction_deg(350, 10, 0.75), 5.0, 1e-12);
  EXPECT_NEAR(interpolate_direction_deg(90, 270 - 1e-9, 0.5), 180.0, 1e-6);
  EXPECT_FALSE(known(interpolate_direction_deg(kUnknown, 10, 0.5)));
}

}  // namespace
}  // namespace strandline
