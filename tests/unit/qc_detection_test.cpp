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

TEST(QcDetection, EveryRowHasFlagsAndAcceptedRowsHaveSigma) {
  const auto run = bench::run_generated_site(synthetic::SiteParams::defaults());
  const auto& t = run->table;
  for (std::size_t i = 0; i < t.size(); ++i)
    if (t.accepted(i)) ASSERT_TRUE(known(t.sigma_m[i]) && t.sigma_m[i] > 0) << i;
}
