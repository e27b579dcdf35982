// The pipeline end to end on small hand-made tables: the correction formula,
// flags for missing inputs, uncertainty terms, and configuration handling.
#include <gtest/gtest.h>

#include <cmath>

#include "corrections/engine/pipeline.h"
#include "server/app/steps/step_list.h"
#include "corrections/water_level/gauge_series.h"

using namespace strandline;

namespace {

SiteTable two_transects() {
  SiteTableBuilder b;
  const auto s = b.sensor_index("landsat8");
  const auto t1 = b.transect_index("B"), t2 = b.transect_index("A");
  for (int k = 0; k < 4; ++k) {
    const auto im = b.image_index("img" + std::to_string(k));
    const double t = 1000.0 + 600.0 * k;
    b.add(t1, im, s, {static_cast<std::uint32_t>(2 * k), t, 100.0 + k});
    b.add(t2, im, s, {static_cast<std::uint32_t>(2 * k + 1), t, 50.0});
  }
  return std::move(b).build();
}

}  // namespace

TEST(SiteTableBuilder, SortsTransectsByIdAndTime) {
  SiteTable t = two_transects();
  ASSERT_EQ(t.transects.size(), 2u);
  EXPECT_EQ(t.transects[0].id, "A");
  EXPECT_EQ(t.transects[1].id, "B");
  EXPECT_EQ(t.transects[1].begin, 4u);
  EXPECT_DOUBLE_EQ(t.chainage_raw_m[t.transects[1].begin + 3], 103.0);
  EXPECT_EQ(t.input_row[0], 1u);
}

TEST(Pipeline, CorrectsToReferenceContour) {
  SiteTable table = two_transects();
  GaugeSeries gauge({0, 5000, 10000}, {-1.0, 0.0, 1.0}, 0.1);  // level = -1 + 2 t / 10000 (no curvature)
  RunInputs in;
  const SensorTable sensors = SensorTable::defaults();
  in.sensors = &sensors;
  in.water_levels = &gauge;
  in.reference_elevation_m = 0.5;
  in.slopes.per_transect["A"] = {0.05, 0.005};
  in.slopes.all = SlopeValue{0.1, kUnknown};
  default_pipeline().run(table, in);
  for (std::size_t i = 0; i < table.size(); ++i) {
    const auto& tr = table.transects[table.transect[i]];
    const double eta = -1.0 + 2.0 * table.time_s[i] / 10000.0;
    const double expected = table.chainage_raw_m[i] + (eta - 0.5) / tr.slope;
    EXPECT_NEAR(table.chainage_m[i], expected, 1e-9);
    EXPECT_NEAR(table.correction_m[i], table.chainage_m[i] - table.chainage_raw_m[i], 1e-12);
    EXPECT_TRUE(table.accepted(i));
    // sigma terms: sensor 12 m (landsat8 default), water level 0.1/slope, slope term.
    EXPECT_NEAR(table.sigma_water_level_m[i], 0.1 / tr.slope, 1e-12);
    if (tr.id == "A") {
      EXPECT_NEAR(table.sigma_slope_m[i], 0.005 * std::abs(eta - 0.5) / (0.05 * 0.05), 1e-9);
      EXPECT_NEAR(table.sigma_m[i], std::hypot(12.0, 0.1 / 0.05, table.sigma_slope_m[i]), 1e-9);
      EXPECT_FALSE(has_flag(table.flags[i], Flag::sigma_slope_unknown));
    } else {
      // The slope sigma of B is unknown: named in a flag, left out of sigma_m.
      EXPECT_TRUE(has_flag(table.flags[i], Flag::sigma_slope_unknown));
      EXPECT_NEAR(table.sigma_m[i], std::hypot(12.0, 0.1 / 0.1), 1e-9);
    }
  }
  EXPECT_EQ(table.transects[0].slope_source, SlopeSource::fixed);
}

TEST(Pipeline, OutsideRecordIsFlaggedNotExtrapolated) {
  SiteTable table = two_transects();
  GaugeSeries gauge({1500, 5750, 10000}, {0.0, 0.5, 1.0}, 0.1);  // starts after the first image
  RunInputs in;
  in.water_levels = &gauge;
  in.slopes.all = SlopeValue{0.1, 0.01};
  default_pipeline().run(table, in);
  const std::size_t first = table.transects[0].begin;
  EXPECT_TRUE(has_flag(table.flags[first], Flag::no_water_level));
  EXPECT_FALSE(table.accepted(first));
  EXPECT_TRUE(std::isnan(table.chainage_m[first]));
  EXPECT_TRUE(std::isnan(table.water_level_m[first]));
  EXPECT_DOUBLE_EQ(table.chainage_raw_m[first], 50.0);
  EXPECT_TRUE(table.accepted(first + 1));
}

TEST(Pipeline, MissingSlopeFlagsAndDefaultSlopeWarns) {
  SiteTable table = two_transects();
  GaugeSeries gauge({0, 5000, 10000}, {0.0, 0.5, 1.0}, 0.1);
  RunInputs in;
  in.water_levels = &gauge;
  in.slopes.per_transect["A"] = {0.05, 0.005};
  default_pipeline().run(table, in);
  const std::size_t b0 = table.transects[1].begin;
  EXPECT_TRUE(has_flag(table.flags[b0], Flag::no_slope));
  EXPECT_TRUE(std::isnan(table.chainage_m[b0]));

  in.slopes.default_value = SlopeValue{0.08, kUnknown};
  default_pipeline().run(table, in);  // a second run starts from a clean state
  EXPECT_FALSE(has_flag(table.flags[b0], Flag::no_slope));
  EXPECT_TRUE(has_flag(table.flags[b0], Flag::default_slope));
  EXPECT_TRUE(table.accepted(b0));
  EXPECT_EQ(table.transects[1].slope_source, SlopeSource::default_value);
}

TEST(Pipeline, SameResultWithOneOrManyThreads) {
  SiteTable a = two_transects(), b = two_transects();
  GaugeSeries gauge({0, 5000, 10000}, {0.0, 0.5, 1.0}, 0.1);
  RunInputs in;
  in.water_levels = &gauge;
  in.slopes.all = SlopeValue{0.1, 0.01};
  configured_pipeline({{"threads", 1}}).run(a, in);
  configured_pipeline({{"threads", 4}}).run(b, in);
  for (std::size_t i = 0; i < a.size(); ++i) {
    EXPECT_EQ(a.chainage_m[i], b.chainage_m[i]);
    EXPECT_EQ(a.flags[i], b.flags[i]);
  }
}

TEST(Pipeline, EffectiveConfigurationListsEveryStep) {
  const Pipeline p = default_pipeline();
  for (const auto& e : step_list()) EXPECT_TRUE(p.config()["steps"].contains(e.name)) << e.name;
  EXPECT_EQ(p.config()["steps"]["water_level"]["max_gap_s"], 10800.0);
}

TEST(Flags, TableIsConsistent) {
  EXPECT_EQ(flag_table().size(), static_cast<std::size_t>(Flag::count_));
  for (const auto& f : flag_table()) {
    EXPECT_EQ(flag_from_name(f.name), f.flag);
    EXPECT_FALSE(f.meaning.empty());
  }
  EXPECT_EQ(flag_list(flag_bit(Flag::spike) | flag_bit(Flag::no_slope)), "no_slope;spike");
}
