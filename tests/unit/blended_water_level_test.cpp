// Gauge where it covers the time, harmonic prediction elsewhere, each value
// marked with its origin.
#include <gtest/gtest.h>

#include <cmath>

#include "corrections/tide/harmonic_tide_source.h"
#include "corrections/water_level/blended_water_level_source.h"

namespace strandline {
namespace {

tide::ConstituentSet m2_only(double residual_std_m) {
  tide::ConstituentSet s;
  s.constituents.push_back({"M2", 1.0, 0.0, kUnknown, kUnknown, std::nullopt});
  s.residual_std_m = residual_std_m;
  return s;
}

TEST(BlendedWaterLevel, GaugeInsideItsRecordPredictionOutside) {
  const tide::HarmonicTideSource prediction(m2_only(0.08), "site_tide.json");
  // Gauge = prediction + 0.3 m at hourly samples over one day, with one 6-hour gap.
  std::vector<TimeS> t;
  std::vector<double> h;
  const double t0 = 1.6e9;
  for (int k = 0; k <= 24; ++k) {
    if (k > 8 && k < 14) continue;
    t.push_back(t0 + 3600.0 * k);
    h.push_back(prediction.predictor().level_m(t.back()) + 0.3);
  }
  const GaugeSeries gauge(t, h, 0.02);
  const BlendedWaterLevelSource blended(gauge, prediction);
  EXPECT_NEAR(blended.mean_gauge_minus_prediction_m(), 0.3, 1e-12);

  const auto inside = blended.at(t0 + 3600.0 * 2, 7200.0);
  ASSERT_TRUE(inside);
  EXPECT_FALSE(inside->predicted);
  EXPECT_DOUBLE_EQ(inside->sigma_m, 0.02);
  EXPECT_NEAR(inside->level_m, h[2], 1e-12);

  const TimeS in_gap = t0 + 3600.0 * 11;
  const auto gap = blended.at(in_gap, 7200.0);
  ASSERT_TRUE(gap);
  EXPECT_TRUE(gap->predicted);
  EXPECT_DOUBLE_EQ(gap->sigma_m, 0.08);
  EXPECT_NEAR(gap->level_m, prediction.predictor().level_m(in_gap), 1e-12);

  const auto after = blended.at(t0 + 5 * kSecondsPerDay, 7200.0);
  ASSERT_TRUE(after);
  EXPECT_TRUE(after->predicted);
  EXPECT_EQ(blended.describe()["kind"], "gauge_then_prediction");
}

TEST(BlendedWaterLevel, PredictionSigmaUnknownWithoutFitResidual) {
  const tide::HarmonicTideSource prediction(m2_only(kUnknown), "site_tide.json");
  const auto v = prediction.at(1.6e9, 0.0);
  ASSERT_TRUE(v);
  EXPECT_TRUE(v->predicted);
  EXPECT_FALSE(known(v->sigma_m));
  EXPECT_TRUE(prediction.describe()["sigma_m"].is_null());
}

}  // namespace
}  // namespace strandline
