// Nodal factors f and phase corrections u at known lunar node longitudes N
// against published values: the Doodson series as tabulated by Pugh (1987,
// "Tides, Surges and Mean Sea-Level", Table 4.3) and in the IHO constituent
// list's Annex A — coefficients recalled from memory. The series are
// approximations of Schureman's exact expressions good to ~0.002 in f and
// ~0.2 deg in u; tolerances allow that.
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "corrections/tide/constituent_table.h"
#include "corrections/tide/nodal_corrections.h"

namespace strandline::tide {
namespace {

constexpr double kRad = std::numbers::pi / 180.0;

NodalFactor factor_at_node(const char* name, double n_deg) {
  AstronomicalArguments a;
  a.n_deg = n_deg;
  a.p_deg = 0.0;
  a.obliquity_deg = 23.44;  // present-day mean obliquity
  return constituent_nodal_factor(*find_constituent(name), node_angles(a));
}

struct Series {
  const char* name;
  double f0, f1, f2, f3;  // f = f0 + f1 cos N + f2 cos 2N + f3 cos 3N
  double u1, u2, u3;      // u = u1 sin N + u2 sin 2N + u3 sin 3N (deg)
};

// Recalled from memory (Pugh 1987 Table 4.3; IHO TWCWG Annex A).
const Series kSeries[] = {
    {"M2", 1.0004, -0.0373, 0.0002, 0.0, -2.14, 0.0, 0.0},
    {"O1", 1.0089, 0.1871, -0.0147, 0.0014, 10.80, -1.34, 0.19},
    {"K1", 1.0060, 0.1150, -0.0088, 0.0006, -8.86, 0.68, -0.07},
    {"K2", 1.0246, 0.2863, 0.0083, -0.0015, -17.74, 0.68, -0.04},
    {"Mf", 1.0429, 0.4135, -0.004, 0.0, -23.74, 2.68, -0.38},
    {"Mm", 1.0, -0.1300, 0.0013, 0.0, 0.0, 0.0, 0.0},
};

TEST(TideNodal, FactorsMatchDoodsonSeriesAtKnownNodes) {
  for (const auto& s : kSeries) {
    for (double n : {0.0, 45.0, 90.0, 135.0, 180.0, 225.0, 270.0, 315.0}) {
      const NodalFactor got = factor_at_node(s.name, n);
      const double c = std::cos(n * kRad), c2 = std::cos(2 * n * kRad), c3 = std::cos(3 * n * kRad);
      const double sn = std::sin(n * kRad), s2 = std::sin(2 * n * kRad), s3 = std::sin(3 * n * kRad);
      const double f = s.f0 + s.f1 * c + s.f2 * c2 + s.f3 * c3;
      const double u = s.u1 * sn + s.u2 * s2 + s.u3 * s3;
      EXPECT_NEAR(got.f, f, 0.004) << s.name << " N=" << n;
      EXPECT_NEAR(std::remainder(got.u_deg - u, 360.0), 0.0, 0.35) << s.name << " N=" << n;
    }
  }
}

TEST(TideNodal, ExtremesOfTheNodalCycle) {
  // Recalled from memory (Pugh 1987 Table 4.3): M2 f ranges 0.963-1.038, O1 0.806-1.183,
  // K1 0.882-1.113 between N = 0 and N = 180 deg.
  EXPECT_NEAR(factor_at_node("M2", 0).f, 0.963, 0.002);
  EXPECT_NEAR(factor_at_node("M2", 180).f, 1.038, 0.002);
  EXPECT_NEAR(factor_at_node("O1", 0).f, 1.183, 0.003);
  EXPECT_NEAR(factor_at_node("O1", 180).f, 0.806, 0.003);
  EXPECT_NEAR(factor_at_node("K1", 0).f, 1.113, 0.003);
  EXPECT_NEAR(factor_at_node("K1", 180).f, 0.882, 0.003);
  // u vanishes at N = 0 and 180 for every constituent with a nodal u.
  for (const char* name : {"M2", "O1", "K1", "K2", "Mf", "J1", "OO1", "M3"})
    for (double n : {0.0, 180.0}) EXPECT_NEAR(std::remainder(factor_at_node(name, n).u_deg, 360.0), 0.0, 1e-9) << name;
}

TEST(TideNodal, SolarConstituentsHaveNoNodalModulation) {
  for (const char* name : {"Sa", "Ssa", "P1", "S1", "S2", "T2", "R2", "S4", "S6"}) {
    const NodalFactor nf = factor_at_node(name, 73.0);
    EXPECT_DOUBLE_EQ(nf.f, 1.0) << name;
    EXPECT_DOUBLE_EQ(nf.u_deg, 0.0) << name;
  }
}

TEST(TideNodal, CompoundTidesInheritFromParents) {
  for (double n : {30.0, 200.0}) {
    const NodalFactor m2 = factor_at_node("M2", n);
    const NodalFactor k1 = factor_at_node("K1", n);
    const NodalFactor m4 = factor_at_node("M4", n);
    const NodalFactor mk3 = factor_at_node("2MK3", n);
    EXPECT_NEAR(m4.f, m2.f * m2.f, 1e-12);
    EXPECT_NEAR(m4.u_deg, 2 * m2.u_deg, 1e-12);
    EXPECT_NEAR(mk3.f, m2.f * m2.f * k1.f, 1e-12);
    EXPECT_NEAR(mk3.u_deg, 2 * m2.u_deg - k1.u_deg, 1e-12);
    EXPECT_NEAR(factor_at_node("M3", n).f, std::pow(m2.f, 1.5), 1e-12);
  }
}

TEST(TideNodal, NodeAnglesAtNodeZero) {
  // At N = 0 the lunar orbit's inclination to the equator is omega + i and xi = nu = 0.
  AstronomicalArguments a;
  a.obliquity_deg = 23.452;  // Schureman's 1900 value
  const NodeAngles g = node_angles(a);
  EXPECT_NEAR(g.i_deg, 23.452 + kLunarOrbitInclinationDeg, 1e-9);
  EXPECT_NEAR(g.xi_deg, 0.0, 1e-12);
  EXPECT_NEAR(g.nu_deg, 0.0, 1e-12);
  // At N = 90 deg: Schureman's Table 6 gives nu ~ 12.9 deg and xi ~ 11.9 deg near their extremes
  // (recalled from memory; the maxima over the cycle are about 13.0 and 12.0 deg).
  a.n_deg = 90.0;
  const NodeAngles q = node_angles(a);
  EXPECT_NEAR(q.nu_deg, 12.9, 0.3);
  EXPECT_NEAR(q.xi_deg, 11.9, 0.4);
}

}  // namespace
}  // namespace strandline::tide
