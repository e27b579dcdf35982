// Harmonic analysis: exact recovery from noise-free synthetic records with
// gaps, Rayleigh selection by record length, standard errors that match the
// noise, and clear errors for records that resolve nothing.
#include <gtest/gtest.h>

#include <cmath>
#include <random>

#include "corrections/core/errors.h"
#include "corrections/tide/constituent_table.h"
#include "corrections/tide/harmonic_fit.h"
#include "corrections/tide/tide_predictor.h"

namespace strandline::tide {
namespace {

// Invented constants (mixed tide), not a real site.
ConstituentSet invented_site() {
  ConstituentSet s;
  s.z0_m = 0.12;
  for (auto [name, amp, phase] : std::initializer_list<std::tuple<const char*, double, double>>{
           {"M2", 0.81, 123.0}, {"S2", 0.27, 160.0}, {"N2", 0.17, 101.0}, {"K2", 0.075, 155.0},
           {"K1", 0.36, 240.0}, {"O1", 0.24, 221.0}, {"P1", 0.11, 238.0}, {"Q1", 0.045, 210.0},
           {"M4", 0.03, 40.0},  {"MS4", 0.02, 80.0}, {"Mf", 0.015, 10.0}, {"Sa", 0.06, 200.0}})
    s.constituents.push_back({name, amp, phase, kUnknown, kUnknown, std::nullopt});
  return s;
}

struct Record {
  std::vector<double> t, h;
};

Record sample(const ConstituentSet& s, double days, double step_s, double keep_fraction, double noise_m,
              unsigned seed) {
  const TidePredictor p(s);
  std::mt19937 rng(seed);
  std::uniform_real_distribution<double> keep(0, 1);
  std::normal_distribution<double> noise(0, noise_m > 0 ? noise_m : 1);
  Record r;
  const double t0 = 1.58e9;
  for (double t = t0; t <= t0 + days * kSecondsPerDay; t += step_s) {
    if (keep(rng) > keep_fraction) continue;
    r.t.push_back(t);
    r.h.push_back(p.level_m(t) + (noise_m > 0 ? noise(rng) : 0.0));
  }
  return r;
}

std::vector<std::string> names_of(const ConstituentSet& s) {
  std::vector<std::string> n;
  for (const auto& c : s.constituents) n.push_back(c.name);
  return n;
}

TEST(TideFit, RecoversConstantsFromGappyNoiseFreeRecord) {
  const ConstituentSet truth = invented_site();
  const Record r = sample(truth, 380, 1800, 0.6, 0, 7);
  HarmonicFitOptions o;
  o.constituents = names_of(truth);
  const HarmonicFitResult fit = fit_harmonics(r.t, r.h, o, "synthetic");
  ASSERT_TRUE(fit.unresolved.empty());
  ASSERT_EQ(fit.constants.constituents.size(), truth.constituents.size());
  EXPECT_NEAR(fit.constants.z0_m, truth.z0_m, 1e-9);
  for (std::size_t j = 0; j < truth.constituents.size(); ++j) {
    const auto& got = fit.constants.constituents[j];
    EXPECT_EQ(got.name, truth.constituents[j].name);
    EXPECT_NEAR(got.amplitude_m, truth.constituents[j].amplitude_m, 1e-8) << got.name;
    EXPECT_NEAR(std::remainder(got.phase_deg - truth.constituents[j].phase_deg, 360.0), 0.0, 1e-5) << got.name;
  }
  EXPECT_LT(fit.constants.residual_std_m, 1e-8);
}

TEST(TideFit, RayleighCriterionFollowsRecordLength) {
  const ConstituentSet truth = invented_site();
  // 30 days: M2/S2 need 14.8 days, M2/N2 27.6, K1/P1 and S2/K2 182.6, Sa/Z0 365.2.
  const Record r = sample(truth, 30, 3600, 1.0, 0.01, 3);
  HarmonicFitOptions o;
  o.constituents = {"M2", "S2", "K1", "O1", "P1", "N2", "K2", "Sa"};
  const HarmonicFitResult fit = fit_harmonics(r.t, r.h, o, "gauge.csv");
  std::vector<std::string> fitted = names_of(fit.constants);
  EXPECT_EQ(fitted, (std::vector<std::string>{"M2", "S2", "K1", "O1", "N2"}));
  ASSERT_EQ(fit.unresolved.size(), 3u);
  EXPECT_EQ(fit.unresolved[0].name, "P1");
  EXPECT_EQ(fit.unresolved[0].conflicts_with, "K1");
  EXPECT_NEAR(fit.unresolved[0].needed_days, 182.6, 0.2);
  EXPECT_EQ(fit.unresolved[1].conflicts_with, "S2");  // K2
  EXPECT_EQ(fit.unresolved[2].conflicts_with, "Z0");  // Sa
  EXPECT_NEAR(fit.unresolved[2].needed_days, 365.24, 0.05);
}

TEST(TideFit, StandardErrorsMatchTheNoise) {
  // White noise sigma over n samples: se(H) ~ sigma sqrt(2/n) for each constituent.
  const ConstituentSet truth = invented_site();
  const Record r = sample(truth, 200, 3600, 0.7, 0.05, 11);
  HarmonicFitOptions o;
  o.constituents = {"M2", "S2", "N2", "K2", "K1", "O1", "P1", "Q1", "M4", "MS4", "Mf", "Sa"};
  const HarmonicFitResult fit = fit_harmonics(r.t, r.h, o, "synthetic");
  const double expected_se = 0.05 * std::sqrt(2.0 / static_cast<double>(r.t.size()));
  EXPECT_NEAR(fit.constants.residual_std_m, 0.05, 0.01);
  const auto& m2 = fit.constants.constituents[0];
  EXPECT_NEAR(m2.amplitude_se_m, expected_se, 0.3 * expected_se);
  EXPECT_NEAR(m2.phase_se_deg, expected_se / m2.amplitude_m * 180 / M_PI, 0.3 * expected_se / m2.amplitude_m * 57.3);
  EXPECT_NEAR(m2.amplitude_m, 0.81, 5 * expected_se);
}

TEST(TideFit, TooShortRecordIsAClearError) {
  // Under 3.1 hours even M8 (the fastest) is not one cycle away from the mean.
  const Record r = sample(invented_site(), 0.08, 600, 1.0, 0, 1);
  HarmonicFitOptions o;
  try {
    fit_harmonics(r.t, r.h, o, "gauge.csv");
    FAIL() << "expected an error";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("gauge.csv: a record of 0.08"), std::string::npos) << e.what();
    EXPECT_NE(std::string(e.what()).find("resolves no tidal constituent"), std::string::npos);
  }
  o.constituents = {"M2", "XX"};
  EXPECT_THROW(fit_harmonics(r.t, r.h, o, "gauge.csv"), InputError);
}

TEST(TideFit, FittedRateOfMeanLevel) {
  ConstituentSet truth = invented_site();
  truth.z0_rate_m_per_yr = 0.004;
  truth.z0_epoch_s = 1.6e9;
  const Record r = sample(truth, 3 * 365.25, 3 * 3600, 0.8, 0, 5);
  HarmonicFitOptions o;
  o.constituents = names_of(truth);
  o.fit_rate = true;
  const HarmonicFitResult fit = fit_harmonics(r.t, r.h, o, "synthetic");
  EXPECT_NEAR(fit.constants.z0_rate_m_per_yr, 0.004, 1e-8);
  // Predictions agree whatever epoch the fit chose.
  EXPECT_NEAR(TidePredictor(fit.constants).level_m(1.62e9), TidePredictor(truth).level_m(1.62e9), 1e-7);
}

}  // namespace
}  // namespace strandline::tide

namespace strandline::tide {
namespace {

TEST(TideFit, SamplingAliasedToTheMeanIsAClearError) {
  // One sample per M2 period: the M2 column is constant up to the slow nodal
  // drift, indistinguishable from the mean level.
  ConstituentSet s;
  s.constituents.push_back({"M2", 0.5, 10.0, kUnknown, kUnknown, std::nullopt});
  const TidePredictor p(s);
  const double period_s = 360.0 / speed_deg_per_h(*find_constituent("M2")) * 3600.0;
  std::vector<double> t, h;
  for (int k = 0; k < 120; ++k) {
    t.push_back(1.6e9 + k * period_s);
    h.push_back(p.level_m(t.back()));
  }
  HarmonicFitOptions o;
  o.constituents = {"M2"};
  try {
    fit_harmonics(t, h, o, "gauge.csv");
    FAIL() << "expected an error";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("do not determine"), std::string::npos) << e.what();
  }
}

}  // namespace
}  // namespace strandline::tide
