// Linear wave theory: dispersion, group velocity, shoaling, deshoaling.
#include <cmath>
#include <limits>
#include <stdexcept>

#include <gtest/gtest.h>

#include "corrections/waves/linear_waves.h"

namespace strandline {
namespace {

constexpr double kDeep = std::numeric_limits<double>::quiet_NaN();

// Depth giving the ratio h/L0 for period T.
double depth_for(double h_over_l0, double period_s) { return h_over_l0 * deep_water_wavelength_m(period_s); }

TEST(LinearWaves, DeepWaterWavelengthIsGTSquaredOverTwoPi) {
  // L0 = g T^2 / 2 pi ~ 1.56 T^2 (the handbook rule, Shore Protection Manual 1984;
  // recalled from memory); with standard gravity 9.80665 m/s^2, 1.56078 T^2.
  EXPECT_NEAR(deep_water_wavelength_m(10.0), 156.078, 0.001);
  EXPECT_NEAR(deep_water_wavelength_m(12.0) / 144.0, 1.56, 0.001);
}

TEST(LinearWaves, DispersionRelationHoldsToDoublePrecision) {
  for (double period : {1.5, 4.0, 10.0, 20.0, 30.0})
    for (double depth : {0.01, 0.3, 3.0, 30.0, 300.0, 3000.0}) {
      const double k = wavenumber_rad_m(period, depth);
      const double omega = 2 * kPi / period;
      EXPECT_NEAR(kGravity_m_s2 * k * std::tanh(k * depth) / (omega * omega), 1.0, 1e-14)
          << "T=" << period << " h=" << depth;
    }
}

TEST(LinearWaves, ShoreProtectionManualTableC1) {
  // Shore Protection Manual (1984), Appendix C, Table C-1 (values recalled from
  // memory, four decimals): h/L0 = 0.05 -> h/L = 0.0942; h/L0 = 0.1 -> h/L = 0.1410,
  // tanh(kh) = 0.7093.
  const double period = 9.0;
  {
    const double h = depth_for(0.05, period);
    EXPECT_NEAR(h * wavenumber_rad_m(period, h) / (2 * kPi), 0.0942, 1e-4);
  }
  {
    const double h = depth_for(0.1, period);
    const double k = wavenumber_rad_m(period, h);
    EXPECT_NEAR(h * k / (2 * kPi), 0.1410, 1e-4);
    EXPECT_NEAR(std::tanh(k * h), 0.7093, 1e-4);
  }
}

TEST(LinearWaves, LimitsOfGroupVelocityAndShoaling) {
  // Deep water: Cg = C/2 and Ks -> 1; shallow water: Cg -> C -> sqrt(g h).
  const LinearWave deep = linear_wave(8.0, 5000.0);
  EXPECT_NEAR(deep.group_velocity_m_s / deep.celerity_m_s, 0.5, 1e-12);
  EXPECT_NEAR(deep.shoaling_coefficient, 1.0, 1e-12);
  const LinearWave record = linear_wave(8.0, kDeep);
  EXPECT_DOUBLE_EQ(record.shoaling_coefficient, 1.0);
  const LinearWave shallow = linear_wave(16.0, 0.05);
  EXPECT_NEAR(shallow.celerity_m_s / std::sqrt(kGravity_m_s2 * 0.05), 1.0, 1e-3);
  EXPECT_NEAR(shallow.group_velocity_m_s / shallow.celerity_m_s, 1.0, 1e-3);
}

TEST(LinearWaves, ShoalingCoefficientMinimum) {
  // Ks has its minimum, about 0.913, near h/L0 = 0.15 (linear-theory tables,
  // Shore Protection Manual 1984; recalled from memory).
  double best = 10, best_ratio = 0;
  for (double r = 0.05; r <= 0.4; r += 0.001) {
    const double ks = linear_wave(10.0, depth_for(r, 10.0)).shoaling_coefficient;
    if (ks < best) best = ks, best_ratio = r;
  }
  EXPECT_NEAR(best, 0.913, 5e-4);
  EXPECT_NEAR(best_ratio, 0.15, 0.03);
}

TEST(LinearWaves, DeshoalingInvertsShoaling) {
  const double h0 = 2.0, period = 12.0, depth = 20.0;
  const double h = h0 * linear_wave(period, depth).shoaling_coefficient;
  EXPECT_NEAR(deshoal_to_deep_water(h, period, depth), h0, 1e-12);
  EXPECT_DOUBLE_EQ(deshoal_to_deep_water(1.7, period, kDeep), 1.7);
  EXPECT_DOUBLE_EQ(deshoal_to_deep_water(1.7, period, std::numeric_limits<double>::infinity()), 1.7);
}

TEST(LinearWaves, RejectsNonPhysicalInput) {
  EXPECT_THROW(wavenumber_rad_m(0.0, 10.0), std::invalid_argument);
  EXPECT_THROW(wavenumber_rad_m(-3.0, 10.0), std::invalid_argument);
  EXPECT_THROW(wavenumber_rad_m(10.0, 0.0), std::invalid_argument);
  EXPECT_THROW(wavenumber_rad_m(10.0, -1.0), std::invalid_argument);
  EXPECT_THROW(deep_water_wavelength_m(std::numeric_limits<double>::quiet_NaN()), std::invalid_argument);
}

}  // namespace
}  // namespace strandline
