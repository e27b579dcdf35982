#include "corrections/waves/linear_waves.h"

#include <cmath>
#include <stdexcept>
#include <string>

namespace strandline {

namespace {
bool is_deep(double depth_m) { return std::isnan(depth_m) || std::isinf(depth_m); }

void check_period(double period_s) {
  if (!(period_s > 0) || !std::isfinite(period_s))
    throw std::invalid_argument("wave period must be positive and finite (got " + std::to_string(period_s) + ")");
}
}  // namespace

double deep_water_wavelength_m(double period_s) {
  check_period(period_s);
  return kGravity_m_s2 * period_s * period_s / (2.0 * kPi);
}

double wavenumber_rad_m(double period_s, double depth_m) {
  check_period(period_s);
  const double omega = 2.0 * kPi / period_s;
  const double k0 = omega * omega / kGravity_m_s2;
  if (is_deep(depth_m)) return k0;
  if (!(depth_m > 0)) throw std::invalid_argument("water depth must be positive (got " + std::to_string(depth_m) + ")");
  const double k0h = k0 * depth_m;
  // Fenton & McKee (1990) explicit approximation, then Newton on
  // f(x) = x tanh x - k0h with f'(x) = tanh x + x sech^2 x (f convex for x > 0,
  // so Newton from any start converges monotonically after one step).
  double x = k0h / std::pow(std::tanh(std::pow(k0h, 0.75)), 2.0 / 3.0);
  for (int iteration = 0; iteration < 50; ++iteration) {
    const double t = std::tanh(x);
    const double sech = x > 350 ? 0.0 : 1.0 / std::cosh(x);
    const double f = x * t - k0h;
    const double step = f / (t + x * sech * sech);
    x -= step;
    if (std::abs(step) <= 1e-15 * x) break;
  }
  return x / depth_m;
}

double group_ratio(double kh) {
  if (kh > 350) return 0.5;  // 2kh / sinh(2kh) underflows: deep water
  return 0.5 * (1.0 + 2.0 * kh / std::sinh(2.0 * kh));
}

LinearWave linear_wave(double period_s, double depth_m) {
  const double k = wavenumber_rad_m(period_s, depth_m);
  const double omega = 2.0 * kPi / period_s;
  const double c = omega / k;
  const double n = is_deep(depth_m) ? 0.5 : group_ratio(k * depth_m);
  const double cg = n * c;
  const double cg0 = 0.5 * kGravity_m_s2 / omega;  // deep-water group velocity g T / (4 pi)
  return {k, 2.0 * kPi / k, c, cg, std::sqrt(cg0 / cg)};
}

double deshoal_to_deep_water(double height_m, double period_s, double depth_m) {
  if (is_deep(depth_m)) {
    check_period(period_s);
    return height_m;
  }
  return height_m / linear_wave(period_s, depth_m).shoaling_coefficient;
}

}  // namespace strandline
