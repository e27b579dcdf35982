// Stockdon et al. (2006) terms: worked values, regime switch, slope derivative.
#include <cmath>

#include <gtest/gtest.h>

#include "corrections/waves/linear_waves.h"
#include "corrections/waves/stockdon.h"

namespace strandline {
namespace {

TEST(Stockdon, WorkedIntermediateCase) {
  // H0 = 2 m, T = 10 s (L0 = 156.078 m with standard gravity), tan beta = 0.1, worked independently from the
  // published coefficients: q = sqrt(H0 L0) = 17.6679; setup = 0.35 * 0.1 * q =
  // 0.61838; S_inc = 0.75 * 0.1 * q = 1.32509; S_ig = 0.06 q = 1.06008;
  // R2 = 1.1 (0.61838 + 0.5 hypot(1.32509, 1.06008)) = 1.61354; xi0 = 0.1 / sqrt(2 / 156.078) = 0.88340.
  const double l0 = deep_water_wavelength_m(10.0);
  const StockdonTerms t = stockdon_terms(2.0, l0, 0.1);
  EXPECT_NEAR(t.iribarren, 0.88340, 1e-5);
  EXPECT_FALSE(t.dissipative);
  EXPECT_NEAR(t.setup_m, 0.61838, 1e-5);
  EXPECT_NEAR(t.incident_swash_m, 1.32509, 1e-5);
  EXPECT_NEAR(t.infragravity_swash_m, 1.06008, 1e-5);
  EXPECT_NEAR(t.runup_m, 1.61354, 1e-5);
  // The paper's printed form with rounded squares (0.563, 0.004) differs by a few percent of the swash.
  const double printed = 1.1 * (0.35 * 0.1 * std::sqrt(2.0 * l0) + 0.5 * std::sqrt(2.0 * l0 * (0.563 * 0.01 + 0.004)));
  EXPECT_NEAR(t.runup_m, printed, 0.05 * t.total_swash_m);
}

TEST(Stockdon, DissipativeFormBelowIribarrenPointThree) {
  const double l0 = deep_water_wavelength_m(12.0);
  const double h0 = 3.0;
  const double q = std::sqrt(h0 * l0);
  // slope giving xi0 just under and just over 0.3
  const double slope_at_switch = 0.3 * std::sqrt(h0 / l0);
  const StockdonTerms below = stockdon_terms(h0, l0, 0.999 * slope_at_switch);
  const StockdonTerms above = stockdon_terms(h0, l0, 1.001 * slope_at_switch);
  EXPECT_TRUE(below.dissipative);
  EXPECT_FALSE(above.dissipative);
  EXPECT_NEAR(below.runup_m, 0.043 * q, 1e-12);
  EXPECT_NEAR(above.runup_m, above.runup_general_m, 1e-12);
  // Setup keeps its general, slope-proportional form in both regimes.
  EXPECT_NEAR(below.setup_m, 0.35 * 0.999 * slope_at_switch * q, 1e-12);
}

TEST(Stockdon, SetupIsSlopeFreeInHorizontalTerms) {
  const double l0 = deep_water_wavelength_m(9.0);
  for (double slope : {0.02, 0.05, 0.12})
    EXPECT_NEAR(stockdon_terms(1.5, l0, slope).setup_m / slope, setup_horizontal_m(1.5, l0), 1e-12);
}

TEST(Stockdon, SlopeSensitivityMatchesFiniteDifference) {
  // d(R2/beta)/d(beta) = -c / beta^2 in each regime (away from the switch).
  const double l0 = deep_water_wavelength_m(11.0);
  for (double slope : {0.01, 0.03, 0.08, 0.15}) {
    const double h0 = 2.0;
    const double db = 1e-7;
    const double derivative = (stockdon_terms(h0, l0, slope + db).runup_m / (slope + db) -
                               stockdon_terms(h0, l0, slope - db).runup_m / (slope - db)) /
                              (2 * db);
    const double c = runup_slope_sensitivity_level_m(h0, l0, slope);
    EXPECT_NEAR(-derivative * slope * slope, c, 1e-5 * std::max(1.0, c)) << "slope " << slope;
  }
}

TEST(Stockdon, CalmSeaGivesZeroTerms) {
  const StockdonTerms t = stockdon_terms(0.0, 100.0, 0.05);
  EXPECT_TRUE(std::isinf(t.iribarren));
  EXPECT_FALSE(t.dissipative);
  EXPECT_EQ(t.setup_m, 0.0);
  EXPECT_EQ(t.runup_m, 0.0);
  EXPECT_EQ(runup_slope_sensitivity_level_m(0.0, 100.0, 0.05), 0.0);
}

}  // namespace
}  // namespace strandline
