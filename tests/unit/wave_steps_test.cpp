// The wave steps on synthetic transects whose raw waterlines contain the wave
// setup (or R2%): with the matching correction the true positions come back,
// with `none` the bias is the setup's horizontal term 0.35 sqrt(H0 L0).
// Truth is computed here independently of the engine: deep-water records
// (no deshoaling), the published Stockdon et al. (2006) coefficients written out.
#include <algorithm>
#include <cmath>
#include <random>
#include <vector>

#include <gtest/gtest.h>

#include "server/app/steps/step_list.h"
#include "corrections/core/errors.h"
#include "corrections/engine/pipeline.h"
#include "corrections/steps/correct_step.h"
#include "corrections/steps/slope_step.h"
#include "corrections/steps/water_level_step.h"
#include "corrections/steps/wave_conditions_step.h"
#include "corrections/steps/wave_terms_step.h"
#include "corrections/water_level/gauge_series.h"
#include "corrections/waves/linear_waves.h"
#include "corrections/waves/wave_record.h"
#include "qc/uncertainty_step.h"

namespace strandline {
namespace {

constexpr double kSlope = 0.04;
constexpr double kZref = 0.0;
constexpr double kG = 9.80665;
constexpr double kTwoPi = 6.283185307179586;

double true_position_m(double t_s) { return 120.0 + 6.0 * std::sin(kTwoPi * t_s / (365.25 * 86400.0)); }
double tide_m(double t_s) { return 1.2 * std::cos(kTwoPi * t_s / (12.4206 * 3600.0)); }
// Storms: Hs from 0.4 m to about 4.4 m, Tp 7 to 15 s.
double hs_m(double t_s) { return 2.4 + 2.0 * std::sin(kTwoPi * t_s / (9.3 * 86400.0)); }
double tp_s(double t_s) { return 11.0 + 4.0 * std::sin(kTwoPi * t_s / (13.7 * 86400.0) + 1.0); }

struct Truth {
  double setup_m, runup_m;
};
Truth stockdon_truth(double hs, double tp, double slope) {
  const double l0 = kG * tp * tp / kTwoPi;
  const double q = std::sqrt(hs * l0);
  const double setup = 0.35 * slope * q;  // eq. 10
  const double xi = slope / std::sqrt(hs / l0);
  const double swash = q * std::sqrt(0.563 * slope * slope + 0.004);  // Stockdon et al. (2006) eq. 19 as printed
  // Dissipative (xi0 < 0.3): setup 0.016 q (eq. 16), R2% 0.043 q (eq. 18).
  return {xi < 0.3 ? 0.016 * q : setup, xi < 0.3 ? 0.043 * q : 1.1 * (setup + swash / 2)};
}

struct Scenario {
  SiteTable table;
  std::vector<double> truth_x;
  std::unique_ptr<GaugeSeries> gauge;
  std::unique_ptr<WaveRecord> waves;
  RunInputs inputs;
};

// One transect, images every 37 hours (on whole hours, so both records are
// sampled exactly); the waterline seen sits at tide + `term` (setup or R2%).
// `gap_hours`: a hole in the wave record (no samples) starting at day 20.
std::unique_ptr<Scenario> make_scenario(bool data_has_runup, double gap_hours = 0, double record_depth_m = kUnknown) {
  auto s = std::make_unique<Scenario>();
  const double t0 = 1.6e9 - std::fmod(1.6e9, 3600.0);
  std::vector<TimeS> gauge_t;
  std::vector<double> gauge_z;
  std::vector<WaveSample> wave_samples;
  const int hours = 24 * 200;
  for (int h = 0; h <= hours; ++h) {
    const double t = t0 + h * 3600.0;
    gauge_t.push_back(t);
    gauge_z.push_back(tide_m(t));
    const bool in_gap = gap_hours > 0 && h > 24 * 20 && h < 24 * 20 + gap_hours;
    if (!in_gap) {
      // A nearshore record holds the shoaled height of the deep-water truth.
      const double ks = known(record_depth_m) ? linear_wave(tp_s(t), record_depth_m).shoaling_coefficient : 1.0;
      wave_samples.push_back({t, hs_m(t) * ks, tp_s(t), 280.0, record_depth_m});
    }
  }
  s->gauge = std::make_unique<GaugeSeries>(gauge_t, gauge_z, 0.05);
  s->waves = std::make_unique<WaveRecord>(wave_samples);

  SiteTableBuilder b;
  const auto tr = b.transect_index("T01");
  const auto sensor = b.sensor_index("S2");
  std::uint32_t row = 0;
  for (int h = 5; h < hours; h += 37) {
    const double t = t0 + h * 3600.0;
    const Truth w = stockdon_truth(hs_m(t), tp_s(t), kSlope);
    const double level = tide_m(t) + (data_has_runup ? w.runup_m : w.setup_m);
    const double raw = true_position_m(t) - (level - kZref) / kSlope;
    b.add(tr, b.image_index("img" + std::to_string(h)), sensor, {row++, t, raw});
  }
  s->table = std::move(b).build();
  for (std::size_t i = 0; i < s->table.size(); ++i) s->truth_x.push_back(true_position_m(s->table.time_s[i]));
  s->inputs.reference_elevation_m = kZref;
  s->inputs.water_levels = s->gauge.get();
  s->inputs.waves = s->waves.get();
  s->inputs.slopes.all = SlopeValue{kSlope, 0.005};
  return s;
}

void run_steps(Scenario& s, WaveCorrection correction) {
  s.inputs.wave_correction = correction;
  s.table.reset_derived();
  s.table.transects[0].z_ref_m = kZref;
  std::vector<std::unique_ptr<Step>> steps;
  steps.push_back(WaterLevelStep::make(nullptr, "/steps/water_level"));
  steps.push_back(WaveConditionsStep::make(nullptr, "/steps/wave_conditions"));
  steps.push_back(SlopeStep::make(nullptr, "/steps/slope"));
  steps.push_back(WaveTermsStep::make(nullptr, "/steps/wave_terms"));
  steps.push_back(CorrectStep::make(nullptr, "/steps/correct"));
  steps.push_back(UncertaintyStep::make(nullptr, "/steps/uncertainty"));
  for (const auto& step : steps) {
    StepLog log;
    static_cast<const TransectStep&>(*step).run(s.table, 0, s.inputs, log);
  }
}

TEST(WaveSteps, SetupCorrectionRecoversPositions) {
  auto s = make_scenario(false);
  run_steps(*s, WaveCorrection::setup);
  const SiteTable& t = s->table;
  ASSERT_GT(t.size(), 100u);
  for (std::size_t i = 0; i < t.size(); ++i) {
    const Truth w = stockdon_truth(hs_m(t.time_s[i]), tp_s(t.time_s[i]), kSlope);
    EXPECT_NEAR(t.setup_m[i], w.setup_m, 1e-12);
    EXPECT_NEAR(t.runup_m[i], w.runup_m, 1e-12);
    EXPECT_DOUBLE_EQ(t.wave_level_m[i], t.setup_m[i]);
    EXPECT_DOUBLE_EQ(t.wave_sigma_m[i], 0.38);
    EXPECT_NEAR(t.chainage_m[i], s->truth_x[i], 1e-9);
    EXPECT_FALSE(has_flag(t.flags[i], Flag::no_wave_data));
  }
}

TEST(WaveSteps, NoCorrectionLeavesTheSetupBias) {
  auto s = make_scenario(false);
  run_steps(*s, WaveCorrection::none);
  const SiteTable& t = s->table;
  double mean_bias = 0, mean_expected = 0;
  for (std::size_t i = 0; i < t.size(); ++i) {
    // The setup left in: 0.35 sqrt(H0 L0) horizontally, 0.016 sqrt(H0 L0) / tan(beta) when dissipative.
    const double expected_bias = -stockdon_truth(hs_m(t.time_s[i]), tp_s(t.time_s[i]), kSlope).setup_m / kSlope;
    EXPECT_NEAR(t.chainage_m[i] - s->truth_x[i], expected_bias, 1e-9);
    EXPECT_EQ(t.wave_level_m[i], 0.0);
    EXPECT_TRUE(known(t.setup_m[i]));  // filled whenever waves are given
    mean_bias += t.chainage_m[i] - s->truth_x[i];
    mean_expected += expected_bias;
  }
  mean_bias /= t.size();
  mean_expected /= t.size();
  EXPECT_NEAR(mean_bias, mean_expected, 1e-9);
  EXPECT_LT(mean_bias, -5.0);  // Hs 0.4-4.4 m on a 1:25 beach: metres to tens of metres landward
}

TEST(WaveSteps, RunupCorrectionRecoversPositionsInBothRegimes) {
  auto s = make_scenario(true);
  run_steps(*s, WaveCorrection::runup);
  const SiteTable& t = s->table;
  int dissipative = 0;
  for (std::size_t i = 0; i < t.size(); ++i) {
    const double l0 = kG * std::pow(tp_s(t.time_s[i]), 2) / kTwoPi;
    dissipative += kSlope / std::sqrt(hs_m(t.time_s[i]) / l0) < 0.3;
    EXPECT_DOUBLE_EQ(t.wave_level_m[i], t.runup_m[i]);
    EXPECT_NEAR(t.chainage_m[i], s->truth_x[i], 1e-9);
  }
  EXPECT_GT(dissipative, 5);
  EXPECT_LT(dissipative, static_cast<int>(t.size()) - 5);
}

TEST(WaveSteps, SetupCorrectionOfRunupDataLeavesTheSwashPart) {
  auto s = make_scenario(true);
  run_steps(*s, WaveCorrection::setup);
  const SiteTable& t = s->table;
  for (std::size_t i = 0; i < t.size(); ++i)
    EXPECT_NEAR(t.chainage_m[i] - s->truth_x[i], -(t.runup_m[i] - t.setup_m[i]) / kSlope, 1e-9);
}

TEST(WaveSteps, NearshoreRecordIsDeshoaled) {
  auto s = make_scenario(false, 0, 12.0);
  run_steps(*s, WaveCorrection::setup);
  const SiteTable& t = s->table;
  for (std::size_t i = 0; i < t.size(); ++i) {
    EXPECT_NEAR(t.hs0_m[i], hs_m(t.time_s[i]), 1e-9);
    EXPECT_NEAR(t.chainage_m[i], s->truth_x[i], 1e-7);
  }
}

TEST(WaveSteps, GapInWaveRecordFlagsAndLeavesTermsEmpty) {
  for (auto mode : {WaveCorrection::setup, WaveCorrection::none, WaveCorrection::runup}) {
    auto s = make_scenario(false, 30.0);
    run_steps(*s, mode);
    const SiteTable& t = s->table;
    int flagged = 0;
    for (std::size_t i = 0; i < t.size(); ++i) {
      if (!has_flag(t.flags[i], Flag::no_wave_data)) continue;
      ++flagged;
      for (double v : {t.hs0_m[i], t.l0_m[i], t.setup_m[i], t.runup_m[i], t.wave_level_m[i], t.wave_sigma_m[i],
                       t.sigma_wave_m[i]})
        EXPECT_FALSE(known(v));
      // Tide-only correction kept, with the warning.
      EXPECT_NEAR(t.chainage_m[i], t.chainage_raw_m[i] + (t.water_level_m[i] - kZref) / kSlope, 1e-9);
      EXPECT_TRUE(t.accepted(i));
    }
    EXPECT_GE(flagged, 1) << wave_correction_name(mode);
  }
}

TEST(WaveSteps, WithoutWaveRecordWaveColumnsStayEmpty) {
  auto s = make_scenario(false);
  s->inputs.waves = nullptr;
  run_steps(*s, WaveCorrection::setup);
  const SiteTable& t = s->table;
  for (std::size_t i = 0; i < t.size(); ++i) {
    EXPECT_FALSE(known(t.hs0_m[i]));
    EXPECT_FALSE(known(t.setup_m[i]));
    EXPECT_FALSE(known(t.wave_level_m[i]));
    EXPECT_FALSE(has_flag(t.flags[i], Flag::no_wave_data));
  }
}

TEST(WaveSteps, UncertaintyCarriesScatterAndRunupSlopeSensitivity) {
  auto s = make_scenario(true);
  run_steps(*s, WaveCorrection::runup);
  const SiteTable& t = s->table;
  for (std::size_t i = 0; i < t.size(); ++i) {
    EXPECT_NEAR(t.sigma_wave_m[i], 0.38 / kSlope, 1e-12);
    // Independent slope sensitivity: numerical derivative of R2%/beta written out here.
    const double hs = hs_m(t.time_s[i]), tp = tp_s(t.time_s[i]);
    const double db = 1e-7;
    const double d_shift = ((t.water_level_m[i] - kZref + stockdon_truth(hs, tp, kSlope + db).runup_m) / (kSlope + db) -
                            (t.water_level_m[i] - kZref + stockdon_truth(hs, tp, kSlope - db).runup_m) / (kSlope - db)) /
                           (2 * db);
    EXPECT_NEAR(t.sigma_slope_m[i], 0.005 * std::abs(d_shift), 1e-4 * std::max(1.0, t.sigma_slope_m[i]));
  }
  // With `setup` the general setup's horizontal term is slope-free: the tide alone sets the
  // slope term; a dissipative image's setup (0.016 q, a level) adds to it.
  run_steps(*s, WaveCorrection::setup);
  std::size_t dissipative = 0;
  for (std::size_t i = 0; i < t.size(); ++i) {
    const double hs = hs_m(t.time_s[i]), tp = tp_s(t.time_s[i]);
    const bool level_term = kSlope / std::sqrt(hs / (kG * tp * tp / kTwoPi)) < 0.3;
    dissipative += level_term ? 1 : 0;
    const double c = level_term ? stockdon_truth(hs, tp, kSlope).setup_m : 0.0;
    EXPECT_NEAR(t.sigma_slope_m[i], 0.005 * std::abs(t.water_level_m[i] - kZref + c) / (kSlope * kSlope), 1e-9);
  }
  EXPECT_GT(dissipative, 0u);
  EXPECT_LT(dissipative, t.size());
}

TEST(WaveSteps, SigmaIsTheRootSumSquareOfItsTermsWaveTermIncluded) {
  // sigma_m = sqrt(sensor^2 + water level^2 + slope^2 + wave^2) (independent terms), with the
  // wave term written out here: 0.38 m (Stockdon et al. 2006 R2% rms error) over tan beta.
  for (auto mode : {WaveCorrection::setup, WaveCorrection::runup}) {
    auto s = make_scenario(true);
    run_steps(*s, mode);
    const SiteTable& t = s->table;
    for (std::size_t i = 0; i < t.size(); ++i) {
      const double wave = 0.38 / kSlope;
      double others2 = 0;  // an unknown term is left out (and flagged) by the step
      for (double term : {t.sigma_sensor_m[i], t.sigma_water_level_m[i], t.sigma_slope_m[i]})
        if (known(term)) others2 += term * term;
      ASSERT_TRUE(known(t.sigma_wave_m[i])) << wave_correction_name(mode);
      EXPECT_NEAR(t.sigma_wave_m[i], wave, 1e-12);
      EXPECT_NEAR(t.sigma_m[i], std::sqrt(others2 + wave * wave), 1e-9) << wave_correction_name(mode) << " row " << i;
      EXPECT_GT(t.sigma_m[i] - std::sqrt(others2), 0.5) << "the wave term is in sigma_m";
    }
  }
}

TEST(WaveSteps, SigmaMatchesAMonteCarloSpreadOfTheCorrection) {
  // Monte Carlo propagation (JCGM 101:2008, GUM Supplement 1): draw the water
  // level, the slope and the wave term from their stated sigmas, apply the
  // correction written out here (x = raw + (eta - z_ref + term(beta)) / beta,
  // R2% from stockdon_truth above), and compare the spread with sigma_m less its
  // sensor term (the sensor error adds to the position unchanged). Slope sigma
  // 2.5% of the slope: the linearised sigma then agrees to well under 2%.
  for (auto mode : {WaveCorrection::setup, WaveCorrection::runup}) {
    auto s = make_scenario(true);
    s->inputs.slopes.all = SlopeValue{kSlope, 0.001};
    run_steps(*s, mode);
    const SiteTable& t = s->table;
    std::mt19937_64 rng(20261203);
    std::normal_distribution<double> unit(0.0, 1.0);
    std::size_t compared = 0;
    for (std::size_t i = 0; i < t.size(); i += 7) {
      const double sensor = known(t.sigma_sensor_m[i]) ? t.sigma_sensor_m[i] : 0.0;
      const double linear = std::sqrt(t.sigma_m[i] * t.sigma_m[i] - sensor * sensor);
      const double eta = t.water_level_m[i], sigma_eta = t.water_level_sigma_m[i];
      const double hs = hs_m(t.time_s[i]), tp = tp_s(t.time_s[i]);
      // Where 4 slope sigmas reach across xi0 = 0.3, R2% jumps between eq. 18 and
      // eq. 19 and no linearised sigma can follow: such rows are not compared.
      auto xi0 = [&](double beta) { return beta / std::sqrt(hs / (kG * tp * tp / kTwoPi)); };
      if (mode == WaveCorrection::runup && (xi0(kSlope - 0.004) < 0.3) != (xi0(kSlope + 0.004) < 0.3)) continue;
      ++compared;
      const int draws = 100000;
      double sum = 0, sum2 = 0;
      for (int k = 0; k < draws; ++k) {
        const double beta = kSlope + 0.001 * unit(rng);
        const double level = eta + sigma_eta * unit(rng);
        const Truth w = stockdon_truth(hs, tp, beta);
        const double term = (mode == WaveCorrection::runup ? w.runup_m : w.setup_m) + 0.38 * unit(rng);
        const double shift = (level - kZref + term) / beta;
        sum += shift;
        sum2 += shift * shift;
      }
      const double mean = sum / draws;
      const double spread = std::sqrt(sum2 / draws - mean * mean);
      EXPECT_NEAR(linear, spread, 0.02 * spread) << wave_correction_name(mode) << " row " << i;
    }
    EXPECT_GE(compared, 5u) << wave_correction_name(mode);
  }
}

}  // namespace
}  // namespace strandline

namespace strandline {
namespace {

TEST(WaveSteps, RegisteredAroundTheSlopeStep) {
  const auto names = default_pipeline().step_names();
  auto position = [&](const std::string& n) { return std::find(names.begin(), names.end(), n) - names.begin(); };
  ASSERT_LT(position("wave_conditions"), static_cast<long>(names.size()));
  ASSERT_LT(position("wave_terms"), static_cast<long>(names.size()));
  EXPECT_LT(position("water_level"), position("wave_conditions"));
  EXPECT_LT(position("wave_conditions"), position("slope"));
  EXPECT_LT(position("slope"), position("wave_terms"));
  EXPECT_LT(position("wave_terms"), position("correct"));
}

TEST(WaveSteps, ParametersAreCheckedWithTheirPointer) {
  try {
    configured_pipeline({{"steps", {{"wave_terms", {{"runup_sigma_m", -1}}}}}});
    FAIL() << "negative sigma accepted";
  } catch (const ConfigError& e) {
    EXPECT_EQ(e.pointer, "/steps/wave_terms/runup_sigma_m");
  }
  try {
    configured_pipeline({{"steps", {{"wave_conditions", {{"max_gap_hours", 3}}}}}});
    FAIL() << "unknown key accepted";
  } catch (const ConfigError& e) {
    EXPECT_EQ(e.pointer, "/steps/wave_conditions/max_gap_hours");
  }
  const Pipeline p = configured_pipeline({{"steps", {{"wave_conditions", {{"max_gap_s", 7200}}}}}});
  EXPECT_EQ(p.config()["steps"]["wave_conditions"]["max_gap_s"], 7200.0);
}

}  // namespace
}  // namespace strandline
