#include "corrections/tide/nodal_corrections.h"

#include <cmath>
#include <numbers>

#include "corrections/tide/angle_units.h"

namespace strandline::tide {

namespace {

double sq(double x) { return x * x; }

// The "mean" values that normalise each f to 1 over a nodal cycle (Schureman's
// eqs. 65-70 and the denominators of 227 and 235), from omega and i.
struct MeanCoefficients {
  double mm, mf, o1, j1, oo1, m2, k1, k2;
};

MeanCoefficients mean_coefficients(double obliquity_rad) {
  const double w = obliquity_rad;
  const double i = kLunarOrbitInclinationDeg * kRad;
  const double cos_half_i4 = std::pow(std::cos(i / 2), 4);
  const double lunar_factor = 1.0 - 1.5 * sq(std::sin(i));
  MeanCoefficients m{};
  m.mm = (2.0 / 3.0 - sq(std::sin(w))) * lunar_factor;
  m.mf = sq(std::sin(w)) * cos_half_i4;
  m.o1 = std::sin(w) * sq(std::cos(w / 2)) * cos_half_i4;
  m.j1 = std::sin(2 * w) * lunar_factor;
  m.oo1 = std::sin(w) * sq(std::sin(w / 2)) * cos_half_i4;
  m.m2 = std::pow(std::cos(w / 2), 4) * cos_half_i4;
  m.k1 = 0.5023 * std::sin(2 * w) * lunar_factor + 0.1681;
  m.k2 = 0.5023 * sq(std::sin(w)) * lunar_factor + 0.0365;
  return m;
}

}  // namespace

NodeAngles node_angles(const AstronomicalArguments& a) {
  const double w = a.obliquity_deg * kRad;
  const double i = kLunarOrbitInclinationDeg * kRad;
  double n = std::remainder(a.n_deg, 360.0) * kRad;  // (-pi, pi] keeps the half angle in (-pi/2, pi/2]
  NodeAngles out{};
  out.obliquity_deg = a.obliquity_deg;
  // Schureman eq. 191: cos I = cos i cos w - sin i sin w cos N.
  const double big_i = std::acos(std::cos(i) * std::cos(w) - std::sin(i) * std::sin(w) * std::cos(n));
  out.i_deg = big_i * kDeg;
  // Napier's analogies (eqs. 192-193): tan((N - xi + nu)/2) and tan((N - xi - nu)/2).
  const double half_n = n / 2;
  const double a_plus = std::atan2(std::cos((w - i) / 2) * std::sin(half_n), std::cos((w + i) / 2) * std::cos(half_n));
  const double a_minus = std::atan2(std::sin((w - i) / 2) * std::sin(half_n), std::sin((w + i) / 2) * std::cos(half_n));
  const double e_plus = a_plus - half_n;   // (nu - xi) / 2
  const double e_minus = a_minus - half_n;  // (-nu - xi) / 2
  const double xi = -(e_plus + e_minus);
  const double nu = e_plus - e_minus;
  out.xi_deg = xi * kDeg;
  out.nu_deg = nu * kDeg;
  // eq. 224: tan nu' = sin 2I sin nu / (sin 2I cos nu + 0.3347)
  out.nu1_deg = std::atan2(std::sin(2 * big_i) * std::sin(nu), std::sin(2 * big_i) * std::cos(nu) + 0.3347) * kDeg;
  // eq. 232: tan 2nu'' = sin^2 I sin 2nu / (sin^2 I cos 2nu + 0.0727)
  out.two_nu2_deg =
      std::atan2(sq(std::sin(big_i)) * std::sin(2 * nu), sq(std::sin(big_i)) * std::cos(2 * nu) + 0.0727) * kDeg;
  out.p_minus_xi_deg = a.p_deg - out.xi_deg;
  return out;
}

std::array<NodalFactor, kNodalRuleCount> nodal_factors(const NodeAngles& g) {
  const double big_i = g.i_deg * kRad;
  const double xi = g.xi_deg;
  const double nu = g.nu_deg;
  const MeanCoefficients mean = mean_coefficients(g.obliquity_deg * kRad);
  const double sin_i = std::sin(big_i), cos_half = std::cos(big_i / 2), sin_half = std::sin(big_i / 2);
  const double sin_2i = std::sin(2 * big_i);
  const double f_m2 = std::pow(cos_half, 4) / mean.m2;
  const double u_m2 = 2 * xi - 2 * nu;
  auto at = [](NodalRule r) { return static_cast<std::size_t>(r); };

  std::array<NodalFactor, kNodalRuleCount> out;
  out[at(NodalRule::none)] = {1.0, 0.0};
  out[at(NodalRule::mm)] = {(2.0 / 3.0 - sq(sin_i)) / mean.mm, 0.0};
  out[at(NodalRule::mf)] = {sq(sin_i) / mean.mf, -2 * xi};
  out[at(NodalRule::o1)] = {sin_i * sq(cos_half) / mean.o1, 2 * xi - nu};
  out[at(NodalRule::j1)] = {sin_2i / mean.j1, -nu};
  out[at(NodalRule::oo1)] = {sin_i * sq(sin_half) / mean.oo1, -2 * xi - nu};
  out[at(NodalRule::m2)] = {f_m2, u_m2};
  {
    const double amp = std::sqrt(0.2523 * sq(sin_2i) + 0.1689 * sin_2i * std::cos(nu * kRad) + 0.0283);
    out[at(NodalRule::k1)] = {amp / mean.k1, -g.nu1_deg};
  }
  {
    const double si2 = sq(sin_i);
    const double amp = std::sqrt(0.2523 * sq(si2) + 0.0367 * si2 * std::cos(2 * nu * kRad) + 0.0013);
    out[at(NodalRule::k2)] = {amp / mean.k2, -g.two_nu2_deg};
  }
  {
    const double two_p = 2 * g.p_minus_xi_deg * kRad;
    const double tan_half_i2 = sq(sin_half / cos_half);
    const double inv_ra = std::sqrt(1 - 12 * tan_half_i2 * std::cos(two_p) + 36 * sq(tan_half_i2));
    // eq. 214: tan R = sin 2P / (cot^2(I/2) / 6 - cos 2P)
    const double r_deg = std::atan2(std::sin(two_p), 1.0 / (6.0 * tan_half_i2) - std::cos(two_p)) * kDeg;
    out[at(NodalRule::l2)] = {f_m2 * inv_ra, u_m2 - r_deg};
  }
  out[at(NodalRule::m3)] = {f_m2 * std::sqrt(f_m2), 1.5 * u_m2};
  return out;
}

NodalFactor nodal_factor(NodalRule rule, const NodeAngles& angles) {
  return nodal_factors(angles)[static_cast<std::size_t>(rule)];
}

}  // namespace strandline::tide
