// Linear (Airy) wave theory for a single period: the dispersion relation
// omega^2 = g k tanh(k h), group velocity and the shoaling coefficient, used to
// bring a nearshore significant wave height back to its deep-water equivalent.
// Refraction is not applied (see deshoal_to_deep_water).
#pragma once

namespace strandline {

inline constexpr double kGravity_m_s2 = 9.80665;
inline constexpr double kPi = 3.14159265358979323846;

// Deep-water wavelength L0 = g T^2 / (2 pi).
double deep_water_wavelength_m(double period_s);

// Wavenumber k (rad/m) solving omega^2 = g k tanh(k h) for period T and depth h:
// Newton on kh tanh(kh) = k0 h from the explicit start of Fenton & McKee (1990),
// kh ~ k0h / tanh(k0h^(3/4))^(2/3). Converges to double precision in a few
// steps for every depth. `depth_m` infinite (or NaN) gives the deep-water k0.
// Throws std::invalid_argument for a non-positive period or depth.
double wavenumber_rad_m(double period_s, double depth_m);

// Ratio of group to phase velocity, n = (1 + 2kh / sinh 2kh) / 2 (1/2 in deep water).
double group_ratio(double kh);

struct LinearWave {
  double k_rad_m;        // wavenumber
  double wavelength_m;   // 2 pi / k
  double celerity_m_s;   // phase velocity omega / k
  double group_velocity_m_s;
  double shoaling_coefficient;  // Ks = sqrt(Cg0 / Cg): H = Ks H0 (no refraction)
};

// All of the above for period T at depth h (h infinite/NaN: deep water, Ks = 1).
LinearWave linear_wave(double period_s, double depth_m);

// Deep-water equivalent H0 = H / Ks of a height recorded at depth `depth_m`
// (NaN or infinite depth: the record is already deep water, H0 = H). Energy-flux
// conservation along a ray normal to straight parallel contours; no refraction
// and no breaking are modelled, so a record inside the surf zone (H/h above ~0.78)
// is outside the theory.
double deshoal_to_deep_water(double height_m, double period_s, double depth_m);

}  // namespace strandline
