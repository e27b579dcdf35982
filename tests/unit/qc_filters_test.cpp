// Each QC filter alone on hand-made series with known answers.
#include <gtest/gtest.h>

#include <cmath>
#include <functional>
#include <numbers>

#include "corrections/core/errors.h"
#include "qc/alongshore_step.h"
#include "qc/despike_step.h"
#include "qc/hampel_step.h"
#include "qc/image_misregistration_step.h"
#include "qc/image_quality_step.h"
#include "qc/implausible_rate_step.h"
#include "qc/robust_stats.h"
#include "qc/sparse_period_step.h"
#include "qc/storm_response_step.h"
#include "tests/unit/qc_series.h"

using namespace strandline;
using namespace strandline::qc_test;

namespace {

// One transect, one image every `step_days`, a seasonal swing plus +-noise_m.
std::vector<Obs> series(std::size_t n, double step_days, double noise_m, const std::string& transect = "T1") {
  std::vector<Obs> obs;
  for (std::size_t k = 0; k < n; ++k) {
    const double day = k * step_days;
    obs.push_back({transect, "img" + std::to_string(k), "landsat8", day,
                   200 + 8 * std::cos(2 * std::numbers::pi * day / 365.25) + noise_m * wobble(k)});
  }
  return obs;
}

std::size_t count_flag(const SiteTable& t, Flag f) {
  std::size_t n = 0;
  for (auto s : t.flags) n += has_flag(s, f) ? 1 : 0;
  return n;
}

class StepWaves final : public WaveSource {
 public:
  StepWaves(TimeS storm_from, TimeS storm_to) : from_(storm_from), to_(storm_to) {}
  std::optional<WaveAt> at(TimeS t, double) const override {
    WaveAt w;
    w.hs_m = (t >= from_ && t <= to_) ? 5.0 : 1.0;
    w.tp_s = 10;
    return w;
  }
  nlohmann::json describe() const override { return "step waves"; }

 private:
  TimeS from_, to_;
};

}  // namespace

TEST(QcImageQuality, ThresholdsAndUnknownMetadata) {
  auto table = make_table({{"T1", "a", "landsat8", 0, 100, 0.9, 5},
                           {"T1", "b", "landsat8", 10, 100, 0.3, 20},
                           {"T1", "c", "landsat8", 20, 100, kUnknown, kUnknown},
                           {"T1", "d", "landsat8", 30, 100, 0.75, 15}});
  auto step = ImageQualityStep::make(nullptr, "/steps/image_quality");
  run_transect_step(*step, table, RunInputs{});
  EXPECT_TRUE(has_flag(table.flags[row_of(table, 0)], Flag::cloudy_image));
  EXPECT_FALSE(has_flag(table.flags[row_of(table, 0)], Flag::poor_georeference));
  EXPECT_TRUE(has_flag(table.flags[row_of(table, 1)], Flag::poor_georeference));
  EXPECT_EQ(table.flags[row_of(table, 2)], 0u) << "unknown metadata never rejects";
  EXPECT_EQ(table.flags[row_of(table, 3)], 0u) << "limits are inclusive";
  EXPECT_THROW(ImageQualityStep::make({{"cloud_fraction_max", 1.5}}, "/steps/image_quality"), ConfigError);
  EXPECT_THROW(ImageQualityStep::make({{"cloud_max", 0.5}}, "/steps/image_quality"), ConfigError);
}

TEST(QcDespike, SpikesBothWaysButNotSteps) {
  auto obs = series(80, 8, 3);
  obs[20].chainage_m += 60;  // seaward spike
  obs[40].chainage_m -= 45;  // landward spike
  for (std::size_t k = 60; k < 80; ++k) obs[k].chainage_m -= 40;  // a lasting step: not a spike
  auto table = make_table(obs);
  run_transect_step(*DespikeStep::make(nullptr, "/steps/despike"), table, RunInputs{});
  EXPECT_TRUE(has_flag(table.flags[row_of(table, 20)], Flag::spike));
  EXPECT_TRUE(has_flag(table.flags[row_of(table, 40)], Flag::spike));
  EXPECT_EQ(count_flag(table, Flag::spike), 2u);
}

TEST(QcDespike, StormResponsePointsAreLeftAlone) {
  auto obs = series(40, 8, 3);
  obs[20].chainage_m -= 50;
  auto table = make_table(obs);
  table.add_flag(row_of(table, 20), Flag::storm_response);
  run_transect_step(*DespikeStep::make(nullptr, "/steps/despike"), table, RunInputs{});
  EXPECT_EQ(count_flag(table, Flag::spike), 0u);
}

TEST(QcHampel, FlagsGrossPointsOnlyAndMadConstant) {
  // 1.4826 = 1/Phi^-1(3/4); Phi^-1(3/4) = 0.6744897501960817 (recalled from memory;
  // scipy.stats.norm.ppf check in tests/reference/check_trend.py).
  EXPECT_NEAR(kMadToSigma, 1.0 / 0.6744897501960817, 1e-12);
  auto obs = series(300, 5, 4);
  obs[50].chainage_m += 45;
  obs[51].chainage_m += 50;  // two in a row: despike cannot see these, Hampel can
  obs[200].chainage_m -= 42;
  auto table = make_table(obs);
  run_transect_step(*HampelStep::make(nullptr, "/steps/hampel"), table, RunInputs{});
  EXPECT_TRUE(has_flag(table.flags[row_of(table, 50)], Flag::hampel_outlier));
  EXPECT_TRUE(has_flag(table.flags[row_of(table, 51)], Flag::hampel_outlier));
  EXPECT_TRUE(has_flag(table.flags[row_of(table, 200)], Flag::hampel_outlier));
  EXPECT_EQ(count_flag(table, Flag::hampel_outlier), 3u) << "seasonal swing and noise are not outliers";
}

TEST(QcHampel, WindowRestartsAtStormOnset) {
  // A 35 m landward step marked as storm response: the points just before it
  // must not be judged against the eroded level.
  auto obs = series(120, 4, 3);
  for (std::size_t k = 60; k < 120; ++k) obs[k].chainage_m -= 35;
  auto table = make_table(obs);
  for (std::size_t k = 60; k < 70; ++k) table.add_flag(row_of(table, k), Flag::storm_response);
  run_transect_step(*HampelStep::make(nullptr, "/steps/hampel"), table, RunInputs{});
  EXPECT_EQ(count_flag(table, Flag::hampel_outlier), 0u);
}

TEST(QcImplausibleRate, FastChangeFlaggedSlowChangeKept) {
  std::vector<Obs> obs;
  for (int k = 0; k < 60; ++k) obs.push_back({"T1", "i" + std::to_string(k), "landsat8", k * 2.0, 100 + 0.4 * k * 2.0 + 2 * wobble(k)});
  obs[30].chainage_m += 80;  // 80 m in two days
  auto table = make_table(obs);
  run_transect_step(*ImplausibleRateStep::make(nullptr, "/steps/implausible_rate"), table, RunInputs{});
  EXPECT_TRUE(has_flag(table.flags[row_of(table, 30)], Flag::implausible_rate));
  EXPECT_EQ(count_flag(table, Flag::implausible_rate), 1u) << "0.4 m/day is plausible";
}

TEST(QcImplausibleRate, OddFirstReferenceDoesNotCascade) {
  std::vector<Obs> obs;
  for (int k = 0; k < 30; ++k) obs.push_back({"T1", "i" + std::to_string(k), "landsat8", k * 2.0, 100 + 2 * wobble(k)});
  obs[0].chainage_m += 90;
  auto table = make_table(obs);
  run_transect_step(*ImplausibleRateStep::make(nullptr, "/steps/implausible_rate"), table, RunInputs{});
  EXPECT_EQ(count_flag(table, Flag::implausible_rate), 0u);
}

TEST(QcSparsePeriod, IsolatedPointsWarn) {
  auto obs = series(30, 10, 2);
  obs.push_back({"T1", "late", "landsat8", 30 * 10 + 400, 200});
  auto table = make_table(obs);
  run_transect_step(*SparsePeriodStep::make(nullptr, "/steps/sparse_period"), table, RunInputs{});
  EXPECT_TRUE(has_flag(table.flags[row_of(table, 30)], Flag::sparse_period));
  EXPECT_EQ(count_flag(table, Flag::sparse_period), 1u);
  EXPECT_TRUE(table.accepted(row_of(table, 30))) << "sparse_period only warns";
}

TEST(QcStormResponse, PersistentLandwardJumpAfterHighWavesIsKept) {
  // Storm on days 400-402; the beach retreats 30 m and recovers with a 60-day e-folding time.
  auto obs = series(200, 4, 3);
  for (auto& o : obs)
    if (o.day >= 402) o.chainage_m -= 30 * std::exp(-(o.day - 402) / 60.0);
  obs[150].chainage_m += 60;  // a real spike later on
  const TimeS t0 = 1.5e9;
  StepWaves waves(t0 + 400 * kSecondsPerDay, t0 + 402 * kSecondsPerDay);
  RunInputs in;
  in.waves = &waves;
  auto table = make_table(obs);
  run_site_step(*StormResponseStep::make(nullptr, "/steps/storm_response"), table, in);
  const std::size_t first_after = row_of(table, 101);  // day 404
  EXPECT_TRUE(has_flag(table.flags[first_after], Flag::storm_response));
  EXPECT_GE(count_flag(table, Flag::storm_response), 5u);
  for (std::size_t k = 0; k < 100; ++k) EXPECT_FALSE(has_flag(table.flags[row_of(table, k)], Flag::storm_response)) << k;
  // The outlier filters after it leave the erosion and the recovery alone, but still catch the spike.
  run_transect_step(*DespikeStep::make(nullptr, "/steps/despike"), table, in);
  run_transect_step(*HampelStep::make(nullptr, "/steps/hampel"), table, in);
  run_transect_step(*ImplausibleRateStep::make(nullptr, "/steps/implausible_rate"), table, in);
  for (std::size_t k = 0; k < obs.size(); ++k)
    EXPECT_EQ(table.accepted(row_of(table, k)), k != 150) << "point " << k;
}

TEST(QcStormResponse, SameJumpWithoutStormIsNotStormResponse) {
  auto obs = series(200, 4, 3);
  for (auto& o : obs)
    if (o.day >= 402) o.chainage_m -= 30 * std::exp(-(o.day - 402) / 60.0);
  StepWaves calm(0, 0);
  RunInputs in;
  in.waves = &calm;
  auto table = make_table(obs);
  run_site_step(*StormResponseStep::make(nullptr, "/steps/storm_response"), table, in);
  EXPECT_EQ(count_flag(table, Flag::storm_response), 0u);
  // Unprotected, the sharp retreat is what the outlier filters reject: the storm step is what keeps it.
  run_transect_step(*HampelStep::make(nullptr, "/steps/hampel"), table, in);
  run_transect_step(*ImplausibleRateStep::make(nullptr, "/steps/implausible_rate"), table, in);
  std::size_t rejected_after_storm = 0;
  for (std::size_t k = 100; k < 130; ++k) rejected_after_storm += table.accepted(row_of(table, k)) ? 0 : 1;
  EXPECT_GT(rejected_after_storm, 0u);
  auto no_waves = make_table(obs);
  run_site_step(*StormResponseStep::make(nullptr, "/steps/storm_response"), no_waves, RunInputs{});
  EXPECT_EQ(count_flag(no_waves, Flag::storm_response), 0u);
}

namespace {
// 12 transects along a curve (azimuths 150..216 deg), 60 images 5 days apart.
std::vector<Obs> site_obs(double shift_x_m, double shift_y_m, std::size_t bad_image) {
  std::vector<Obs> obs;
  std::size_t k = 0;
  for (int im = 0; im < 60; ++im)
    for (int tr = 0; tr < 12; ++tr) {
      const double az = (150.0 + 6.0 * tr) * std::numbers::pi / 180.0;
      double x = 200 + 10 * std::sin(0.3 * tr) + 3 * wobble(k++);
      if (im == static_cast<int>(bad_image)) x += shift_x_m * std::sin(az) + shift_y_m * std::cos(az);
      char id[8];
      std::snprintf(id, sizeof id, "T%02d", tr);
      obs.push_back({id, "img" + std::to_string(im), "landsat8", im * 5.0, x});
    }
  return obs;
}
void set_geometry(SiteTable& table) {
  for (auto& t : table.transects) {
    const int tr = std::stoi(t.id.substr(1));
    const double az = 150.0 + 6.0 * tr;
    t.geometry = {1000.0 * std::sin((az - 180) * std::numbers::pi / 180), 100.0 * tr, az, 500};
  }
}
}  // namespace

TEST(QcImageMisregistration, TwoDimensionalShiftRejectsTheWholeImage) {
  auto table = make_table(site_obs(30, -40, 25));
  set_geometry(table);
  run_site_step(*ImageMisregistrationStep::make(nullptr, "/steps/image_misregistration"), table, RunInputs{});
  for (std::size_t i = 0; i < table.size(); ++i)
    EXPECT_EQ(has_flag(table.flags[i], Flag::image_misregistered), table.image_ids[table.image[i]] == "img25") << i;
}

TEST(QcImageMisregistration, CommonOffsetWithoutGeometryAndNoFalseAlarm) {
  auto shifted = make_table(site_obs(0, -35, 10));  // azimuths near 180: about +35 m on every transect
  run_site_step(*ImageMisregistrationStep::make(nullptr, "/steps/image_misregistration"), shifted, RunInputs{});
  EXPECT_EQ(count_flag(shifted, Flag::image_misregistered), 12u);
  auto clean = make_table(site_obs(0, 0, 0));
  set_geometry(clean);
  run_site_step(*ImageMisregistrationStep::make(nullptr, "/steps/image_misregistration"), clean, RunInputs{});
  EXPECT_EQ(count_flag(clean, Flag::image_misregistered), 0u);
}

namespace {
// 12 transects with azimuths az_deg(tr) (origins 100 m apart alongshore), 60
// images 5 days apart, image `bad_image` shifted by (shift_x_m, shift_y_m).
SiteTable layout_site(const std::function<double(int)>& az_deg, double shift_x_m, double shift_y_m,
                      std::size_t bad_image) {
  std::vector<Obs> obs;
  std::size_t k = 0;
  for (int im = 0; im < 60; ++im)
    for (int tr = 0; tr < 12; ++tr) {
      const double az = az_deg(tr) * std::numbers::pi / 180.0;
      double x = 200 + 10 * std::sin(0.3 * tr) + 3 * wobble(k++);
      if (im == static_cast<int>(bad_image)) x += shift_x_m * std::sin(az) + shift_y_m * std::cos(az);
      char id[8];
      std::snprintf(id, sizeof id, "T%02d", tr);
      obs.push_back({id, "img" + std::to_string(im), "landsat8", im * 5.0, x});
    }
  SiteTable table = make_table(obs);
  for (auto& t : table.transects) {
    const int tr = std::stoi(t.id.substr(1));
    t.geometry = {100.0 * tr, 0.0, az_deg(tr), 500};
  }
  return table;
}

nlohmann::json run_misregistration(SiteTable& table, StepLog& log) {
  const auto step = ImageMisregistrationStep::make(nullptr, "/steps/image_misregistration");
  static_cast<const SiteStep&>(*step).run(table, RunInputs{}, log);
  return log.to_json();
}
}  // namespace

// A straight coast: every azimuth is 200 deg, so dx and dy cannot be separated;
// the shift (30, -40) is seen as 30 sin 200 - 40 cos 200 = +27.3 m on every transect.
TEST(QcImageMisregistration, ParallelTransectsWithGeometryFallBackToTheCommonOffset) {
  auto table = layout_site([](int) { return 200.0; }, 30, -40, 25);
  StepLog log;
  const auto prov = run_misregistration(table, log);
  SCOPED_TRACE(prov.dump());
  for (std::size_t i = 0; i < table.size(); ++i)
    EXPECT_EQ(has_flag(table.flags[i], Flag::image_misregistered), table.image_ids[table.image[i]] == "img25") << i;
  EXPECT_EQ(log.count_of("images_tested"), 60);
  EXPECT_EQ(log.count_of("images_tested_common_offset"), 60);
  EXPECT_EQ(log.count_of("images_tested_2d"), 0);
  EXPECT_EQ(log.count_of("images_not_testable"), 0);
  const auto& rejected = prov.at("notes").at("rejected_images");
  ASSERT_EQ(rejected.size(), 1u);
  EXPECT_EQ(rejected[0].at("model"), "common_offset");
  EXPECT_NEAR(rejected[0].at("offset_m").get<double>(), 30 * std::sin(200 * std::numbers::pi / 180) -
                                                            40 * std::cos(200 * std::numbers::pi / 180), 3.0);
  EXPECT_LT(rejected[0].at("azimuth_spread_deg").get<double>(), 1e-3);
}

// Azimuths 195.0..196.1 deg: the 2-D fit is solvable but the alongshore part of
// the shift is not resolved (spread ~0.3 deg, below min_azimuth_spread_deg 3).
TEST(QcImageMisregistration, NearlyParallelTransectsUseTheCommonOffset) {
  auto table = layout_site([](int tr) { return 195.0 + 0.1 * tr; }, 30, -40, 25);
  StepLog log;
  const auto prov = run_misregistration(table, log);
  SCOPED_TRACE(prov.dump());
  EXPECT_EQ(log.count_of("images_tested_common_offset"), 60);
  const auto& rejected = prov.at("notes").at("rejected_images");
  ASSERT_EQ(rejected.size(), 1u);
  EXPECT_EQ(rejected[0].at("image_id"), "img25");
  EXPECT_EQ(rejected[0].at("model"), "common_offset");
}

// A fan of azimuths 120..241 deg: the 2-D shift is identifiable and recovered.
TEST(QcImageMisregistration, FannedTransectsFitTheTwoDimensionalShift) {
  auto table = layout_site([](int tr) { return 120.0 + 11.0 * tr; }, 30, -40, 25);
  StepLog log;
  const auto prov = run_misregistration(table, log);
  SCOPED_TRACE(prov.dump());
  for (std::size_t i = 0; i < table.size(); ++i)
    EXPECT_EQ(has_flag(table.flags[i], Flag::image_misregistered), table.image_ids[table.image[i]] == "img25") << i;
  EXPECT_EQ(log.count_of("images_tested_2d"), 60);
  EXPECT_EQ(log.count_of("images_tested_common_offset"), 0);
  const auto& rejected = prov.at("notes").at("rejected_images");
  ASSERT_EQ(rejected.size(), 1u);
  EXPECT_EQ(rejected[0].at("model"), "2d_shift");
  EXPECT_NEAR(rejected[0].at("shift_x_m").get<double>(), 30, 3.0);
  EXPECT_NEAR(rejected[0].at("shift_y_m").get<double>(), -40, 3.0);
}

TEST(QcAlongshore, OnePointAtOddsWithItsNeighbours) {
  auto obs = site_obs(0, 0, 0);
  obs[30 * 12 + 5].chainage_m += 45;  // image 30, transect T05
  for (bool with_geometry : {false, true}) {
    auto table = make_table(obs);
    if (with_geometry) set_geometry(table);
    run_site_step(*AlongshoreStep::make(nullptr, "/steps/alongshore"), table, RunInputs{});
    EXPECT_EQ(count_flag(table, Flag::alongshore_outlier), 1u);
    EXPECT_TRUE(has_flag(table.flags[row_of(table, 30 * 12 + 5)], Flag::alongshore_outlier));
  }
}

TEST(QcSteps, UnknownKeysNameTheirPointer) {
  try {
    HampelStep::make({{"window", 3}}, "/steps/hampel");
    FAIL();
  } catch (const ConfigError& e) {
    EXPECT_EQ(e.pointer, "/steps/hampel/window");
  }
  EXPECT_THROW(DespikeStep::make({{"k", -1}}, "/steps/despike"), ConfigError);
  EXPECT_THROW(StormResponseStep::make({{"hs_quantile", 1.5}}, "/steps/storm_response"), ConfigError);
  EXPECT_THROW(AlongshoreStep::make({{"min_neighbours", 9}}, "/steps/alongshore"), ConfigError);
}
