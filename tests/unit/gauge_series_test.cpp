// Water level at image time: linear interpolation, no extrapolation, no value
// across a gap longer than the limit.
#include <gtest/gtest.h>

#include "corrections/water_level/gauge_series.h"

using namespace strandline;

TEST(GaugeSeries, InterpolatesLinearly) {
  GaugeSeries g({0, 600, 1200}, {0.0, 1.0, 0.4}, 0.1);
  EXPECT_DOUBLE_EQ(g.at(300, 3600)->level_m, 0.5);
  EXPECT_DOUBLE_EQ(g.at(900, 3600)->level_m, 0.7);
  EXPECT_DOUBLE_EQ(g.at(600, 3600)->level_m, 1.0);    // on a sample
  EXPECT_DOUBLE_EQ(g.at(0, 3600)->level_m, 0.0);      // first sample
  EXPECT_DOUBLE_EQ(g.at(1200, 3600)->level_m, 0.4);   // last sample
  EXPECT_DOUBLE_EQ(g.at(300, 3600)->sigma_m, 0.1);
  EXPECT_FALSE(g.at(300, 3600)->predicted);
}

TEST(GaugeSeries, NeverExtrapolates) {
  GaugeSeries g({0, 600}, {0.0, 1.0}, 0.1);
  EXPECT_FALSE(g.at(-1, 3600).has_value());
  EXPECT_FALSE(g.at(601, 3600).has_value());
}

TEST(GaugeSeries, NoValueAcrossLongGap) {
  GaugeSeries g({0, 600, 600 + 4 * 3600.0}, {0.0, 1.0, 2.0}, 0.1);
  EXPECT_TRUE(g.at(300, 3 * 3600.0).has_value());
  EXPECT_FALSE(g.at(700, 3 * 3600.0).has_value());  // the bracketing samples are 4 h apart
  EXPECT_TRUE(g.at(700, 5 * 3600.0).has_value());
  EXPECT_TRUE(g.at(600 + 4 * 3600.0, 3 * 3600.0).has_value());  // exactly on a sample
}
