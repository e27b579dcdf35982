// Trend, serial correlation, t quantiles, the annual harmonic and the summary's trend part.
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "qc/linear_trend.h"
#include "qc/seasonal_fit.h"
#include "qc/student_t.h"
#include "qc/summary.h"
#include "tests/unit/qc_series.h"

using namespace strandline;

TEST(QcStudentT, TableValues) {
  // Two-sided 95% points of Student's t (standard statistical tables; recalled from memory).
  EXPECT_NEAR(student_t_quantile(0.975, 1), 12.7062047, 1e-5);
  EXPECT_NEAR(student_t_quantile(0.975, 2), 4.30265273, 1e-6);
  EXPECT_NEAR(student_t_quantile(0.975, 10), 2.22813885, 1e-6);
  EXPECT_NEAR(student_t_quantile(0.975, 1e6), 1.95996398, 1e-5);
  // dof = 1 is the Cauchy distribution: closed form tan(pi (p - 1/2)).
  EXPECT_NEAR(student_t_quantile(0.9, 1), std::tan(std::numbers::pi * 0.4), 1e-8);
  EXPECT_NEAR(student_t_quantile(0.025, 10), -2.22813885, 1e-6);
}

TEST(QcLinearTrend, ExactLineAndClosedFormErrors) {
  std::vector<TrendSample> s;
  for (int k = 0; k < 20; ++k) s.push_back({2000.0 + 0.5 * k, 100.0 - 1.5 * 0.5 * k + (k % 2 ? 0.5 : -0.5), 1.0});
  const LinearTrend t = fit_linear_trend(s, false);
  ASSERT_TRUE(t.valid);
  // Alternating residuals have negative lag-1 autocorrelation: taken as 0, n_eff = n.
  EXPECT_LT(t.lag1_autocorrelation, 0);
  EXPECT_DOUBLE_EQ(t.n_effective, 20.0);
  EXPECT_NEAR(t.se_m_per_yr, t.se_naive_m_per_yr, 1e-12);
  // Closed-form OLS on x_k = a + b t_k + e_k: b from centred sums.
  double tm = 0, xm = 0;
  for (auto& p : s) tm += p.t_years / 20, xm += p.value_m / 20;
  double stt = 0, stx = 0;
  for (auto& p : s) stt += (p.t_years - tm) * (p.t_years - tm), stx += (p.t_years - tm) * (p.value_m - xm);
  EXPECT_NEAR(t.rate_m_per_yr, stx / stt, 1e-12);
  EXPECT_NEAR(t.ci95_high - t.rate_m_per_yr, student_t_quantile(0.975, 18) * t.se_m_per_yr, 1e-9);
}

TEST(QcLinearTrend, SerialCorrelationWidensTheInterval) {
  std::vector<TrendSample> s;
  double ar = 0;
  for (int k = 0; k < 400; ++k) {
    ar = 0.8 * ar + qc_test::wobble(k);
    s.push_back({2000.0 + k / 40.0, 0.7 * k / 40.0 + 3 * ar, 1.0});
  }
  const LinearTrend t = fit_linear_trend(s, true);
  EXPECT_GT(t.lag1_autocorrelation, 0.5);
  EXPECT_LT(t.n_effective, 100);
  EXPECT_GT(t.se_m_per_yr, 2 * t.se_naive_m_per_yr);
  EXPECT_LT(t.ci95_low, 0.7);
  EXPECT_GT(t.ci95_high, 0.7);
}

TEST(QcLinearTrend, WeightsDownweightNoisyPoints) {
  std::vector<TrendSample> s;
  for (int k = 0; k < 30; ++k) s.push_back({2000.0 + k, 2.0 * k, 1.0});
  s[15].value_m += 100;
  s[15].sigma_m = 1000;  // practically no weight
  EXPECT_NEAR(fit_linear_trend(s, true).rate_m_per_yr, 2.0, 1e-3);
  EXPECT_GT(std::abs(fit_linear_trend(s, false).rate_m_per_yr - 2.0), 1e-3);
}

TEST(QcSeasonal, RecoversAmplitudeAndPhase) {
  std::vector<TrendSample> s;
  for (int k = 0; k < 300; ++k) {
    const double t = 2005.0 + k * 0.0271;
    s.push_back({t, 50 + 0.8 * (t - 2005) + 8 * std::cos(2 * std::numbers::pi * (t - 2000.0) - 30 * std::numbers::pi / 180), 2.0});
  }
  const SeasonalFit f = fit_annual_harmonic(s, true);
  ASSERT_TRUE(f.valid);
  EXPECT_NEAR(f.amplitude_m, 8.0, 1e-6);
  EXPECT_NEAR(f.phase_deg, 30.0, 1e-6);
  EXPECT_NEAR(f.peak_day_of_year, 30.0 / 360 * 365.25, 1e-6);
}

TEST(QcSummary, TrendKeysSlopeTermAndWindow) {
  // One transect: tide-like water levels, a known slope with an interval; the
  // slope term is the rate change when the positions are recomputed at the bounds.
  std::vector<qc_test::Obs> obs;
  for (int k = 0; k < 200; ++k) obs.push_back({"T1", "i" + std::to_string(k), "landsat8", k * 20.0, 0});
  SiteTable table = qc_test::make_table(obs);
  TransectInfo& t = table.transects[0];
  t.slope = 0.1;
  t.slope_ci95_low = 0.08;
  t.slope_ci95_high = 0.12;
  t.z_ref_m = 0;
  for (std::size_t i = 0; i < table.size(); ++i) {
    const double years = (table.time_s[i] - table.time_s[0]) / kSecondsPerJulianYear;
    // The water level drifts upward with time, so the slope changes the rate.
    table.water_level_m[i] = 0.1 * years + 0.5 * std::sin(1.3 * i);
    table.chainage_m[i] = 100 - 1.0 * years + 2 * qc_test::wobble(i);
    table.sigma_m[i] = 5;
    table.sigma_slope_m[i] = 3;
  }
  const TransectSummary s = transect_summary(table, 0, SummaryOptions{});
  ASSERT_TRUE(s.trend);
  EXPECT_NEAR(s.trend->rate_m_per_yr, -1.0, 0.1);
  // d rate / d(1/slope) = 0.1 m/yr of water level: 0.1 * (1/0.08 - 1/0.1) = 0.25 m/yr.
  ASSERT_TRUE(s.trend->slope_term);
  EXPECT_NEAR(s.trend->slope_term->slope_term_m_per_yr, 0.25, 0.01);
  ASSERT_TRUE(s.trend->ci95_m_per_yr);
  ASSERT_TRUE(s.trend->slope_term->ci95_with_slope_m_per_yr);
  const Interval ci = *s.trend->ci95_m_per_yr;
  const Interval ci_all = *s.trend->slope_term->ci95_with_slope_m_per_yr;
  EXPECT_LT(ci_all.low, ci.low);
  EXPECT_GT(ci_all.high, ci.high);
  EXPECT_TRUE(s.seasonal);
  // Eleven years, 200 points, a known slope interval: nothing to caution about.
  EXPECT_EQ(s.cautions, std::vector<std::string>{});
  EXPECT_EQ(s.trend_window.n_points, 200u);

  SummaryOptions window;
  window.trend_from_s = table.time_s[100];
  const TransectSummary w = transect_summary(table, 0, window);
  EXPECT_EQ(w.trend_window.n_points, 100u);
  EXPECT_EQ(w.trend_window.from_s, table.time_s[100]);
  EXPECT_FALSE(known(w.trend_window.to_s));
}
