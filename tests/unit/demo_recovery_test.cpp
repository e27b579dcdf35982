// With the demo's true slopes and its gauge record, the correction reproduces the
// generator's true reference-contour positions to within the noise put in.
#include <gtest/gtest.h>

#include <cmath>
#include <map>

#include "server/app/steps/step_list.h"
#include "corrections/engine/pipeline.h"
#include "corrections/water_level/gauge_series.h"
#include "demo_data/synthetic/synthetic_site.h"
#include "tests/unit/synthetic_table.h"

using namespace strandline;

TEST(DemoRecovery, TrueSlopesRecoverTruePositions) {
  synthetic::SiteParams params = synthetic::SiteParams::defaults();
  params.waves_in_data = false;  // tide-only physics: the foundation's correction
  const synthetic::Site site = synthetic::generate_site(params);

  SiteTable table = synthetic_test::table_of(site);
  GaugeSeries gauge(site.gauge_times_s, site.gauge_levels_m, 0.1);
  const SensorTable sensors = SensorTable::defaults();
  RunInputs in;
  in.water_levels = &gauge;
  in.sensors = &sensors;
  in.reference_elevation_m = params.z_ref_m;
  for (const auto& t : site.transects) in.slopes.per_transect[t.id] = {t.slope, 0.005};
  default_pipeline().run(table, in);

  std::map<std::string, double> noise;
  for (const auto& s : {"landsat5", "landsat7", "landsat8", "landsat9"}) noise[s] = s[7] >= '8' ? 8.0 : 9.0;
  noise["sentinel2a"] = noise["sentinel2b"] = 7.0;
  noise["smallsat"] = 4.0;

  std::map<std::string, std::pair<double, std::size_t>> sq_by_sensor;
  double sum = 0;
  std::size_t n = 0, uncorrected_in_gauge = 0;
  for (std::size_t i = 0; i < table.size(); ++i) {
    const auto& p = site.points[table.input_row[i]];
    if (p.outlier != synthetic::OutlierKind::none) continue;
    if (!known(table.chainage_m[i])) {
      if (gauge.covers(p.time_s, 3 * 3600.0)) ++uncorrected_in_gauge;
      continue;
    }
    const double r = table.chainage_m[i] - p.true_chainage_m;
    auto& acc = sq_by_sensor[table.sensor_names[table.sensor[i]]];
    acc.first += r * r;
    acc.second += 1;
    sum += r;
    ++n;
  }
  EXPECT_EQ(uncorrected_in_gauge, 0u);
  ASSERT_GT(n, 10000u);
  EXPECT_LT(std::abs(sum / n), 0.5) << "mean bias (m)";
  for (const auto& [sensor, acc] : sq_by_sensor) {
    const double rms = std::sqrt(acc.first / acc.second);
    // Within 10% of the generator's noise (plus ~0.2 m of gauge interpolation).
    EXPECT_LT(rms, 1.1 * noise.at(sensor) + 0.2) << sensor;
    EXPECT_GT(rms, 0.9 * noise.at(sensor)) << sensor;
  }
}
