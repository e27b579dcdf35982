// Offsets between sensor families on generated sites with a known truth
// (tests/unit/offset_site.h): the estimate and its interval, the three modes,
// the offset's sigma term, the trend's interval after correction, the sensor
// table's offset columns and the per-sensor noise report.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <fstream>

#include "corrections/core/cleaned_row.h"
#include "corrections/core/errors.h"
#include "qc/sensor_offset_estimate.h"
#include "qc/summary.h"
#include "server/app/run_config.h"
#include "server/app/steps/step_list.h"
#include "tests/unit/offset_site.h"
#include "tests/unit/qc_series.h"

using namespace strandline;
using namespace strandline::offset_test;

namespace {

const FamilyOffset* site_estimate(const SiteTable& t, const std::string& family) {
  for (const auto& f : t.sensor_offsets.estimates)
    if (f.family == family) return &f;
  return nullptr;
}

bool covers(double low, double high, double v) { return low <= v && v <= high; }

bool is_sentinel(const SiteTable& t, std::size_t i) { return t.sensor_names[t.sensor[i]].rfind("sentinel2", 0) == 0; }

std::string write_temp(const std::string& name, const std::string& text) {
  const std::string path = ::testing::TempDir() + name;
  std::ofstream(path) << text;
  return path;
}

}  // namespace

TEST(SensorTableFamilies, BuiltInFamiliesAndOffsetColumns) {
  const SensorTable d = SensorTable::defaults();
  EXPECT_EQ(d.lookup("landsat9")->family, "landsat");
  EXPECT_EQ(d.lookup("sentinel2c")->family, "sentinel2");
  EXPECT_EQ(d.lookup("smallsat")->family, "smallsat");
  EXPECT_EQ(d.lookup("sentinel2a")->name, "moderate_resolution");  // class and family differ
  EXPECT_FALSE(d.has_offsets());
  const auto path = write_temp("offsets_ok.csv",
                               "sensor,class,sigma_m,family,offset_m,offset_sigma_m\n"
                               "landsat8,moderate_resolution,12,,,\n"
                               "sentinel2a,moderate_resolution,10,,15.5,0.4\n"
                               "planet_x,high_resolution,4,,-2,\n");
  const SensorTable t = SensorTable::from_csv_file(path);
  EXPECT_EQ(t.lookup("landsat8")->family, "landsat");
  EXPECT_TRUE(std::isnan(t.lookup("landsat8")->offset_m));
  EXPECT_DOUBLE_EQ(t.lookup("sentinel2a")->offset_m, 15.5);
  EXPECT_DOUBLE_EQ(t.lookup("sentinel2a")->offset_sigma_m, 0.4);
  EXPECT_EQ(t.lookup("planet_x")->family, "planet_x");  // no built-in family: its own
  EXPECT_TRUE(std::isnan(t.lookup("planet_x")->offset_sigma_m));
  EXPECT_TRUE(t.has_offsets());
}

TEST(SensorTableFamilies, BadOffsetRowsNameFileLineAndField) {
  struct Case {
    std::string text, field;
    std::int64_t line;
  };
  const std::vector<Case> cases = {
      {"sensor,class,sigma_m,offset_m\nlandsat8,m,12,\nsentinel2a,m,10,fifteen\n", "offset_m", 3},
      {"sensor,class,sigma_m,offset_m\nsentinel2a,m,10,900\n", "offset_m", 2},
      {"sensor,class,sigma_m,offset_m,offset_sigma_m\nsentinel2a,m,10,15,-1\n", "offset_sigma_m", 2},
      {"sensor,class,sigma_m,offset_m,offset_sigma_m\nsentinel2a,m,10,,1\n", "offset_sigma_m", 2},
      {"sensor,class,sigma_m,offset_sigma_m\nsentinel2a,m,10,1\n", "offset_sigma_m", 1},
  };
  for (std::size_t k = 0; k < cases.size(); ++k) {
    const auto path = write_temp("offsets_bad" + std::to_string(k) + ".csv", cases[k].text);
    try {
      SensorTable::from_csv_file(path);
      ADD_FAILURE() << "accepted case " << k;
    } catch (const InputError& e) {
      EXPECT_EQ(e.file, path) << k;
      EXPECT_EQ(e.line, cases[k].line) << k;
      EXPECT_EQ(e.field, cases[k].field) << k;
      EXPECT_NE(std::string(e.what()).find(path), std::string::npos) << e.what();
    }
  }
}

TEST(SensorOffsetEstimate, WeightedMeanOfBinDifferences) {
  // Four bins: delta = sum w d / sum w = (1*2 + 1*4 + 2*3 + 2*3) / 6 = 3.
  const std::vector<OffsetBin> bins = {{0, 2.0, 1.0, 1, 1}, {1, 4.0, 1.0, 1, 1}, {2, 3.0, 2.0, 1, 1}, {3, 3.0, 2.0, 1, 1}};
  const FamilyOffset f = estimate_family_offset(bins, "a", "b", 3);
  EXPECT_DOUBLE_EQ(f.offset_m, 3.0);
  // Residuals sqrt(w)(d - 3): -1, 1, 0, 0; lag-1 sum -1 -> rho clamped to 0, n_eff = 4.
  // s^2 = 2 / 3, se = sqrt(s^2 / 6) = 1/3; dof 3, t_{0.975,3} = 3.182446 (scipy.stats.t.ppf(0.975, 3)).
  EXPECT_NEAR(f.se_m, 1.0 / 3.0, 1e-12);
  EXPECT_NEAR(f.ci95_high_m - f.offset_m, 3.182446305284263 / 3.0, 1e-6);
  EXPECT_FALSE(f.significant() && f.ci95_low_m < 0);
  EXPECT_TRUE(std::isnan(estimate_family_offset(bins, "a", "b", 5).offset_m));  // too few bins
}

TEST(SensorOffsets, EstimateRecoversTheOffsetWithinItsInterval) {
  const Pipeline pipeline = configured_pipeline({{"threads", 1}});
  int site_covered = 0, transect_covered = 0, site_significant = 0, all_covered = 0, all_estimates = 0;
  double max_abs_error = 0;
  for (unsigned seed = 1; seed <= 40; ++seed) {
    OffsetSite site = make_offset_site(seed, 10, 15.0);
    OffsetInputs in;
    pipeline.run(site.table, in.inputs);
    const FamilyOffset* f = site_estimate(site.table, "sentinel2");
    ASSERT_NE(f, nullptr);
    EXPECT_EQ(f->reference_family, "landsat");
    site_covered += covers(f->ci95_low_m, f->ci95_high_m, 15.0);
    site_significant += f->significant();
    max_abs_error = std::max(max_abs_error, std::abs(f->offset_m - 15.0));
    ASSERT_EQ(site.table.transects[0].sensor_offsets.size(), 1u);
    const FamilyOffset& own = site.table.transects[0].sensor_offsets[0];
    transect_covered += covers(own.ci95_low_m, own.ci95_high_m, 15.0);
    for (const TransectInfo& t : site.table.transects)
      for (const FamilyOffset& e : t.sensor_offsets) all_covered += covers(e.ci95_low_m, e.ci95_high_m, 15.0), ++all_estimates;
  }
  std::printf("offset +15 m: site interval covers it in %d/40, transect 0's in %d/40, every transect's in %d/%d; "
              "site max |error| %.2f m\n",
              site_covered, transect_covered, all_covered, all_estimates, max_abs_error);
  EXPECT_GE(site_covered, 36);
  EXPECT_GE(transect_covered, 36);
  EXPECT_GE(all_covered, 0.9 * all_estimates);
  EXPECT_EQ(site_significant, 40);
}

TEST(SensorOffsets, SiteIntervalHoldsWhenImagesShareErrors) {
  // An 8 m error common to all transects of an image: transect estimates are then
  // correlated, and an inverse-variance combination of them would be too narrow;
  // pooling the bins first lets the scatter between bins carry it.
  const Pipeline pipeline = configured_pipeline({{"threads", 1}});
  int covered = 0, covered_iv = 0;
  double width = 0, width_iv = 0;
  for (unsigned seed = 201; seed <= 240; ++seed) {
    OffsetSite site = make_offset_site(seed, 10, 15.0, 12.0, 10.0, 8.0);
    OffsetInputs in;
    pipeline.run(site.table, in.inputs);
    const FamilyOffset* f = site_estimate(site.table, "sentinel2");
    ASSERT_NE(f, nullptr);
    covered += covers(f->ci95_low_m, f->ci95_high_m, 15.0);
    width += (f->ci95_high_m - f->ci95_low_m) / 40.0;
    // What the inverse-variance combination of the transects' own estimates would say.
    double sw = 0, swd = 0;
    for (const TransectInfo& t : site.table.transects)
      for (const FamilyOffset& e : t.sensor_offsets) sw += 1 / (e.se_m * e.se_m), swd += e.offset_m / (e.se_m * e.se_m);
    const double half_iv = 1.959963984540054 / std::sqrt(sw);  // Phi^-1(0.975)
    covered_iv += covers(swd / sw - half_iv, swd / sw + half_iv, 15.0);
    width_iv += 2 * half_iv / 40.0;
  }
  std::printf("shared image errors (8 m): site interval covers +15 m in %d/40, mean width %.2f m "
              "(inverse-variance combination of the transects: %d/40, width %.2f m)\n",
              covered, width, covered_iv, width_iv);
  EXPECT_GE(covered, 36);
}

TEST(SensorOffsets, NoOffsetIsRarelySignificant) {
  const Pipeline pipeline = configured_pipeline({{"threads", 1}});
  int covered = 0;
  for (unsigned seed = 101; seed <= 140; ++seed) {
    OffsetSite site = make_offset_site(seed, 10, 0.0);
    OffsetInputs in;
    pipeline.run(site.table, in.inputs);
    const FamilyOffset* f = site_estimate(site.table, "sentinel2");
    ASSERT_NE(f, nullptr);
    covered += covers(f->ci95_low_m, f->ci95_high_m, 0.0);
  }
  std::printf("no offset: site interval covers 0 in %d/40\n", covered);
  EXPECT_GE(covered, 36);
}

TEST(SensorOffsets, CorrectedTrendIntervalCoversTheTruth) {
  const Pipeline pipeline = configured_pipeline({{"threads", 1}});
  int covered = 0, covered_stat = 0;
  double mean_bias = 0;
  for (unsigned seed = 1; seed <= 40; ++seed) {
    OffsetSite site = make_offset_site(seed, 10, 15.0);
    OffsetInputs in;
    pipeline.run(site.table, in.inputs);
    const TransectSummary s = transect_summary(site.table, 0, in.inputs, SummaryOptions{});
    ASSERT_TRUE(s.trend && s.trend->sensor_offset_term && s.trend->sensor_offset_term->ci95_with_sensor_offsets_m_per_yr);
    const Interval& i = *s.trend->sensor_offset_term->ci95_with_sensor_offsets_m_per_yr;
    EXPECT_GT(s.trend->sensor_offset_term->offset_term_m_per_yr, 0.0);
    covered += covers(i.low, i.high, site.rate_m_per_yr[0]);
    covered_stat += covers(s.trend->ci95_m_per_yr->low, s.trend->ci95_m_per_yr->high, site.rate_m_per_yr[0]);
    mean_bias += (s.trend->rate_m_per_yr - site.rate_m_per_yr[0]) / 40.0;
    ASSERT_EQ(s.sensor_offsets.size(), 1u);
    EXPECT_TRUE(s.sensor_offsets[0].corrected);
  }
  std::printf("corrected trend: interval with the offset term covers the truth in %d/40 (statistical alone %d/40), "
              "mean rate bias %+.3f m/yr\n", covered, covered_stat, mean_bias);
  EXPECT_GE(covered, 36);
}

TEST(SensorOffsets, UncorrectedOffsetBendsTheTrendAndIsCautioned) {
  // The same sites with `none`: what the correction is for (and a check that the
  // generated offset matters at all).
  const Pipeline pipeline = configured_pipeline({{"threads", 1}});
  int covered = 0, cautioned = 0;
  double mean_bias = 0;
  for (unsigned seed = 1; seed <= 40; ++seed) {
    OffsetSite site = make_offset_site(seed, 10, 15.0);
    OffsetInputs in;
    in.inputs.sensor_offset_mode = SensorOffsetMode::none;
    pipeline.run(site.table, in.inputs);
    const TransectSummary s = transect_summary(site.table, 0, in.inputs, SummaryOptions{});
    covered += covers(s.trend->ci95_m_per_yr->low, s.trend->ci95_m_per_yr->high, site.rate_m_per_yr[0]);
    mean_bias += (s.trend->rate_m_per_yr - site.rate_m_per_yr[0]) / 40.0;
    bool c = false;
    for (const auto& text : s.cautions) c |= text.find("was not corrected") != std::string::npos;
    cautioned += c;
  }
  std::printf("uncorrected (none): trend interval covers the truth in %d/40, mean rate bias %+.2f m/yr, "
              "cautioned in %d/40\n", covered, mean_bias, cautioned);
  EXPECT_LE(covered, 4);
  EXPECT_EQ(cautioned, 40);
}

TEST(SensorOffsets, EstimateModeShiftsTheFamilyAndAddsItsSigma) {
  OffsetSite site = make_offset_site(7, 10, 15.0);
  OffsetInputs in;
  configured_pipeline({{"threads", 1}}).run(site.table, in.inputs);
  const SiteTable& t = site.table;
  const FamilyOffset* f = site_estimate(t, "sentinel2");
  ASSERT_TRUE(f && f->significant());
  EXPECT_EQ(t.sensor_offsets.applied_m.at("sentinel2a"), f->offset_m);
  EXPECT_FALSE(t.sensor_offsets.applied_m.count("landsat8"));
  for (std::size_t i = 0; i < t.size(); ++i) {
    if (is_sentinel(t, i)) {
      ASSERT_NEAR(t.chainage_m[i], t.chainage_raw_m[i] - f->offset_m, 1e-9);
      ASSERT_NEAR(t.correction_m[i], -f->offset_m, 1e-9);
      ASSERT_TRUE(has_flag(t.flags[i], Flag::sensor_offset_applied));
      // sigma_m: root-sum-square of the sensor, water-level and offset terms (slope sigma unknown).
      ASSERT_NEAR(t.sigma_m[i], std::sqrt(10.0 * 10.0 + 0.5 * 0.5 + f->se_m * f->se_m), 1e-9);
      const CleanedRow row = cleaned_row(t, i);  // the output columns of the shift and its term
      ASSERT_EQ(row.sensor_offset_m, f->offset_m);
      ASSERT_EQ(row.sigma_sensor_offset_m, f->se_m);
    } else {
      ASSERT_DOUBLE_EQ(t.chainage_m[i], t.chainage_raw_m[i]);
      ASSERT_FALSE(has_flag(t.flags[i], Flag::sensor_offset_applied));
      ASSERT_NEAR(t.sigma_m[i], std::hypot(12.0, 0.5), 1e-9);
      ASSERT_TRUE(std::isnan(cleaned_row(t, i).sensor_offset_m));
      ASSERT_TRUE(std::isnan(cleaned_row(t, i).sigma_sensor_offset_m));
    }
  }
  const TransectSummary s = transect_summary(t, 0, in.inputs, SummaryOptions{});
  for (const auto& c : s.cautions) EXPECT_EQ(c.find("not corrected"), std::string::npos) << c;
}

TEST(SensorOffsets, NoneLeavesPositionsButCautions) {
  OffsetSite site = make_offset_site(7, 10, 15.0);
  OffsetInputs in;
  in.inputs.sensor_offset_mode = SensorOffsetMode::none;
  configured_pipeline({{"threads", 1}}).run(site.table, in.inputs);
  const SiteTable& t = site.table;
  for (std::size_t i = 0; i < t.size(); ++i) {
    ASSERT_DOUBLE_EQ(t.chainage_m[i], t.chainage_raw_m[i]);
    ASSERT_TRUE(std::isnan(t.sensor_offset_m[i]));
  }
  EXPECT_TRUE(t.sensor_offsets.applied_m.empty());
  ASSERT_TRUE(site_estimate(t, "sentinel2")->significant());
  const TransectSummary s = transect_summary(t, 0, in.inputs, SummaryOptions{});
  bool cautioned = false;
  for (const auto& c : s.cautions) cautioned |= c.find("sensor family sentinel2 differs from landsat") == 0;
  EXPECT_TRUE(cautioned);
  EXPECT_FALSE(s.trend->sensor_offset_term);
  ASSERT_EQ(s.sensor_offsets.size(), 1u);
  EXPECT_FALSE(s.sensor_offsets[0].corrected);
}

TEST(SensorOffsets, GivenAppliesTheTableOffsets) {
  OffsetSite site = make_offset_site(7, 3, 15.0);
  OffsetInputs in;
  in.sensors.set_offset("sentinel2a", 14.0, 0.3);
  in.sensors.set_offset("sentinel2b", 16.0, kUnknown);  // sigma unknown: named, left out of sigma_m
  in.inputs.sensor_offset_mode = SensorOffsetMode::given;
  configured_pipeline({{"threads", 1}}).run(site.table, in.inputs);
  const SiteTable& t = site.table;
  for (std::size_t i = 0; i < t.size(); ++i) {
    const std::string& sensor = t.sensor_names[t.sensor[i]];
    const double shift = sensor == "sentinel2a" ? 14.0 : sensor == "sentinel2b" ? 16.0 : 0.0;
    ASSERT_NEAR(t.chainage_m[i], t.chainage_raw_m[i] - shift, 1e-9) << sensor;
    if (sensor == "sentinel2a") ASSERT_NEAR(t.sigma_m[i], std::sqrt(100.0 + 0.25 + 0.09), 1e-9);
    if (sensor == "sentinel2b") {
      ASSERT_TRUE(has_flag(t.flags[i], Flag::sigma_sensor_offset_unknown));
      ASSERT_NEAR(t.sigma_m[i], std::sqrt(100.0 + 0.25), 1e-9);
    }
  }
  // The estimate is still reported (on the positions before the shift).
  EXPECT_NEAR(site_estimate(t, "sentinel2")->offset_m, 15.0, 2.0);
  const TransectSummary s = transect_summary(t, 0, in.inputs, SummaryOptions{});
  ASSERT_TRUE(s.trend && s.trend->sensor_offset_term);
  EXPECT_TRUE(std::isnan(s.trend->sensor_offset_term->offset_term_m_per_yr));  // one sigma unknown
}

TEST(SensorOffsets, RunConfigurationKey) {
  const auto c = app::read_run_config({{"sensor_offsets", "none"}}, app::RunDefaults{});
  EXPECT_EQ(c.settings.sensor_offsets, SensorOffsetMode::none);
  EXPECT_EQ(c.effective["sensor_offsets"], "none");
  EXPECT_EQ(app::read_run_config(nlohmann::json::object(), app::RunDefaults{}).effective["sensor_offsets"], "estimate");
  try {
    app::read_run_config({{"sensor_offsets", "always"}}, app::RunDefaults{});
    ADD_FAILURE() << "accepted \"always\"";
  } catch (const ConfigError& e) {
    EXPECT_NE(std::string(e.what()).find("/sensor_offsets"), std::string::npos) << e.what();
  }
}

TEST(SensorNoiseReport, ScaledMadOfConsecutiveDifferences) {
  // landsat8 at 0, 3, 1, 6, 2, 2.5 (a rejected point and sentinel2a points between):
  // scipy.stats.median_abs_deviation(numpy.diff(x), scale='normal') / sqrt(2) = 2.6208952062688264.
  std::vector<qc_test::Obs> obs;
  const double x[] = {0, 3, 1, 6, 2, 2.5};
  for (int k = 0; k < 6; ++k) {
    obs.push_back({"A", "L" + std::to_string(k), "landsat8", 10.0 * k, x[k]});
    obs.push_back({"A", "S" + std::to_string(k), "sentinel2a", 10.0 * k + 5, 100.0 + k});
  }
  obs.push_back({"A", "L9", "landsat8", 33.0, 400.0});
  SiteTable t = qc_test::make_table(obs);
  t.add_flag(qc_test::row_of(t, obs.size() - 1), Flag::spike);
  OffsetInputs in;
  const auto report = sensor_noise_report(t, in.inputs);
  ASSERT_EQ(report.size(), 2u);
  EXPECT_EQ(report[0].sensor, "landsat8");
  EXPECT_EQ(report[0].n, 5u);
  EXPECT_NEAR(report[0].measured_sigma_m, 2.6208952062688264, 1e-12);
  EXPECT_EQ(report[0].stated_sigma_m, 12.0);
  EXPECT_EQ(report[0].family, "landsat");
  EXPECT_EQ(report[1].sensor, "sentinel2a");
  EXPECT_EQ(report[1].measured_sigma_m, 0.0);  // steps of exactly 1 m: no scatter
  const auto one = sensor_noise_report(t, 0, in.inputs);  // the transect's own report: the same here
  ASSERT_EQ(one.size(), 2u);
  EXPECT_EQ(one[0].measured_sigma_m, report[0].measured_sigma_m);
  EXPECT_EQ(one[0].n, report[0].n);
}

TEST(SensorNoiseReport, MeasuredScatterMatchesTheGeneratedSigma) {
  // Generated with Landsat 12 m and Sentinel-2 7 m while the table states 10 m for
  // Sentinel-2: the report shows the measured value beside the stated one. Every
  // point accepted (no QC filter: they trim the tails, see tests/bench/RESULTS.md).
  OffsetSite site = make_offset_site(3, 10, 0.0, 12.0, 7.0);
  site.table.reset_derived();
  site.table.chainage_m = site.table.chainage_raw_m;
  OffsetInputs in;
  const auto report = sensor_noise_report(site.table, in.inputs);
  ASSERT_EQ(report.size(), 4u);
  for (const SensorNoise& n : report) {
    const bool sentinel = n.sensor.rfind("sentinel2", 0) == 0;
    std::printf("%s: stated %.1f m, measured %.2f m from %zu differences\n", n.sensor.c_str(), n.stated_sigma_m,
                n.measured_sigma_m, n.n);
    EXPECT_EQ(n.stated_sigma_m, sentinel ? 10.0 : 12.0);
    EXPECT_GT(n.n, 1000u);
    // 7%: ~2.5 standard errors of a MAD scale (1.17 sigma / sqrt(n), Gaussian) from ~1,600 differences.
    EXPECT_NEAR(n.measured_sigma_m, sentinel ? 7.0 : 12.0, sentinel ? 0.49 : 0.84) << n.sensor;
  }
}
