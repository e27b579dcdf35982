// Fast (Press & Rybicki 1989) Lomb-Scargle against the direct O(N F) sum, and the
// direct sum against closed-form values. The comparison with scipy itself is
// tests/reference/check_lomb_scargle.py.
#include <cmath>
#include <numbers>
#include <random>

#include <gtest/gtest.h>

#include "corrections/spectral/fast_lomb_scargle.h"
#include "corrections/spectral/lomb_scargle.h"

namespace strandline::spectral {
namespace {

struct Series {
  std::vector<double> t, y, z;
};

// Irregular times over ~12 years (days), a few tones plus noise.
Series irregular_series(std::size_t n, unsigned seed) {
  std::mt19937_64 rng(seed);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  std::normal_distribution<double> g(0.0, 1.0);
  Series s;
  double t = 7300.25;
  for (std::size_t i = 0; i < n; ++i) {
    t += 1.0 + 9.0 * u(rng);
    s.t.push_back(t);
    s.y.push_back(3 * std::cos(2 * std::numbers::pi * t / 14.77 + 0.3) + std::sin(2 * std::numbers::pi * t / 190.0) +
                  0.5 * g(rng) + 12.0);
    s.z.push_back(std::cos(2 * std::numbers::pi * t / 14.77 - 1.0) + g(rng));
  }
  return s;
}

double max_of(const std::vector<double>& v) { return *std::max_element(v.begin(), v.end()); }

TEST(FastLombScargle, MatchesDirectSumOnTheSlopeSearchGrid) {
  const Series s = irregular_series(800, 7);
  // The search grid: 4000 frequencies from 1/400 to 1/10 cycles per day.
  const double f0 = 1.0 / 400, f1 = 1.0 / 10;
  const UniformAngularGrid grid{2 * std::numbers::pi * f0, 2 * std::numbers::pi * (f1 - f0) / 3999, 4000};
  const FastLombScargle fast(grid);
  const LombScargleSpectra a = fast.compute(s.t, {s.y, s.z});
  const LombScargleSpectra b = lomb_scargle_direct(s.t, grid.omegas(), {s.y, s.z});
  for (std::size_t series = 0; series < 2; ++series) {
    const auto pa = a.power(series), pb = b.power(series);
    const double scale = max_of(pb);
    double worst = 0;
    for (std::size_t k = 0; k < pa.size(); ++k) worst = std::max(worst, std::abs(pa[k] - pb[k]) / scale);
    EXPECT_LT(worst, 2e-6) << "series " << series;  // the accuracy stated in fast_lomb_scargle.h
  }
  const auto ca = a.cross_power(0, 1), cb = b.cross_power(0, 1);
  const double scale = std::sqrt(max_of(b.power(0)) * max_of(b.power(1)));
  for (std::size_t k = 0; k < ca.size(); ++k) EXPECT_NEAR(ca[k], cb[k], 2e-6 * scale);
}

TEST(FastLombScargle, AccuracyImprovesWithOrderAndOversampling) {
  const Series s = irregular_series(300, 11);
  const UniformAngularGrid grid{0.01, 0.0007, 900};
  const auto exact = lomb_scargle_power_direct(s.t, grid.omegas(), s.y);
  auto error_of = [&](int mu, int p) {
    const FastLombScargle fast(grid, {mu, p});
    const auto approx = fast.power(s.t, s.y);
    double worst = 0;
    for (std::size_t k = 0; k < approx.size(); ++k) worst = std::max(worst, std::abs(approx[k] - exact[k]));
    return worst / max_of(exact);
  };
  const double coarse = error_of(4, 4), fine = error_of(4, 6), finer = error_of(8, 8);
  EXPECT_LT(fine, coarse);
  EXPECT_LT(finer, fine);
  EXPECT_LT(finer, 2e-6);
}

TEST(LombScargleDirect, SingleToneOnRegularTimesHasTheTextbookPeak) {
  // y = A cos(w t) on N regular samples spanning whole cycles: at w, tau = 0,
  // sum cos^2 = N/2, so P = 1/2 (A N/2)^2 / (N/2) = A^2 N / 4 (textbook identity).
  const std::size_t n = 200;
  const double w = 2 * std::numbers::pi / 20.0, amplitude = 2.5;
  std::vector<double> t(n), y(n);
  for (std::size_t i = 0; i < n; ++i) {
    t[i] = static_cast<double>(i);
    y[i] = amplitude * std::cos(w * t[i]);
  }
  const auto p = lomb_scargle_power_direct(t, std::vector<double>{w}, y);
  EXPECT_NEAR(p[0], amplitude * amplitude * n / 4, 1e-9 * p[0]);
}

TEST(LombScargleDirect, CrossPowerIsTheBilinearFormOfThePower) {
  const Series s = irregular_series(120, 3);
  const UniformAngularGrid grid{0.02, 0.003, 200};
  const double slope = -7.5;
  std::vector<double> combined(s.y.size());
  for (std::size_t i = 0; i < combined.size(); ++i) combined[i] = s.y[i] + slope * s.z[i];
  const auto spectra = lomb_scargle_direct(s.t, grid.omegas(), {s.y, s.z, combined});
  const auto pxx = spectra.power(0), pww = spectra.power(1), pxw = spectra.cross_power(0, 1), p = spectra.power(2);
  for (std::size_t k = 0; k < p.size(); ++k)
    EXPECT_NEAR(p[k], pxx[k] + 2 * slope * pxw[k] + slope * slope * pww[k], 1e-9 * (1 + p[k]));
}

TEST(FastLombScargle, FftFriendlySizes) {
  EXPECT_EQ(fft_friendly_size(64000), 65536u);
  EXPECT_EQ(fft_friendly_size(7), 8u);
  EXPECT_EQ(fft_friendly_size(32), 32u);
  EXPECT_EQ(fft_friendly_size(1), 1u);
}

}  // namespace
}  // namespace strandline::spectral
