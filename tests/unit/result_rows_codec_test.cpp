// The stored form of typed result rows: every field round-trips exactly
// (unknown stays unknown, text keeps commas, quotes, line breaks and UTF-8).
#include <gtest/gtest.h>

#include <cmath>

#include "server/store/result_rows_codec.h"
#include "server/store/store_error.h"

namespace strandline::store {
namespace {

CleanedRow sample_row() {
  CleanedRow r;
  r.transect_id = "T 1";
  r.time_s = 1.6e9 + 0.5;
  r.sensor = "landsat8";
  r.image_id = "IMG,7 \"q\"\nnext é";
  r.chainage_raw_m = 101.25;
  r.water_level_m = -0.75;
  r.slope = 0.0625;
  r.chainage_m = 95.125;
  r.sigma_m = 12.5;
  r.georef_rmse_m = 3.0;
  r.flags = flag_bit(Flag::spike) | flag_bit(Flag::tide_predicted);
  r.accepted = false;
  return r;
}

TEST(ResultRowsCodec, EveryFieldRoundTrips) {
  const std::vector<CleanedRow> rows = {sample_row(), CleanedRow{}};
  const auto back = decode_result_rows(encode_result_rows(rows));
  ASSERT_EQ(back.size(), 2u);
  const CleanedRow& a = back[0];
  EXPECT_EQ(a.transect_id, "T 1");
  EXPECT_EQ(a.image_id, "IMG,7 \"q\"\nnext é");
  EXPECT_EQ(a.sensor, "landsat8");
  EXPECT_EQ(a.time_s, 1.6e9 + 0.5);
  EXPECT_EQ(a.chainage_raw_m, 101.25);
  EXPECT_EQ(a.water_level_m, -0.75);
  EXPECT_EQ(a.slope, 0.0625);
  EXPECT_EQ(a.chainage_m, 95.125);
  EXPECT_EQ(a.sigma_m, 12.5);
  EXPECT_EQ(a.georef_rmse_m, 3.0);
  EXPECT_TRUE(std::isnan(a.setup_m));
  EXPECT_TRUE(std::isnan(a.cloud_fraction));
  EXPECT_EQ(a.flags, sample_row().flags);
  EXPECT_FALSE(a.accepted);
  EXPECT_TRUE(back[1].transect_id.empty());
  EXPECT_EQ(back[1].flags, FlagSet{0});
}

TEST(ResultRowsCodec, SensorOffsetColumnsRoundTripAndOldRecordsStillRead) {
  CleanedRow r = sample_row();
  r.sensor_offset_m = 15.25;
  r.sigma_sensor_offset_m = 0.5;
  const auto back = decode_result_rows(encode_result_rows({r}));
  EXPECT_EQ(back[0].sensor_offset_m, 15.25);
  EXPECT_EQ(back[0].sigma_sensor_offset_m, 0.5);
  EXPECT_EQ(back[0].georef_rmse_m, 3.0);

  // A record of the format before those columns ("SLR1": 16 reals), written by hand.
  std::string v1 = "SLR1";
  const auto put = [&v1](const auto& value) { v1.append(reinterpret_cast<const char*>(&value), sizeof value); };
  const auto text = [&](const std::string& t) {
    put(static_cast<std::uint32_t>(t.size()));
    v1 += t;
  };
  put(std::uint32_t{1});
  text("T");
  put(1.6e9);
  text("landsat8");
  text("I");
  for (int k = 1; k <= 16; ++k) put(double(k));
  text("spike");
  put(std::uint8_t{0});
  const auto old = decode_result_rows(v1);
  ASSERT_EQ(old.size(), 1u);
  EXPECT_EQ(old[0].chainage_raw_m, 1.0);
  EXPECT_EQ(old[0].georef_rmse_m, 16.0);
  EXPECT_TRUE(std::isnan(old[0].sensor_offset_m));
  EXPECT_TRUE(std::isnan(old[0].sigma_sensor_offset_m));
  EXPECT_EQ(old[0].flags, flag_bit(Flag::spike));
}

TEST(ResultRowsCodec, DamagedRecordsAreRefused) {
  const std::string bytes = encode_result_rows({sample_row()});
  EXPECT_THROW(decode_result_rows(bytes.substr(0, bytes.size() - 1)), StoreError);
  EXPECT_THROW(decode_result_rows(bytes + "x"), StoreError);
  EXPECT_THROW(decode_result_rows("XXXX" + bytes.substr(4)), StoreError);
}

}  // namespace
}  // namespace strandline::store
