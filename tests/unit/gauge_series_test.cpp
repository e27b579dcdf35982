// Water level at image time: linear interpolation, no extrapolation, no value
// across a gap longer than the limit.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

#include "corrections/steps/water_level_step.h"
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

TEST(GaugeSeries, AGapExactlyAtTheLimitIsInterpolated) {
  GaugeSeries at_limit({0, 3 * 3600.0}, {0.0, 1.0}, 0.1);
  ASSERT_TRUE(at_limit.at(5400, 3 * 3600.0).has_value());
  EXPECT_DOUBLE_EQ(at_limit.at(5400, 3 * 3600.0)->level_m, 0.5);
  GaugeSeries over({0, 3 * 3600.0 + 1}, {0.0, 1.0}, 0.1);
  EXPECT_FALSE(over.at(5400, 3 * 3600.0).has_value());
}

TEST(GaugeSeries, InterpolationErrorIsTheLinearRemainder) {
  // y = c t^2 sampled every h: the linear interpolant's error at t0 + f h is
  // exactly c h^2 f (1 - f) (Lagrange remainder, y'' = 2c constant), and the
  // divided second difference recovers y'' = 2c. Source: any numerical analysis
  // text (e.g. Burden & Faires, linear interpolation error term).
  const double c = 2e-8, h = 1800;
  std::vector<double> t, y;
  for (int k = 0; k < 6; ++k) {
    t.push_back(k * h);
    y.push_back(c * k * h * k * h);
  }
  GaugeSeries g(t, y, 0.1, GaugeOptions{.guide_interval_s = 0});
  for (double f : {0.25, 0.5, 0.9}) {
    const double at = 2 * h + f * h;
    const auto wl = g.at(at, 3600);
    ASSERT_TRUE(wl.has_value());
    const double true_error = std::abs(wl->level_m - c * at * at);
    EXPECT_NEAR(true_error, c * h * h * f * (1 - f), 1e-12);
    EXPECT_NEAR(wl->interpolation_sigma_m, true_error, 1e-12);
    EXPECT_DOUBLE_EQ(wl->sigma_m, 0.1);
    EXPECT_DOUBLE_EQ(wl->sample_interval_s, h);
  }
  EXPECT_DOUBLE_EQ(g.at(2 * h, 3600)->interpolation_sigma_m, 0.0);  // on a sample
  // Two samples alone: no curvature to go by, the error stays unknown.
  GaugeSeries pair({0, h}, {0.0, 1.0}, 0.1);
  EXPECT_TRUE(std::isnan(pair.at(h / 2, 3600)->interpolation_sigma_m));
}

namespace {

// A tide of four constituents as plain cosines (speeds in degrees per hour,
// Schureman 1958, recalled from memory); amplitudes metres, phases degrees.
double four_constituent_tide(double t_s) {
  constexpr double kDegPerRad = 57.29577951308232;
  const double hours = t_s / 3600.0;
  return 1.2 * std::cos((28.9841042 * hours + 40.0) / kDegPerRad) +
         0.4 * std::cos((30.0 * hours + 75.0) / kDegPerRad) +
         0.3 * std::cos((15.0410686 * hours + 200.0) / kDegPerRad) +
         0.25 * std::cos((13.9430356 * hours + 180.0) / kDegPerRad);
}

// Least-squares slope of `fitted` on `truth` (both centred).
double regression_slope(const std::vector<double>& truth, const std::vector<double>& fitted) {
  double mt = 0, mf = 0;
  for (std::size_t i = 0; i < truth.size(); ++i) mt += truth[i], mf += fitted[i];
  mt /= double(truth.size()), mf /= double(truth.size());
  double stf = 0, stt = 0;
  for (std::size_t i = 0; i < truth.size(); ++i) {
    stf += (truth[i] - mt) * (fitted[i] - mf);
    stt += (truth[i] - mt) * (truth[i] - mt);
  }
  return stf / stt;
}

}  // namespace

TEST(GaugeSeries, ACoarseRecordIsInterpolatedAlongItsOwnHarmonicFit) {
  const double start = 1.5e9, step = 3 * 3600.0;
  std::vector<double> t, y;
  for (double s = start; s <= start + 200 * 86400.0; s += step) {
    t.push_back(s);
    y.push_back(four_constituent_tide(s));
  }
  GaugeSeries guided(t, y, 0.1);
  GaugeSeries plain(t, y, 0.1, GaugeOptions{.guide_interval_s = 0});
  ASSERT_TRUE(guided.guided()) << guided.describe().dump();
  EXPECT_FALSE(plain.guided());
  EXPECT_DOUBLE_EQ(guided.median_interval_s(), step);
  std::vector<double> truth, g, p;
  double worst_guided = 0;
  for (double s = start + 5 * 86400.0 + 1234.0; s < start + 195 * 86400.0; s += 7001.0) {
    truth.push_back(four_constituent_tide(s));
    g.push_back(guided.at(s, 3 * 3600.0)->level_m);
    p.push_back(plain.at(s, 3 * 3600.0)->level_m);
    worst_guided = std::max(worst_guided, std::abs(g.back() - truth.back()));
  }
  // Linear interpolation of a semidiurnal tide sampled every 3 h damps it
  // (regression ~0.96); along the fitted tide the levels are the truth's.
  EXPECT_LT(regression_slope(truth, p), 0.975);
  EXPECT_NEAR(regression_slope(truth, g), 1.0, 0.002);
  EXPECT_LT(worst_guided, 0.01);
  // An hourly record is interpolated as it is.
  std::vector<double> th, yh;
  for (double s = start; s <= start + 30 * 86400.0; s += 3600.0) {
    th.push_back(s);
    yh.push_back(four_constituent_tide(s));
  }
  EXPECT_FALSE(GaugeSeries(th, yh, 0.1).guided());
}

TEST(WaterLevelStep, LevelSigmaAddsTheInterpolationErrorAndCoarseSamplesAreFlagged) {
  // y = c t^2: hourly samples, then two-hourly. The level's sigma is the gauge's
  // 0.1 m and the interpolation error c (t - t0)(t1 - t) in quadrature; the image
  // between samples 2 h apart is flagged coarse_gauge, the one between samples
  // exactly 1 h apart is not (the limit is "more than").
  const double c = 1e-8;
  std::vector<double> t = {0, 3600, 7200, 10800, 18000, 25200}, y;
  for (double s : t) y.push_back(c * s * s);
  GaugeSeries gauge(t, y, 0.1);
  SiteTableBuilder b;
  const auto transect = b.transect_index("A");
  const auto sensor = b.sensor_index("landsat8");
  b.add(transect, b.image_index("fine"), sensor, {0, 1800.0, 100.0, kUnknown, kUnknown});
  b.add(transect, b.image_index("coarse"), sensor, {1, 14400.0, 100.0, kUnknown, kUnknown});
  SiteTable table = std::move(b).build();
  table.reset_derived();
  RunInputs inputs;
  inputs.water_levels = &gauge;
  StepLog log;
  WaterLevelStep(WaterLevelStep::Params{}).run(table, 0, inputs, log);
  EXPECT_NEAR(table.water_level_sigma_m[0], std::hypot(0.1, c * 1800 * 1800), 1e-12);
  EXPECT_NEAR(table.water_level_sigma_m[1], std::hypot(0.1, c * 3600 * 3600), 1e-12);
  EXPECT_FALSE(has_flag(table.flags[0], Flag::coarse_gauge));
  EXPECT_TRUE(has_flag(table.flags[1], Flag::coarse_gauge));
  // A source without a sigma of its own: the step's default, still with the interpolation error.
  GaugeSeries unstated(t, y, kUnknown);
  inputs.water_levels = &unstated;
  table.reset_derived();
  WaterLevelStep::Params p;
  p.sigma_m = 0.2;
  WaterLevelStep(p).run(table, 0, inputs, log);
  EXPECT_NEAR(table.water_level_sigma_m[0], std::hypot(0.2, c * 1800 * 1800), 1e-12);
}
