// The slope step says how far its slope can be trusted: identifiability judged
// on the steepest slope the 95% interval allows, an interval cut by the search
// range flagged and cautioned, a minimum at the range edge answered with a hint to
// widen the range, and a default slope carrying a real sigma.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

#include "corrections/engine/pipeline.h"
#include "corrections/steps/slope_step.h"
#include "corrections/water_level/gauge_series.h"
#include "qc/summary.h"
#include "server/app/steps/step_list.h"
#include "tests/unit/synthetic_table.h"

using namespace strandline;

namespace {

struct Case {
  synthetic::Site site;
  SiteTable table;
  std::unique_ptr<GaugeSeries> gauge;
  RunInputs inputs;
};

// Three transects: 0.05, 0.08 and a steep 0.3 beyond the search range.
Case make_case() {
  synthetic::SiteParams p = synthetic::SiteParams::defaults();
  p.n_transects = 3;
  p.slopes = {0.05, 0.08, 0.3};
  p.waves = p.waves_in_data = p.storms = false;
  p.first_year = p.gauge_first_year = 2008;
  p.sensors = {{"landsat8", 2008, 2025, 16, 10.4, 8.0, 0}, {"landsat7", 2008, 2025, 16, 10.4, 9.0, 8}};
  Case c;
  c.site = synthetic::generate_site(p);
  c.table = synthetic_test::table_of(c.site);
  c.gauge = std::make_unique<GaugeSeries>(c.site.gauge_times_s, c.site.gauge_levels_m, 0.1);
  c.inputs.water_levels = c.gauge.get();
  c.inputs.slopes.estimate = true;
  return c;
}

bool has_reason(const nlohmann::json& details, const std::string& reason) {
  for (const auto& r : details["reasons"])
    if (r == reason) return true;
  return false;
}

bool has_caution_containing(const TransectSummary& s, const std::string& text) {
  return std::any_of(s.cautions.begin(), s.cautions.end(),
                     [&](const std::string& c) { return c.find(text) != std::string::npos; });
}

bool every_point_has(const SiteTable& table, const TransectInfo& t, Flag f) {
  for (std::size_t i = t.begin; i < t.end; ++i)
    if (!has_flag(table.flags[i], f)) return false;
  return t.size() > 0;
}

}  // namespace

TEST(SlopeHonesty, IdentifiabilityIsJudgedAtTheSteepestSlopeOfTheInterval) {
  Case a = make_case();
  default_pipeline().run(a.table, a.inputs);
  const TransectInfo& t = a.table.transects[1];
  ASSERT_TRUE(t.slope_identifiable) << t.slope_details.dump();
  const nlohmann::json& d = t.slope_details;
  const double at_estimate = d["horizontal_tidal_excursion_m"].get<double>();
  const double at_steepest = d["horizontal_tidal_excursion_min_m"].get<double>();
  // One level range divided by two slopes: the estimate and the interval's top.
  EXPECT_NEAR(at_steepest * d["ci95"][1].get<double>(), at_estimate * d["tan_beta"].get<double>(), 1e-9 * at_estimate);
  ASSERT_LT(at_steepest, at_estimate);
  // A limit between the two: the estimate alone would pass, the interval does not.
  Case b = make_case();
  configured_pipeline({{"steps", {{"slope", {{"min_excursion_m", 0.5 * (at_steepest + at_estimate)}}}}}})
      .run(b.table, b.inputs);
  EXPECT_FALSE(b.table.transects[1].slope_identifiable);
  EXPECT_TRUE(has_reason(b.table.transects[1].slope_details, "tidal_excursion_below_limit"));
}

TEST(SlopeHonesty, AnIntervalCutByTheSearchRangeIsFlaggedAndCautioned) {
  Case a = make_case();
  default_pipeline().run(a.table, a.inputs);
  const TransectInfo& free = a.table.transects[1];
  ASSERT_EQ(free.slope_source, SlopeSource::estimated);
  EXPECT_FALSE(every_point_has(a.table, free, Flag::slope_poorly_constrained));
  EXPECT_FALSE(has_caution_containing(transect_summary(a.table, 1, a.inputs, {}), "cut by the search range"));
  // The range's lower end between the interval's bottom and the estimate.
  Case b = make_case();
  b.inputs.slopes.search_min = 0.5 * (free.slope_ci95_low + free.slope);
  default_pipeline().run(b.table, b.inputs);
  const TransectInfo& cut = b.table.transects[1];
  ASSERT_EQ(cut.slope_source, SlopeSource::estimated) << cut.slope_details.dump();
  EXPECT_NEAR(cut.slope_ci95_low, b.inputs.slopes.search_min, 1e-12);
  EXPECT_TRUE(cut.slope_details["ci_touches_search_range"].get<bool>());
  EXPECT_TRUE(every_point_has(b.table, cut, Flag::slope_poorly_constrained));
  EXPECT_TRUE(has_caution_containing(transect_summary(b.table, 1, b.inputs, {}), "cut by the search range"));
}

TEST(SlopeHonesty, AMinimumAtTheRangeEdgeSuggestsWideningTheRange) {
  Case c = make_case();
  c.inputs.slopes.search_max = 0.065;  // below the 0.08 transect's slope
  c.inputs.slopes.default_value = SlopeValue{0.1, 0.01};
  default_pipeline().run(c.table, c.inputs);
  const TransectInfo& t = c.table.transects[1];
  ASSERT_TRUE(has_reason(t.slope_details, "minimum_at_range_edge")) << t.slope_details.dump();
  EXPECT_EQ(t.slope_source, SlopeSource::default_value);
  EXPECT_TRUE(has_caution_containing(transect_summary(c.table, 1, c.inputs, {}), "widen the search range"));
  // The data's minimum (0.065, the edge) is 0.035 from the default: more than the stated 0.01.
  EXPECT_NEAR(t.slope_sigma, 0.1 - t.slope_details["tan_beta"].get<double>(), 1e-12);
  EXPECT_EQ(t.slope_details["default_sigma_basis"], "distance_to_data_minimum");
}

TEST(SlopeHonesty, ADefaultSlopeCarriesARealSigma) {
  // No estimate, no stated sigma: the default is taken as uniform over the
  // search range, sigma = (max - min) / sqrt(12) (variance of a uniform
  // distribution, (b - a)^2 / 12: any probability text).
  Case c = make_case();
  c.inputs.slopes.estimate = false;
  c.inputs.slopes.default_value = SlopeValue{0.1, kUnknown};
  default_pipeline().run(c.table, c.inputs);
  for (const TransectInfo& t : c.table.transects) {
    EXPECT_EQ(t.slope_source, SlopeSource::default_value);
    EXPECT_NEAR(t.slope_sigma, (0.2 - 0.01) / std::sqrt(12.0), 1e-12);
    for (std::size_t i = t.begin; i < t.end; ++i) {
      EXPECT_FALSE(has_flag(c.table.flags[i], Flag::sigma_slope_unknown));
      if (known(c.table.chainage_m[i]) && c.table.water_level_m[i] != t.z_ref_m) {
        EXPECT_GT(c.table.sigma_slope_m[i], 0.0);
      }
    }
  }
  // A stated sigma is kept when nothing in the data contradicts it.
  Case stated = make_case();
  stated.inputs.slopes.estimate = false;
  stated.inputs.slopes.default_value = SlopeValue{0.1, 0.03};
  default_pipeline().run(stated.table, stated.inputs);
  EXPECT_DOUBLE_EQ(stated.table.transects[0].slope_sigma, 0.03);
}

TEST(SlopeHonesty, ADefaultSlopesSigmaCoversTheErrorItCauses) {
  // The steep transect (true 0.3, beyond the 0.2 search range) falls back on a
  // default of 0.1 with no stated sigma. Its positions are then off by
  // (eta - z_ref)(1/0.1 - 1/0.3) (the correction's geometry, design notes
  // section 2); the slope term of sigma_m, unknown and left out before, must be at
  // least that large (rms over the corrected points).
  Case c = make_case();
  c.inputs.slopes.default_value = SlopeValue{0.1, kUnknown};
  default_pipeline().run(c.table, c.inputs);
  const TransectInfo& t = c.table.transects[2];
  ASSERT_EQ(t.slope_source, SlopeSource::default_value);
  double error2 = 0, sigma2 = 0;
  std::size_t n = 0;
  for (std::size_t i = t.begin; i < t.end; ++i) {
    if (!known(c.table.chainage_m[i])) continue;
    ASSERT_TRUE(known(c.table.sigma_slope_m[i])) << "row " << i;
    error2 += std::pow((c.table.water_level_m[i] - t.z_ref_m) * (1 / 0.1 - 1 / 0.3), 2);
    sigma2 += std::pow(c.table.sigma_slope_m[i], 2);
    ++n;
  }
  ASSERT_GT(n, 100u);
  const double rms_error = std::sqrt(error2 / double(n)), rms_sigma = std::sqrt(sigma2 / double(n));
  std::printf("default slope 0.1 on a 0.3 beach: rms slope-induced error %.1f m, rms slope term %.1f m (%s)\n",
              rms_error, rms_sigma, t.slope_details["default_sigma_basis"].get<std::string>().c_str());
  EXPECT_GE(rms_sigma, rms_error);
}
