// The whole wave chain with the slope estimated: water_level -> wave_conditions
// -> slope (spectral estimate) -> wave_terms -> correct, on a synthetic transect
// whose waterlines contain the wave term. With `setup` the search takes its
// closed form (0.35 sqrt(H0 L0) as a slope-free horizontal term), with `runup`
// the grid + refine path (regime re-checked at each slope); both recover the
// true slope and positions. Truth is written out from the published Stockdon et
// al. (2006) coefficients, independently of the engine.
#include <cmath>
#include <random>
#include <vector>

#include <gtest/gtest.h>

#include "corrections/steps/correct_step.h"
#include "corrections/steps/slope_step.h"
#include "corrections/steps/water_level_step.h"
#include "corrections/steps/wave_conditions_step.h"
#include "corrections/steps/wave_terms_step.h"
#include "corrections/water_level/gauge_series.h"
#include "corrections/waves/stockdon.h"
#include "corrections/waves/wave_record.h"

namespace strandline {
namespace {

constexpr double kTrueSlope = 0.05;
constexpr double kTwoPi = 6.283185307179586;
constexpr double kG = 9.80665;

struct Chain {
  SiteTable table;
  std::vector<double> truth_m;
  std::unique_ptr<GaugeSeries> gauge;
  std::unique_ptr<WaveRecord> waves;
  RunInputs inputs;
};

// 10 years of images every 8 days at 10:30 UTC, a mixed semidiurnal tide, storms
// up to Hs 5 m (deep-water record sampled at the image times), 2 m noise.
std::unique_ptr<Chain> make_chain(bool data_has_runup, WaveCorrection correction) {
  auto c = std::make_unique<Chain>();
  std::mt19937_64 rng(7);
  std::normal_distribution<double> noise(0.0, 2.0);
  const double t0 = 946722600.0;  // 2000-01-01T10:30:00Z
  std::vector<TimeS> times;
  std::vector<double> levels;
  std::vector<WaveSample> sea;
  SiteTableBuilder b;
  const auto tr = b.transect_index("T01");
  const auto sensor = b.sensor_index("S2");
  std::uint32_t row = 0;
  for (int d = 0; d < 3650; d += 8) {
    const double t = t0 + d * 86400.0;
    const double hours = (t - t0) / 3600.0;
    const double tide = 1.6 * std::cos(kTwoPi * hours / 12.4206012) + 0.6 * std::cos(kTwoPi * hours / 12.0 + 0.7) +
                        0.3 * std::cos(kTwoPi * hours / 23.934470 + 1.9);
    const double hs = 1.2 + 1.0 * std::sin(kTwoPi * d / 365.25) + 2.8 * std::pow(std::sin(kTwoPi * d / 47.0), 8);
    const double tp = 9.0 + 3.0 * std::sin(kTwoPi * d / 61.0);
    const double l0 = kG * tp * tp / kTwoPi;
    const double q = std::sqrt(hs * l0);
    const double xi = kTrueSlope / std::sqrt(hs / l0);
    // Stockdon et al. (2006): eq. 10, or eq. 16 on a dissipative beach.
    const double setup = xi < 0.3 ? 0.016 * q : 0.35 * kTrueSlope * q;
    const double r2 = xi < 0.3 ? 0.043 * q : 1.1 * (setup + 0.5 * std::hypot(0.75 * kTrueSlope * q, 0.06 * q));
    const double truth = 200.0 + 1.5 * d / 365.25 + 10.0 * std::cos(kTwoPi * d / 365.25);
    const double raw = truth - (tide + (data_has_runup ? r2 : setup)) / kTrueSlope + noise(rng);
    times.push_back(t);
    levels.push_back(tide);
    sea.push_back({t, hs, tp, 250.0, kUnknown});
    b.add(tr, b.image_index("img" + std::to_string(d)), sensor, {row++, t, raw});
    c->truth_m.push_back(truth);
  }
  c->gauge = std::make_unique<GaugeSeries>(times, levels, 0.05);
  c->waves = std::make_unique<WaveRecord>(sea);
  c->table = std::move(b).build();
  c->table.transects[0].z_ref_m = 0.0;
  c->inputs.water_levels = c->gauge.get();
  c->inputs.waves = c->waves.get();
  c->inputs.wave_correction = correction;
  c->inputs.slopes.estimate = true;
  std::vector<std::unique_ptr<Step>> steps;
  steps.push_back(WaterLevelStep::make(nullptr, "/steps/water_level"));
  steps.push_back(WaveConditionsStep::make(nullptr, "/steps/wave_conditions"));
  steps.push_back(SlopeStep::make({{"bootstrap_count", 20}}, "/steps/slope"));
  steps.push_back(WaveTermsStep::make(nullptr, "/steps/wave_terms"));
  steps.push_back(CorrectStep::make(nullptr, "/steps/correct"));
  for (const auto& step : steps) {
    StepLog log;
    static_cast<const TransectStep&>(*step).run(c->table, 0, c->inputs, log);
  }
  return c;
}

double rms_against_truth(const Chain& c) {
  double sum = 0;
  for (std::size_t i = 0; i < c.table.size(); ++i) sum += std::pow(c.table.chainage_m[i] - c.truth_m[i], 2);
  return std::sqrt(sum / c.table.size());
}

TEST(WaveSlopeStep, SetupTakesTheClosedFormAndRecoversSlopeAndPositions) {
  const auto c = make_chain(false, WaveCorrection::setup);
  const TransectInfo& t = c->table.transects[0];
  ASSERT_EQ(t.slope_source, SlopeSource::estimated) << t.slope_details.dump();
  EXPECT_EQ(t.slope_details["method"], "closed_form");
  EXPECT_NEAR(t.slope, kTrueSlope, 0.03 * kTrueSlope);
  EXPECT_LT(rms_against_truth(*c), 3.0);  // the 2 m noise and a slope error of a few percent
}

TEST(WaveSlopeStep, RunupTakesTheGridPathAndRecoversSlopeAndPositions) {
  const auto c = make_chain(true, WaveCorrection::runup);
  const TransectInfo& t = c->table.transects[0];
  ASSERT_EQ(t.slope_source, SlopeSource::estimated) << t.slope_details.dump();
  EXPECT_EQ(t.slope_details["method"], "grid_refine");
  EXPECT_NEAR(t.slope, kTrueSlope, 0.03 * kTrueSlope);
  // Both regimes occur at the found slope.
  int dissipative = 0;
  for (std::size_t i = 0; i < c->table.size(); ++i)
    dissipative += t.slope / std::sqrt(c->table.hs0_m[i] / c->table.l0_m[i]) < 0.3;
  EXPECT_GT(dissipative, 10);
  EXPECT_LT(dissipative, static_cast<int>(c->table.size()) - 10);
  EXPECT_LT(rms_against_truth(*c), 4.0);
}

TEST(WaveSlopeStep, GridPathAgreesWithClosedFormForSetup) {
  // The same setup correction through the grid + refine path of the searcher,
  // with each image's regime decided at every candidate slope, finds the minimum
  // the closed form reaches by classifying images at its estimate until the classes stand.
  const auto c = make_chain(false, WaveCorrection::setup);
  const SiteTable& table = c->table;
  const auto step = SlopeStep::make({{"bootstrap_count", 20}}, "/steps/slope");
  const auto& slope_step = static_cast<const SlopeStep&>(*step);
  std::vector<double> times, x, w;
  for (std::size_t i = 0; i < table.size(); ++i) {
    times.push_back(table.time_s[i]);
    x.push_back(table.chainage_raw_m[i]);
    w.push_back(table.water_level_m[i]);
  }
  spectral::CorrectedSeriesFn corrected = [&](double tan_beta, std::span<double> out) {
    for (std::size_t i = 0; i < x.size(); ++i)
      out[i] = x[i] + (w[i] + stockdon_terms(table.hs0_m[i], table.l0_m[i], tan_beta).setup_m) / tan_beta;
  };
  auto options = slope_step.search_options(0.01, 0.2);
  options.seed = transect_seed(options.seed, "T01");
  const auto grid = slope_step.searcher().estimate(times, w, corrected, options);
  EXPECT_EQ(grid.method, "grid_refine");
  EXPECT_NEAR(grid.tan_beta, table.transects[0].slope, 1e-4 * table.transects[0].slope);
}

TEST(WaveSlopeStep, IgnoringTheWaveTermLeavesTheBias) {
  // Runup in the data, corrected with `none`: the slope is still found (the wave
  // term is not tidal), the positions are biased landward by R2%/tan(beta).
  const auto c = make_chain(true, WaveCorrection::none);
  const TransectInfo& t = c->table.transects[0];
  ASSERT_EQ(t.slope_source, SlopeSource::estimated);
  double mean_bias = 0, mean_expected = 0;
  for (std::size_t i = 0; i < c->table.size(); ++i) {
    mean_bias += c->table.chainage_m[i] - c->truth_m[i];
    mean_expected -= c->table.runup_m[i] / t.slope;
  }
  EXPECT_LT(mean_bias / c->table.size(), -10.0);
  EXPECT_NEAR(mean_bias / c->table.size(), mean_expected / c->table.size(), 1.5);
}

}  // namespace
}  // namespace strandline
