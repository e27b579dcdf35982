// Regression: a constant offset between sensor families (+15 m on every
// Sentinel-2 image, 9 years of overlap with Landsat) must not bend the trend
// out of its interval. Uses only the default pipeline and the summary, so it
// runs unchanged on a pipeline without a sensor-offset step (there it covered
// the truth in 0 of 40 trials).
#include <gtest/gtest.h>

#include "qc/summary.h"
#include "server/app/steps/step_list.h"
#include "tests/unit/offset_site.h"

using namespace strandline;
using namespace strandline::offset_test;

TEST(SensorOffsetTrend, DefaultRunTrendCoversTheTruthWithAnOffsetPresent) {
  const Pipeline pipeline = configured_pipeline({{"threads", 1}});
  int covered = 0, trials = 0;
  for (unsigned seed = 1; seed <= 40; ++seed) {
    OffsetSite site = make_offset_site(seed, 10, 15.0);
    OffsetInputs in;
    pipeline.run(site.table, in.inputs);
    const TransectSummary s = transect_summary(site.table, 0, in.inputs, SummaryOptions{});
    ASSERT_TRUE(s.trend && s.trend->ci95_m_per_yr);
    ++trials;
    const double truth = site.rate_m_per_yr[0];
    if (s.trend->ci95_m_per_yr->low <= truth && truth <= s.trend->ci95_m_per_yr->high) ++covered;
  }
  std::printf("trend statistical interval covers the true rate in %d of %d trials\n", covered, trials);
  EXPECT_GE(covered, 36);
}
