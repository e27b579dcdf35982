// The run configuration both faces read: processing choices beside the
// pipeline's keys, defaults by origin, errors naming the JSON pointer, and the
// effective configuration that provenance records.
#include <gtest/gtest.h>

#include "corrections/core/errors.h"
#include "corrections/core/time_utc.h"
#include "server/app/run_config.h"

namespace strandline::app {
namespace {

using nlohmann::json;

std::string pointer_of(const json& config, const RunDefaults& defaults = {}) {
  try {
    read_run_config(config, defaults);
  } catch (const ConfigError& e) {
    return e.pointer;
  }
  return "(accepted)";
}

TEST(RunConfig, EmptyConfigurationTakesTheCallersDefaults) {
  const RunConfig batch = read_run_config(json::object(), {});
  EXPECT_EQ(batch.settings.reference_elevation_m, 0.0);
  EXPECT_EQ(batch.settings.wave_correction, WaveCorrection::setup);
  EXPECT_FALSE(batch.settings.estimate_slopes);
  EXPECT_FALSE(batch.settings.default_slope.has_value());

  RunDefaults site;
  site.reference_elevation_m = 1.5;
  site.default_slope = SlopeValue{0.07, kUnknown};
  site.estimate_slopes = true;
  const RunConfig service = read_run_config(nullptr, site);
  EXPECT_EQ(service.settings.reference_elevation_m, 1.5);
  EXPECT_TRUE(service.settings.estimate_slopes);
  ASSERT_TRUE(service.settings.default_slope.has_value());
  EXPECT_EQ(service.settings.default_slope->slope, 0.07);
  EXPECT_EQ(service.effective["slope"]["default"], 0.07);
  EXPECT_EQ(service.effective["reference_elevation_m"], 1.5);
}

TEST(RunConfig, KeysOverrideDefaultsAndLandInTheEffectiveConfiguration) {
  RunDefaults site;
  site.reference_elevation_m = 1.5;
  site.estimate_slopes = true;
  const json config = {{"reference_elevation_m", -0.5},
                       {"wave_correction", "runup"},
                       {"slope", {{"estimate", false}, {"default", 0.04}, {"default_sigma", 0.01}}},
                       {"trend_window", {{"from", "2001-01-01T00:00:00Z"}, {"to", "2010-01-01T00:00:00Z"}}},
                       {"steps", {{"hampel", {{"k", 4.0}}}}}};
  const RunConfig c = read_run_config(config, site);
  EXPECT_EQ(c.settings.reference_elevation_m, -0.5);
  EXPECT_EQ(c.settings.wave_correction, WaveCorrection::runup);
  EXPECT_FALSE(c.settings.estimate_slopes);
  EXPECT_EQ(c.settings.default_slope->slope, 0.04);
  EXPECT_EQ(c.settings.default_slope->slope_sigma, 0.01);
  EXPECT_EQ(c.settings.summary.trend_from_s, parse_time_utc("2001-01-01T00:00:00Z"));
  EXPECT_EQ(c.settings.summary.trend_to_s, parse_time_utc("2010-01-01T00:00:00Z"));
  EXPECT_EQ(c.effective["wave_correction"], "runup");
  EXPECT_EQ(c.effective["slope"]["estimate"], false);
  EXPECT_EQ(c.effective["slope"]["search_range"], json::array({0.01, 0.2}));
  EXPECT_EQ(c.effective["trend_window"]["from"], "2001-01-01T00:00:00Z");
  EXPECT_EQ(c.effective["steps"]["hampel"]["k"], 4.0);
  // The effective configuration reads back to the same settings.
  const RunConfig again = read_run_config(c.effective, {});
  EXPECT_EQ(again.effective, c.effective);
}

TEST(RunConfig, ErrorsNameTheirPointer) {
  EXPECT_EQ(pointer_of({{"wave_correction", "sideways"}}), "/wave_correction");
  EXPECT_EQ(pointer_of({{"reference_elevation_m", 120.0}}), "/reference_elevation_m");
  EXPECT_EQ(pointer_of({{"reference_elevation_m", "0"}}), "/reference_elevation_m");
  EXPECT_EQ(pointer_of({{"slope", {{"fixed", 8.0}}}}), "/slope/fixed");
  EXPECT_EQ(pointer_of({{"slope", {{"fixed", 0.05}, {"estimate", true}}}}), "/slope/fixed");
  EXPECT_EQ(pointer_of({{"slope", {{"search_range", {0.2, 0.01}}}}}), "/slope/search_range");
  EXPECT_EQ(pointer_of({{"slope", {{"default_sigma", 0.01}}}}), "/slope/default_sigma");
  EXPECT_EQ(pointer_of({{"slope", {{"estimated", true}}}}), "/slope/estimated");
  EXPECT_EQ(pointer_of({{"trend_window", {{"from", "2001-01-01"}}}}), "/trend_window/from");
  EXPECT_EQ(pointer_of({{"trend_window", {{"from", "2010-01-01T00:00Z"}, {"to", "2001-01-01T00:00Z"}}}}),
            "/trend_window");
  EXPECT_EQ(pointer_of({{"wave_corection", "none"}}), "/wave_corection");
  EXPECT_EQ(pointer_of({{"steps", {{"hampel", {{"kk", 1}}}}}}), "/steps/hampel/kk");
  EXPECT_EQ(pointer_of(json::array()), "");
  EXPECT_EQ(pointer_of({{"slope", {{"fixed", 0.05}}}}), "(accepted)");
}

TEST(RunConfig, AFixedSlopeTurnsTheSitesEstimateOff) {
  RunDefaults site;
  site.estimate_slopes = true;
  const RunConfig c = read_run_config({{"slope", {{"fixed", 0.05}, {"fixed_sigma", 0.005}}}}, site);
  ASSERT_TRUE(c.settings.fixed_slope.has_value());
  EXPECT_EQ(c.settings.fixed_slope->slope, 0.05);
  EXPECT_EQ(c.settings.fixed_slope->slope_sigma, 0.005);
  EXPECT_FALSE(c.settings.estimate_slopes);
}

}  // namespace
}  // namespace strandline::app
