// Constituent speeds derived from the astronomical rates against the standard
// published speeds (deg per mean solar hour) of the NOAA/Schureman tables,
// recalled from memory (Schureman 1958 Table 2 / NOAA CO-OPS constituent list;
// the same values appear in @neaps/tide-predictor's constituent table).
#include <gtest/gtest.h>

#include "corrections/tide/constituent_table.h"

namespace strandline::tide {
namespace {

struct PublishedSpeed {
  const char* name;
  double speed_deg_per_h;
};

const PublishedSpeed kPublished[] = {
    {"Sa", 0.0410686},     {"Ssa", 0.0821373},   {"Mm", 0.5443747},     {"MSf", 1.0158958},
    {"Mf", 1.0980331},     {"2Q1", 12.8542862},  {"SIGMA1", 12.9271398}, {"Q1", 13.3986609},
    {"RHO1", 13.4715145},  {"O1", 13.9430356},   {"P1", 14.9589314},    {"S1", 15.0},
    {"K1", 15.0410686},    {"J1", 15.5854433},   {"OO1", 16.1391017},   {"2N2", 27.8953548},
    {"MU2", 27.9682084},   {"N2", 28.4397295},   {"NU2", 28.5125831},   {"M2", 28.9841042},
    {"LAMBDA2", 29.4556253}, {"L2", 29.5284789}, {"T2", 29.9589333},    {"S2", 30.0},
    {"R2", 30.0410667},    {"K2", 30.0821373},   {"2SM2", 31.0158958},  {"MO3", 42.9271398},
    {"2MK3", 42.9271398},  {"M3", 43.4761563},   {"MK3", 44.0251729},   {"SK3", 45.0410686},
    {"MN4", 57.4238337},   {"M4", 57.9682084},   {"SN4", 58.4397295},   {"MS4", 58.9841042},
    {"MK4", 59.0662415},   {"S4", 60.0},         {"2MN6", 86.4079380},  {"M6", 86.9523127},
    {"2MS6", 87.9682084},  {"2SM6", 88.9841042}, {"S6", 90.0},          {"M8", 115.9364166},
};

TEST(TideSpeeds, MatchPublishedSpeeds) {
  for (const auto& p : kPublished) {
    const ConstituentDefinition* d = find_constituent(p.name);
    ASSERT_NE(d, nullptr) << p.name;
    // Published values carry 7 decimals; the rates are those of J2000 (Meeus)
    // rather than 1900 (Schureman), which moves the 8th decimal.
    EXPECT_NEAR(speed_deg_per_h(*d), p.speed_deg_per_h, 2e-7 + 1e-7 * p.speed_deg_per_h) << p.name;
  }
}

TEST(TideSpeeds, RequiredConstituentsAreKnown) {
  for (const char* name : {"Sa", "Ssa", "Mm", "Mf", "Q1", "O1", "P1", "S1", "K1", "J1", "OO1", "2N2", "MU2", "N2", "NU2",
                           "M2", "L2", "T2", "S2", "K2", "M3", "MN4", "M4", "MS4", "M6", "2MK3", "MK3", "S4", "M8"})
    EXPECT_NE(find_constituent(name), nullptr) << name;
}

TEST(TideSpeeds, LookupIgnoresCaseAndRejectsUnknown) {
  ASSERT_NE(find_constituent("ssa"), nullptr);
  EXPECT_EQ(find_constituent("SSA")->name, "Ssa");
  EXPECT_EQ(find_constituent("X9"), nullptr);
  EXPECT_EQ(find_constituent(""), nullptr);
}

TEST(TideSpeeds, CompoundArgumentIsSumOfParents) {
  // Schureman Table 2: MS4 = M2 + S2, so V(MS4) = V(M2) + V(S2) at any time.
  const AstronomicalArguments a = astronomical_arguments(1.6e9);
  const double v = equilibrium_argument_deg(*find_constituent("M2"), a) +
                   equilibrium_argument_deg(*find_constituent("S2"), a);
  EXPECT_NEAR(equilibrium_argument_deg(*find_constituent("MS4"), a), wrap_deg_360(v), 1e-9);
}

TEST(TideSpeeds, ArgumentAdvancesAtItsSpeed) {
  // V(t + 1 h) - V(t) equals the speed (mod 360) for every constituent.
  const double t0 = 1.5e9;
  const AstronomicalArguments a0 = astronomical_arguments(t0);
  const AstronomicalArguments a1 = astronomical_arguments(t0 + 3600.0);
  for (const auto& c : constituent_table()) {
    const double dv = wrap_deg_360(equilibrium_argument_deg(c, a1) - equilibrium_argument_deg(c, a0));
    EXPECT_NEAR(dv, wrap_deg_360(speed_deg_per_h(c)), 1e-6) << c.name;
  }
}

TEST(TideSpeeds, SolarArgumentsAtMidnight) {
  // At 00:00 UT the mean Sun's hour angle is 180 deg, so S2 (V = 2T) is 0 and S1 (V = T) is 180.
  const AstronomicalArguments a = astronomical_arguments(1577836800.0);  // 2020-01-01T00:00Z
  EXPECT_NEAR(a.t_deg, 180.0, 1e-9);
  EXPECT_NEAR(wrap_deg_360(equilibrium_argument_deg(*find_constituent("S2"), a) + 1e-9), 0.0, 1e-6);
  EXPECT_NEAR(equilibrium_argument_deg(*find_constituent("S1"), a), 180.0, 1e-9);
}

TEST(TideSpeeds, MeanElementsAtJ2000) {
  // Meeus (1998) eqs. 47.1, 47.7, 25.2 at T = 0 (2000-01-01T12:00 TT, here UT).
  const AstronomicalArguments a = astronomical_arguments(946728000.0);
  EXPECT_NEAR(a.s_deg, 218.3164477, 1e-7);
  EXPECT_NEAR(a.n_deg, 125.0445479, 1e-7);
  EXPECT_NEAR(a.h_deg, 280.46646, 1e-7);
  EXPECT_NEAR(a.obliquity_deg, 23.0 + 26.0 / 60 + 21.448 / 3600, 1e-9);
}

}  // namespace
}  // namespace strandline::tide
