// The wave term inside the spectral slope search, both paths:
//   setup  closed form with the slope-free 0.35 sqrt(H0 L0) as a constant horizontal term
//   runup  grid + refine on R2%(tan beta)/tan beta, regime re-checked at every slope
// on a synthetic transect whose waterlines contain the wave term: the true slope
// and the true positions come back.
#include <cmath>
#include <random>
#include <vector>

#include <gtest/gtest.h>

#include "corrections/spectral/slope_search.h"
#include "corrections/waves/linear_waves.h"
#include "corrections/waves/stockdon.h"
#include "corrections/waves/wave_slope_terms.h"

namespace strandline {
namespace {

constexpr double kTrueSlope = 0.05;
constexpr double kTwoPi = 6.283185307179586;

struct Transect {
  std::vector<double> t_s, raw_m, water_m, truth_m, h0_m, l0_m;
};

// 10 years of images every 8 days at 10:30 UTC (the tide aliased by the sampling),
// a mixed semidiurnal tide, storms up to Hs 5 m, 2 m of position noise.
Transect make_transect(bool data_has_runup) {
  Transect tr;
  std::mt19937_64 rng(7);
  std::normal_distribution<double> noise(0.0, 2.0);
  const double t0 = 946722600.0;  // 2000-01-01T10:30:00Z
  for (int d = 0; d < 3650; d += 8) {
    const double t = t0 + d * 86400.0;
    const double hours = (t - t0) / 3600.0;
    const double tide = 1.6 * std::cos(kTwoPi * hours / 12.4206012) + 0.6 * std::cos(kTwoPi * hours / 12.0 + 0.7) +
                        0.3 * std::cos(kTwoPi * hours / 23.934470 + 1.9);
    const double days = d;
    const double hs = 1.2 + 1.0 * std::sin(kTwoPi * days / 365.25) + 2.8 * std::pow(std::sin(kTwoPi * days / 47.0), 8);
    const double tp = 9.0 + 3.0 * std::sin(kTwoPi * days / 61.0);
    const double l0 = deep_water_wavelength_m(tp);
    // Truth written out from the published coefficients (independent of stockdon.h).
    const double q = std::sqrt(hs * l0);
    const double xi = kTrueSlope / std::sqrt(hs / l0);
    const double setup = 0.35 * kTrueSlope * q;
    const double r2 = xi < 0.3 ? 0.043 * q
                               : 1.1 * (setup + 0.5 * std::hypot(0.75 * kTrueSlope * q, 0.06 * q));
    const double truth = 200.0 + 1.5 * days / 365.25 + 10.0 * std::cos(kTwoPi * days / 365.25);
    const double seen_level = tide + (data_has_runup ? r2 : setup);
    tr.t_s.push_back(t);
    tr.truth_m.push_back(truth);
    tr.water_m.push_back(tide);
    tr.raw_m.push_back(truth - seen_level / kTrueSlope + noise(rng));
    tr.h0_m.push_back(hs);
    tr.l0_m.push_back(l0);
  }
  return tr;
}

spectral::SlopeSearchOptions options() {
  spectral::SlopeSearchOptions o;
  o.bootstrap_count = 20;
  return o;
}

TEST(WaveSlopeCoupling, SetupEntersTheClosedFormAsAConstantHorizontalTerm) {
  const Transect tr = make_transect(false);
  const WaveSlopeTerms terms(tr.h0_m, tr.l0_m, WaveCorrection::setup);
  ASSERT_TRUE(terms.closed_form());
  const std::vector<double> horizontal = terms.horizontal_m();
  for (std::size_t i = 0; i < horizontal.size(); ++i)
    EXPECT_NEAR(horizontal[i], 0.35 * std::sqrt(tr.h0_m[i] * tr.l0_m[i]), 1e-12);

  const spectral::SlopeSearcher searcher;
  const auto closed = searcher.estimate({tr.t_s, tr.raw_m, tr.water_m, horizontal}, options());
  ASSERT_TRUE(closed.identifiable) << closed.details().dump();
  EXPECT_EQ(closed.method, "closed_form");
  EXPECT_NEAR(closed.tan_beta, kTrueSlope, 0.03 * kTrueSlope);

  // The grid path on the same correction finds the same minimum.
  const auto fn = terms.corrected_series(tr.raw_m, tr.water_m);
  const auto grid = searcher.estimate(tr.t_s, tr.water_m, fn, options());
  EXPECT_EQ(grid.method, "grid_refine");
  EXPECT_NEAR(grid.tan_beta, closed.tan_beta, 1e-4 * closed.tan_beta);

  // Positions: corrected with the found slope, the setup is removed.
  std::vector<double> corrected(tr.t_s.size());
  fn(kTrueSlope, corrected);
  double rms = 0;
  for (std::size_t i = 0; i < corrected.size(); ++i) rms += std::pow(corrected[i] - tr.truth_m[i], 2);
  EXPECT_LT(std::sqrt(rms / corrected.size()), 2.5);  // the 2 m noise only
}

TEST(WaveSlopeCoupling, RunupTakesTheGridPathWithRegimesRecheckedAtEachSlope) {
  const Transect tr = make_transect(true);
  const WaveSlopeTerms terms(tr.h0_m, tr.l0_m, WaveCorrection::runup);
  ASSERT_FALSE(terms.closed_form());
  EXPECT_TRUE(terms.horizontal_m().empty());
  // Both regimes occur at the true slope, and their mix changes with the slope.
  const std::size_t n = tr.t_s.size();
  EXPECT_GT(terms.dissipative_count(kTrueSlope), n / 20);
  EXPECT_LT(terms.dissipative_count(kTrueSlope), n - n / 20);
  EXPECT_GT(terms.dissipative_count(0.02), terms.dissipative_count(0.08));

  const auto fn = terms.corrected_series(tr.raw_m, tr.water_m);
  // The callback evaluates each image in the regime of the slope asked for.
  std::vector<double> at(n);
  for (double slope : {0.02, 0.05, 0.08}) {
    fn(slope, at);
    for (std::size_t i = 0; i < n; ++i) {
      const StockdonTerms s = stockdon_terms(tr.h0_m[i], tr.l0_m[i], slope);
      EXPECT_NEAR(at[i], tr.raw_m[i] + (tr.water_m[i] + s.runup_m) / slope, 1e-9);
    }
  }
  const spectral::SlopeSearcher searcher;
  const auto est = searcher.estimate(tr.t_s, tr.water_m, fn, options());
  ASSERT_TRUE(est.identifiable) << est.details().dump();
  EXPECT_EQ(est.method, "grid_refine");
  EXPECT_NEAR(est.tan_beta, kTrueSlope, 0.03 * kTrueSlope);
  fn(est.tan_beta, at);
  double rms = 0;
  for (std::size_t i = 0; i < n; ++i) rms += std::pow(at[i] - tr.truth_m[i], 2);
  EXPECT_LT(std::sqrt(rms / n), 4.0);
}

TEST(WaveSlopeCoupling, ImagesWithoutSeaStateGetNoWaveTerm) {
  const WaveSlopeTerms terms({2.0, kUnknown}, {150.0, 150.0}, WaveCorrection::runup);
  std::vector<double> out(2);
  terms.horizontal_at(0.05, out);
  EXPECT_GT(out[0], 0.0);
  EXPECT_EQ(out[1], 0.0);
  const WaveSlopeTerms none({2.0}, {150.0}, WaveCorrection::none);
  EXPECT_TRUE(none.horizontal_m().empty());
  std::vector<double> one(1);
  none.horizontal_at(0.05, one);
  EXPECT_EQ(one[0], 0.0);
}

}  // namespace
}  // namespace strandline
