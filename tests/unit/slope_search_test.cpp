// The spectral slope search on plain arrays: the closed form against the grid,
// the quadratic against the direct periodogram, the seasonal guard, the
// verdicts, and slope recovery on hand-made transects (a tide of five
// constituents; speeds in degrees per hour from Schureman 1958, recalled from
// memory). Recovery on the demo generator's site: slope_recovery_test.cpp.
#include <cmath>
#include <numbers>
#include <random>

#include <gtest/gtest.h>

#include "corrections/core/time_utc.h"
#include "corrections/spectral/band_energy.h"
#include "corrections/spectral/detrend.h"
#include "corrections/spectral/lomb_scargle.h"
#include "corrections/spectral/slope_search.h"

namespace strandline::spectral {
namespace {

struct Constituent {
  double speed_deg_per_h, amplitude_m, phase_deg;
};

// Mixed, mainly semidiurnal tide (M2, S2, N2, K1, O1).
const std::vector<Constituent> kTide = {
    {28.9841042, 1.0, 10}, {30.0, 0.35, 40}, {28.4397295, 0.2, 300}, {15.0410686, 0.25, 120}, {13.9430356, 0.18, 200}};

double tide_m(const std::vector<Constituent>& tide, double t_s, double scale) {
  double eta = 0;
  for (const auto& c : tide)
    eta += c.amplitude_m * std::cos((c.speed_deg_per_h * t_s / 3600.0 - c.phase_deg) * std::numbers::pi / 180);
  return scale * eta;
}

struct Transect {
  std::vector<double> t_s, x, w, truth;
  std::vector<char> planted;
};

struct TransectSpec {
  double slope = 0.08;
  double revisit_days = 16;
  double years = 12;
  double noise_m = 8;
  double outlier_fraction = 0.03;
  double tide_scale = 1.0;
  double seasonal_m = 10;
  double loss = 0.3;  // images lost to cloud
  bool random_times = false;
  unsigned seed = 1;
  std::vector<Constituent> tide = kTide;
};

Transect make_transect(const TransectSpec& spec) {
  std::mt19937_64 rng(spec.seed);
  std::uniform_real_distribution<double> u(0, 1);
  std::normal_distribution<double> g(0, 1);
  Transect tr;
  const double t0 = 946684800.0 + 10.5 * 3600;  // 2000-01-01T10:30Z: fixed time of day
  const double span_s = spec.years * kSecondsPerJulianYear;
  for (double t = t0; t < t0 + span_s; t += spec.revisit_days * kSecondsPerDay) {
    if (u(rng) < spec.loss) continue;
    const double ti = spec.random_times ? t0 + u(rng) * span_s : t;
    const double years = (ti - t0) / kSecondsPerJulianYear;
    const double truth = 120 + 1.5 * years + spec.seasonal_m * std::cos(2 * std::numbers::pi * years);
    const double w = tide_m(spec.tide, ti, spec.tide_scale);
    double x = truth - w / spec.slope + spec.noise_m * g(rng);
    const bool outlier = u(rng) < spec.outlier_fraction;
    if (outlier) x += (u(rng) < 0.5 ? -1 : 1) * (50 + 70 * u(rng));
    tr.t_s.push_back(ti);
    tr.x.push_back(x);
    tr.w.push_back(w);
    tr.truth.push_back(truth);
    tr.planted.push_back(outlier);
  }
  if (spec.random_times) {  // keep time order
    std::vector<std::size_t> idx(tr.t_s.size());
    for (std::size_t i = 0; i < idx.size(); ++i) idx[i] = i;
    std::sort(idx.begin(), idx.end(), [&](auto a, auto b) { return tr.t_s[a] < tr.t_s[b]; });
    Transect s;
    for (auto i : idx) {
      s.t_s.push_back(tr.t_s[i]);
      s.x.push_back(tr.x[i]);
      s.w.push_back(tr.w[i]);
      s.truth.push_back(tr.truth[i]);
      s.planted.push_back(tr.planted[i]);
    }
    return s;
  }
  return tr;
}

const SlopeSearcher& searcher() {
  static const SlopeSearcher s;
  return s;
}

SlopeEstimate estimate(const Transect& tr, SlopeSearchOptions o = {}) {
  return searcher().estimate({tr.t_s, tr.x, tr.w, {}}, o);
}

TEST(BandBasis, QuadraticMatchesTheDirectPeriodogramOfTheCorrectedDetrendedSeries) {
  TransectSpec spec;
  spec.years = 6;
  const Transect tr = make_transect(spec);
  std::vector<double> days;
  for (double t : tr.t_s) days.push_back((t - tr.t_s[0]) / kSecondsPerDay);
  std::vector<double> omegas, weights;
  for (int k = 0; k < 40; ++k) {
    omegas.push_back(2 * std::numbers::pi * (0.066 + 2.4e-5 * k));
    weights.push_back(2.4e-5);
  }
  for (bool seasonal : {false, true}) {
  const BandBasis basis(days, omegas, weights, seasonal);
  const Quadratic q = basis.quadratic(tr.x, tr.w);
  for (double s : {5.0, 12.5, 20.0, 55.0, 100.0}) {
    std::vector<double> y(tr.x.size());
    for (std::size_t i = 0; i < y.size(); ++i) y[i] = tr.x[i] + s * tr.w[i];
    // Independent: detrend explicitly, scipy-convention direct periodogram.
    const auto p = lomb_scargle_power_direct(days, omegas, detrend_days(days, y, seasonal));
    double e = 0;
    for (std::size_t k = 0; k < p.size(); ++k) e += weights[k] * p[k];
    EXPECT_NEAR(q.at(s), e, 1e-9 * e) << "s = " << s;
    EXPECT_NEAR(basis.energy(y), e, 1e-9 * e) << "s = " << s;
  }
  }
}

TEST(BandBasis, MultiplicityEqualsRepeatingImages) {
  TransectSpec spec;
  spec.years = 4;
  const Transect tr = make_transect(spec);
  std::vector<double> days;
  for (double t : tr.t_s) days.push_back((t - tr.t_s[0]) / kSecondsPerDay);
  const std::vector<double> omegas = {0.42, 0.43, 0.44}, weights = {1, 1, 1};
  std::vector<double> m(days.size());
  std::vector<double> dt, dx, dw;
  for (std::size_t i = 0; i < days.size(); ++i) {
    m[i] = static_cast<double>(i % 3);  // 0, 1 or 2 copies
    for (int c = 0; c < static_cast<int>(m[i]); ++c) {
      dt.push_back(days[i]);
      dx.push_back(tr.x[i]);
      dw.push_back(tr.w[i]);
    }
  }
  const Quadratic weighted = BandBasis(days, omegas, weights, true).quadratic(tr.x, tr.w, m);
  const Quadratic repeated = BandBasis(dt, omegas, weights, true).quadratic(dx, dw);
  EXPECT_NEAR(weighted.a, repeated.a, 1e-9 * repeated.a);
  EXPECT_NEAR(weighted.b, repeated.b, 1e-9 * std::abs(repeated.b));
  EXPECT_NEAR(weighted.c, repeated.c, 1e-9 * repeated.c);
}

TEST(SlopeSearch, ClosedFormAgreesWithGridAndRefine) {
  const Transect tr = make_transect({});
  SlopeSearchOptions o;
  o.bootstrap_count = 0;
  o.screen_passes = 0;
  const SlopeEstimate closed = estimate(tr, o);
  ASSERT_TRUE(closed.band.found);
  CorrectedSeriesFn linear = [&](double tan_beta, std::span<double> out) {
    for (std::size_t i = 0; i < tr.x.size(); ++i) out[i] = tr.x[i] + tr.w[i] / tan_beta;
  };
  const SlopeEstimate grid = searcher().estimate(tr.t_s, tr.w, linear, o);
  EXPECT_EQ(grid.method, "grid_refine");
  EXPECT_NEAR(grid.tan_beta, closed.tan_beta, 1e-6);
  // The reported (quadratic) energy curve equals the grid path's evaluations.
  ASSERT_EQ(grid.curve.size(), closed.curve.size());
  for (std::size_t i = 0; i < grid.curve.size(); ++i) {
    EXPECT_NEAR(grid.curve[i].tan_beta, closed.curve[i].tan_beta, 1e-12);
    EXPECT_NEAR(grid.curve[i].energy, closed.curve[i].energy, 1e-8 * closed.curve[i].energy);
  }
}

TEST(SlopeSearch, RecoversSlopesWithNoiseAndOutliersOnTwoSamplingPatterns) {
  // 16-day and 5-day revisit at a fixed time of day, noise 5-10 m, 3% gross outliers.
  for (double revisit : {16.0, 5.0})
    for (double slope : {0.02, 0.05, 0.1, 0.15}) {
      TransectSpec spec;
      spec.slope = slope;
      spec.revisit_days = revisit;
      spec.years = revisit > 10 ? 20 : 8;
      spec.noise_m = revisit > 10 ? 8 : 6;
      spec.seed = static_cast<unsigned>(slope * 1000 + revisit);
      const Transect tr = make_transect(spec);
      const SlopeEstimate e = estimate(tr);
      EXPECT_TRUE(e.identifiable) << "revisit " << revisit << " slope " << slope << ": "
                                  << e.details().dump();
      EXPECT_NEAR(e.tan_beta, slope, 0.1 * slope) << "revisit " << revisit;
      EXPECT_LE(e.ci95_low, e.tan_beta);
      EXPECT_GE(e.ci95_high, e.tan_beta);
      EXPECT_GT(e.images_screened, 0u);
    }
}

TEST(SlopeSearch, ScreensPlantedOutliersNotLargeTides) {
  TransectSpec spec;
  spec.slope = 0.03;  // macro-tidal in horizontal terms: raw swing ~ 130 m
  spec.outlier_fraction = 0.05;
  spec.noise_m = 5;
  const Transect tr = make_transect(spec);
  const SlopeEstimate e = estimate(tr);
  std::size_t planted_kept = 0, good_dropped = 0, planted = 0;
  for (std::size_t i = 0; i < tr.planted.size(); ++i) {
    planted += tr.planted[i];
    if (tr.planted[i] && e.kept[i]) ++planted_kept;
    if (!tr.planted[i] && !e.kept[i]) ++good_dropped;
  }
  ASSERT_GE(planted, 5u);
  EXPECT_LE(planted_kept, planted / 10);
  EXPECT_LE(good_dropped, tr.planted.size() / 50);  // at most 2% of good images
  EXPECT_NEAR(e.tan_beta, spec.slope, 0.05 * spec.slope);
}

TEST(SlopeSearch, MicroTidalIsNotIdentifiable) {
  TransectSpec spec;
  spec.tide_scale = 0.04;  // range ~0.15 m: excursion ~2 m at tan(beta) 0.08
  const SlopeEstimate e = estimate(make_transect(spec));
  EXPECT_FALSE(e.identifiable);
  EXPECT_NE(std::find(e.reasons.begin(), e.reasons.end(), "tidal_excursion_below_limit"), e.reasons.end())
      << e.details().dump();
}

TEST(SlopeSearch, SteepBeachOutsideTheRangeIsAnEdgeMinimum) {
  TransectSpec spec;
  spec.slope = 0.4;
  spec.noise_m = 3;
  const SlopeEstimate e = estimate(make_transect(spec));
  EXPECT_FALSE(e.identifiable);
  EXPECT_NE(std::find(e.reasons.begin(), e.reasons.end(), "minimum_at_range_edge"), e.reasons.end())
      << e.details().dump();
  EXPECT_DOUBLE_EQ(e.tan_beta, 0.2);
}

TEST(SlopeSearch, TooFewImages) {
  TransectSpec spec;
  spec.years = 1;
  const SlopeEstimate e = estimate(make_transect(spec));
  EXPECT_FALSE(e.identifiable);
  EXPECT_EQ(e.reasons.front(), "too_few_images");
}

TEST(SlopeSearch, RandomImageTimesGiveNoClearTidalPeak) {
  TransectSpec spec;
  spec.random_times = true;
  const SlopeEstimate e = estimate(make_transect(spec));
  EXPECT_FALSE(e.identifiable);
  EXPECT_NE(std::find(e.reasons.begin(), e.reasons.end(), "no_clear_tidal_peak"), e.reasons.end())
      << e.details().dump();
}

TEST(SlopeSearch, SeasonalPeakIsSkipped) {
  // A diurnal tide dominated by K1 and P1 sampled at a fixed time of day aliases
  // to one cycle per year (and, through the 16-day revisit, to 1/yr + n/16 d):
  // that peak must not set the band. With the line-only detrending of the
  // published method the guard has to skip it.
  TransectSpec spec;
  spec.tide = {{15.0410686, 0.8, 0}, {14.9589314, 0.3, 30}, {13.9430356, 0.5, 100}, {28.9841042, 0.2, 0}};
  spec.years = 20;
  const Transect tr = make_transect(spec);
  SlopeSearchOptions line_only;
  line_only.remove_seasonal = false;
  const SlopeEstimate e = estimate(tr, line_only);
  ASSERT_TRUE(e.band.seasonal_peak_skipped) << e.details().dump();
  std::vector<double> days;
  for (double t : tr.t_s) days.push_back((t - tr.t_s[0]) / kSecondsPerDay);
  EXPECT_GE(seasonal_leakage(days, e.band.skipped_peak_cpd), 0.25);
  EXPECT_GT(distance_to_seasonal_cpd(e.band.peak_cpd), e.band.rayleigh_cpd);
  for (double f : e.band.frequencies_cpd) {
    EXPECT_GE(distance_to_seasonal_cpd(f), e.band.rayleigh_cpd);
    EXPECT_LT(seasonal_leakage(days, f), 0.25);
  }
  // With the seasonal sinusoids removed (the default) the aliased K1/P1 are gone
  // before the peak search, and the 10 m seasonal cycle of the beach does not
  // pull the slope: the O1 band recovers it.
  const SlopeEstimate d = estimate(tr);
  EXPECT_LT(seasonal_leakage(days, d.band.peak_cpd), 0.25);
  EXPECT_NEAR(d.tan_beta, spec.slope, 0.1 * spec.slope) << d.details().dump();
}

TEST(SlopeSearch, SameInputsSameOutputsAndSeedMatters) {
  const Transect tr = make_transect({});
  SlopeSearchOptions o;
  const SlopeEstimate a = estimate(tr, o), b = estimate(tr, o);
  EXPECT_EQ(a.details().dump(), b.details().dump());
  o.seed = 99;
  const SlopeEstimate c = estimate(tr, o);
  EXPECT_EQ(a.tan_beta, c.tan_beta);
  EXPECT_NE(a.ci95_low, c.ci95_low);
}

TEST(SlopeSearch, HorizontalTermIsAppliedAsSlopeFree) {
  // Data shifted landward by a slope-free horizontal term h (the setup seen in
  // horizontal terms) and given h: the same estimate as the unshifted data.
  const Transect tr = make_transect({});
  std::vector<double> h(tr.x.size()), shifted(tr.x.size());
  for (std::size_t i = 0; i < h.size(); ++i) {
    h[i] = 15 + 10 * std::sin(tr.t_s[i] / 86400.0 / 3.7);  // an invented sea-state history
    shifted[i] = tr.x[i] - h[i];
  }
  const SlopeEstimate with_h = searcher().estimate({tr.t_s, shifted, tr.w, h}, {});
  const SlopeEstimate clean = estimate(tr);
  EXPECT_NEAR(with_h.tan_beta, clean.tan_beta, 1e-9);
  const SlopeEstimate without_h = searcher().estimate({tr.t_s, shifted, tr.w, {}}, {});
  EXPECT_GT(std::abs(without_h.tan_beta - clean.tan_beta), 1e-6);
}

}  // namespace
}  // namespace strandline::spectral
