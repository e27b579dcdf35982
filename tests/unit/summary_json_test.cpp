// The summary JSON writer: every key, its number/null/text form, and the keys that
// are left out, against documents written out here. A dropped, renamed or retyped
// key (2 written as 2.0, a time as a number, null as a missing key) fails by name.
#include <gtest/gtest.h>

#include <string>

#include "qc/cautions.h"
#include "qc/summary.h"
#include "server/io/summary_json.h"
#include "tests/unit/qc_series.h"

using namespace strandline;
using nlohmann::json;

namespace {

// Same keys at every level of objects, each leaf with the same text (so 2 and 2.0,
// null and a missing key, "2017-07-14T02:40:00Z" and a number all differ).
void expect_same_document(const json& actual, const json& expected, const std::string& where) {
  if (expected.is_object() && actual.is_object()) {
    for (const auto& [key, value] : expected.items()) {
      if (!actual.contains(key)) {
        ADD_FAILURE() << where << "/" << key << ": missing";
        continue;
      }
      expect_same_document(actual[key], value, where + "/" + key);
    }
    for (const auto& [key, value] : actual.items())
      if (!expected.contains(key)) ADD_FAILURE() << where << "/" << key << ": not expected (" << value.dump() << ")";
    return;
  }
  EXPECT_EQ(actual.dump(), expected.dump()) << where;
}

// One transect "short": three points 20 days apart, the first rejected as a spike,
// positions and sigmas known, no slope.
SiteTable short_transect_table() {
  std::vector<qc_test::Obs> obs;
  for (int k = 0; k < 3; ++k) obs.push_back({"short", "i" + std::to_string(k), "landsat8", k * 20.0, 50.0 + k});
  SiteTable table = qc_test::make_table(obs);
  for (std::size_t i = 0; i < table.size(); ++i) table.sigma_m[i] = 5;
  table.add_flag(qc_test::row_of(table, 0), Flag::spike);
  return table;
}

}  // namespace

TEST(SummaryJson, TransectWithTooFewPointsHasEveryKeyInItsNullForm) {
  const SiteTable table = short_transect_table();
  // make_table puts day 0 at 1.5e9 s = 2017-07-14T02:40:00Z.
  const json expected = json::parse(R"json({
    "transect_id": "short",
    "slope": null,
    "slope_sigma": null,
    "slope_ci95": null,
    "slope_source": "none",
    "slope_identifiable": true,
    "z_ref_m": null,
    "n_observations": 3,
    "n_corrected": 3,
    "n_accepted": 2,
    "counts_by_flag": {"spike": 1},
    "first_accepted": "2017-08-03T02:40:00Z",
    "last_accepted": "2017-08-23T02:40:00Z",
    "mean_interval_days": 20.0,
    "trend_window": {"from": null, "to": null, "n_points": 2},
    "trend": null,
    "seasonal": null,
    "sensor_offsets": [],
    "sensor_noise": [{"sensor": "landsat8", "class": null, "family": null, "stated_sigma_m": null,
                      "measured_sigma_m": null, "n": 1}],
    "cautions": ["more than 20% of the corrected points were rejected",
                 "fewer than 3 accepted points in the trend window: no trend",
                 "fewer than 8 points or less than a year: no seasonal fit"]
  })json");
  expect_same_document(transect_summary_json(transect_summary(table, 0, SummaryOptions{})), expected, "");
}

TEST(SummaryJson, SiteDocumentWrapsTheTransectsWithTheRunsSettings) {
  SiteTable table = short_transect_table();
  table.transects[0].slope_details = {{"method", "closed_form"}};
  RunInputs inputs;
  inputs.reference_elevation_m = 0.75;
  SummaryOptions window;
  window.trend_from_s = 1.5e9 + 10 * kSecondsPerDay;
  window.trend_to_s = 1.5e9 + 30 * kSecondsPerDay;
  const json actual = site_summary_json(site_summary(table, inputs, window));

  json expected = {{"schema_version", 1},
                   {"reference_elevation_m", 0.75},
                   {"wave_correction", "none (no wave record)"},
                   {"transects", json::array()},
                   {"sensor_offsets", nullptr},
                   // Two accepted points give one difference: too few for a scatter. No
                   // sensor table: class, family and stated sigma unknown.
                   {"sensor_noise", json::parse(R"([{"sensor": "landsat8", "class": null, "family": null,
                       "stated_sigma_m": null, "measured_sigma_m": null, "n": 1}])")},
                   {"cautions", standard_cautions()}};
  ASSERT_TRUE(actual.contains("transects"));
  ASSERT_EQ(actual["transects"].size(), 1u);
  json without_transects = actual;
  without_transects["transects"] = json::array();
  expect_same_document(without_transects, expected, "");

  const json& t = actual["transects"][0];
  EXPECT_EQ(t["trend_window"].dump(), R"({"from":"2017-07-24T02:40:00Z","n_points":1,"to":"2017-08-13T02:40:00Z"})");
  EXPECT_EQ(t["slope_details"].dump(), R"({"method":"closed_form"})");
}

TEST(SummaryJson, FullTransectWritesEveryTrendAndSeasonalKey) {
  TransectSummary s;
  s.transect_id = "T7";
  s.slope = 0.125;
  s.slope_sigma = 0.0125;
  s.slope_ci95_low = 0.1;
  s.slope_ci95_high = 0.15;
  s.slope_source = SlopeSource::estimated;
  s.slope_identifiable = true;
  s.z_ref_m = 0.5;
  s.n_observations = 40;
  s.n_corrected = 38;
  s.n_accepted = 36;
  s.counts_by_flag = {{"spike", 2}, {"tide_predicted", 5}};
  s.first_accepted_s = 1.5e9;
  s.last_accepted_s = 1.5e9 + 350 * kSecondsPerDay;
  s.mean_interval_days = 10.0;
  s.trend_window = {1.5e9, kUnknown, 36};
  TrendSummary& tr = s.trend.emplace();
  tr.rate_m_per_yr = -1.5;
  tr.intercept_m = 80.25;
  tr.intercept_time_s = 1.5e9 + 0.5;
  tr.se_naive_m_per_yr = 0.25;
  tr.lag1_autocorrelation = 0.125;
  tr.n_effective = 28.0;
  tr.se_m_per_yr = 0.375;
  tr.dof = 26.0;
  tr.ci95_m_per_yr = Interval{-2.25, -0.75};
  tr.slope_term = TrendSlopeTerm{{-1.25, -1.875}, 0.375, Interval{-2.5, -0.5}};
  tr.sensor_offset_term = TrendOffsetTerm{0.25, Interval{-2.625, -0.375}};
  FamilyOffset f;
  f.family = "sentinel2";
  f.reference_family = "landsat";
  f.offset_m = 15.5;
  f.se_m = 1.25;
  f.dof = 40.5;
  f.ci95_low_m = 13.0;
  f.ci95_high_m = 18.0;
  f.n_bins = 90;
  f.n_points = 400;
  f.n_reference_points = 250;
  s.sensor_offsets = {{f, true}};
  s.sensor_noise = {{"sentinel2a", "moderate_resolution", "sentinel2", 10.0, 7.25, 120}};
  s.seasonal = SeasonalSummary{4.5, 0.5, 30.0, 30.4375};
  s.cautions = {"a caution"};
  s.slope_details = {{"verdict", "identifiable"}, {"ci95", {0.1, 0.15}}};

  const json expected = json::parse(R"json({
    "transect_id": "T7",
    "slope": 0.125,
    "slope_sigma": 0.0125,
    "slope_ci95": [0.1, 0.15],
    "slope_source": "estimated",
    "slope_identifiable": true,
    "z_ref_m": 0.5,
    "n_observations": 40,
    "n_corrected": 38,
    "n_accepted": 36,
    "counts_by_flag": {"spike": 2, "tide_predicted": 5},
    "first_accepted": "2017-07-14T02:40:00Z",
    "last_accepted": "2018-06-29T02:40:00Z",
    "mean_interval_days": 10.0,
    "trend_window": {"from": "2017-07-14T02:40:00Z", "to": null, "n_points": 36},
    "trend": {
      "rate_m_per_yr": -1.5,
      "intercept_m": 80.25,
      "intercept_time": "2017-07-14T02:40:00.500Z",
      "se_naive_m_per_yr": 0.25,
      "lag1_autocorrelation": 0.125,
      "n_effective": 28.0,
      "se_m_per_yr": 0.375,
      "dof": 26.0,
      "ci95_m_per_yr": [-2.25, -0.75],
      "rate_at_slope_ci95_m_per_yr": [-1.25, -1.875],
      "slope_term_m_per_yr": 0.375,
      "ci95_with_slope_m_per_yr": [-2.5, -0.5],
      "sensor_offset_term_m_per_yr": 0.25,
      "ci95_with_sensor_offsets_m_per_yr": [-2.625, -0.375],
      "serial_correlation": "AR(1) effective sample size (Santer et al. 2000)"
    },
    "seasonal": {"amplitude_m": 4.5, "amplitude_sigma_m": 0.5, "phase_deg": 30.0,
                 "most_seaward_day_of_year": 30.4375},
    "sensor_offsets": [{"family": "sentinel2", "reference_family": "landsat", "offset_m": 15.5, "se_m": 1.25,
                        "dof": 40.5, "ci95_m": [13.0, 18.0], "significant": true, "corrected": true,
                        "n_bins": 90, "n_points": 400, "n_reference_points": 250}],
    "sensor_noise": [{"sensor": "sentinel2a", "class": "moderate_resolution", "family": "sentinel2",
                      "stated_sigma_m": 10.0, "measured_sigma_m": 7.25, "n": 120}],
    "cautions": ["a caution"],
    "slope_details": {"verdict": "identifiable", "ci95": [0.1, 0.15]}
  })json");
  expect_same_document(transect_summary_json(s), expected, "");
}

TEST(SummaryJson, TrendWithoutIntervalsKeepsItsNullsAndOmissions) {
  TransectSummary s;
  s.transect_id = "T8";
  TrendSummary& tr = s.trend.emplace();
  tr.rate_m_per_yr = 2.0;
  tr.intercept_m = 10.0;
  tr.intercept_time_s = 1.5e9;
  tr.se_naive_m_per_yr = 1.0;
  tr.lag1_autocorrelation = 0.0;
  tr.n_effective = 3.0;

  // No slope interval: the three slope keys are null.
  json t = transect_summary_json(s)["trend"];
  EXPECT_EQ(t["se_m_per_yr"].dump(), "null");
  EXPECT_EQ(t["dof"].dump(), "null");
  EXPECT_EQ(t["ci95_m_per_yr"].dump(), "null");
  for (const char* key : {"rate_at_slope_ci95_m_per_yr", "slope_term_m_per_yr", "ci95_with_slope_m_per_yr"}) {
    ASSERT_TRUE(t.contains(key)) << key;
    EXPECT_TRUE(t[key].is_null()) << key;
  }

  // A slope interval but no statistical one: the combined interval is left out.
  tr.slope_term = TrendSlopeTerm{{1.5, 2.5}, 0.5, std::nullopt};
  t = transect_summary_json(s)["trend"];
  EXPECT_EQ(t["rate_at_slope_ci95_m_per_yr"].dump(), "[1.5,2.5]");
  EXPECT_EQ(t["slope_term_m_per_yr"].dump(), "0.5");
  EXPECT_FALSE(t.contains("ci95_with_slope_m_per_yr"));
}

TEST(SummaryJson, WaveCorrectionNames) {
  SiteSummary s;
  EXPECT_EQ(site_summary_json(s)["wave_correction"], "none (no wave record)");
  s.wave_correction = WaveCorrection::none;
  EXPECT_EQ(site_summary_json(s)["wave_correction"], "none");
  s.wave_correction = WaveCorrection::setup;
  EXPECT_EQ(site_summary_json(s)["wave_correction"], "setup");
  s.wave_correction = WaveCorrection::runup;
  EXPECT_EQ(site_summary_json(s)["wave_correction"], "runup");
}
