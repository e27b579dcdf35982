// The fundamental astronomical variables of the harmonic method (Schureman 1958,
// US C&GS Special Publication 98; Doodson's variables as used by Foreman 1977):
// mean longitudes of the Moon (s), Sun (h), lunar perigee (p), lunar ascending
// node (N), solar perigee (p1), the hour angle of the mean Sun (T) and the mean
// lunar time tau = T + h - s, all in degrees. Mean elements are the polynomials
// in Julian centuries from J2000 of Meeus (Astronomical Algorithms, 2nd ed. 1998,
// eqs. 22.2, 25.2, 25.3, 47.1, 47.4, 47.7), evaluated in UT (Delta-T, about a
// minute, moves M2 by ~0.02 deg and is ignored, as tide tables do).
#pragma once

#include "corrections/core/time_utc.h"

namespace strandline::tide {

struct AstronomicalArguments {
  double tau_deg = 0;  // mean lunar time, T + h - s
  double s_deg = 0;    // Moon's mean longitude
  double h_deg = 0;    // Sun's mean longitude
  double p_deg = 0;    // longitude of the lunar perigee
  double n_deg = 0;    // longitude of the Moon's ascending node (N; Doodson's N' = -N)
  double p1_deg = 0;   // longitude of the solar perigee
  double t_deg = 0;    // hour angle of the mean Sun at Greenwich (0 at noon UT)
  double obliquity_deg = 0;  // mean obliquity of the ecliptic (omega in Schureman)
};

// Rates of the same variables in degrees per mean solar hour at J2000 (the
// derivatives of the polynomials); constituent speeds are combinations of them.
struct AstronomicalRates {
  double tau_deg_per_h;
  double s_deg_per_h;
  double h_deg_per_h;
  double p_deg_per_h;
  double n_deg_per_h;
  double p1_deg_per_h;
};

// Inclination of the lunar orbit to the ecliptic (Schureman's i).
inline constexpr double kLunarOrbitInclinationDeg = 5.145;

AstronomicalArguments astronomical_arguments(TimeS time_s);
const AstronomicalRates& astronomical_rates();

// Reduces an angle to [0, 360).
double wrap_deg_360(double angle_deg);

}  // namespace strandline::tide
