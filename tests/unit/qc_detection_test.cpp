// The detection targets on the generated demo site (correctness, not speed):
// recall >= 95% of gross outliers (> 40 m and > 4x the transect's robust noise),
// false positives <= 2% of good points, >= 95% of storm-response points kept.
#include <gtest/gtest.h>

#include "tests/bench/qc_detection_eval.h"

using namespace strandline;

TEST(QcDetection, TargetsOnTheGeneratedSite) {
  for (std::uint64_t seed : {20261202ull, 7ull}) {
    auto params = synthetic::SiteParams::defaults();
    params.seed = seed;
    const auto run = bench::run_generated_site(params);
    const auto f = bench::score_detection(*run);
    SCOPED_TRACE(f.to_json().dump());
    ASSERT_GT(f.gross, 300u);
    ASSERT_GT(f.storm, 1000u);
    EXPECT_GE(f.recall(), 0.95) << "seed " << seed;
    EXPECT_LE(f.false_positive_rate(), 0.02) << "seed " << seed;
    EXPECT_GE(f.storm_kept_share(), 0.95) << "seed " << seed;
    // Filters off: nothing is rejected by QC, so the figures are not trivially met.
    nlohmann::json off = {{"steps", nlohmann::json::object()}};
    for (const char* s : {"image_quality", "storm_response", "despike", "hampel", "implausible_rate",
                          "image_misregistration", "alongshore", "sparse_period"})
      off["steps"][s] = {{"enabled", false}};
    const auto bare = bench::score_detection(*bench::run_generated_site(params, off));
    EXPECT_EQ(bare.gross_rejected, 0u);
  }
}

// A straight coast with transect geometry (the 2-D shift is not identifiable):
// misregistered images caught by the whole-image step alone (on the points
// image_quality kept), recall >= 90% of the planted images and of their gross
// points, <= 3% of the clean images and of the good points flagged (the targets
// of the figures in tests/bench/RESULTS.md).
TEST(QcDetection, MisregistrationOnAStraightCoastWithGeometry) {
  for (std::uint64_t seed : {20261202ull, 7ull}) {
    auto params = synthetic::SiteParams::defaults();
    params.seed = seed;
    params.azimuth_span_deg = 0.0;
    const auto run = bench::run_generated_site(params);
    const auto f = bench::score_detection(*run);
    const auto counts = bench::misregistration_counts(*run);
    SCOPED_TRACE(f.to_json().at("image_misregistration").dump());
    const auto& m = f.misregistration;
    ASSERT_GT(m.images_planted, 8u);
    EXPECT_GE(m.image_recall(), 0.9) << "seed " << seed;
    EXPECT_GE(m.recall(), 0.9) << "seed " << seed;
    EXPECT_LE(m.image_false_positive_rate(), 0.03) << "seed " << seed;
    EXPECT_LE(m.false_positive_rate(), 0.03) << "seed " << seed;
    EXPECT_GT(counts.at("images_tested_common_offset"), 500);
    EXPECT_EQ(counts.at("images_tested_2d"), 0);
  }
}

TEST(QcDetection, EveryRowHasFlagsAndAcceptedRowsHaveSigma) {
  const auto run = bench::run_generated_site(synthetic::SiteParams::defaults());
  const auto& t = run->table;
  for (std::size_t i = 0; i < t.size(); ++i)
    if (t.accepted(i)) ASSERT_TRUE(known(t.sigma_m[i]) && t.sigma_m[i] > 0) << i;
}
