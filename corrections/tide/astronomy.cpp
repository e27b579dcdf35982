#include "corrections/tide/astronomy.h"

#include <cmath>

namespace strandline::tide {

namespace {

constexpr double kUnixEpochJulianDay = 2440587.5;
constexpr double kJ2000JulianDay = 2451545.0;
constexpr double kDaysPerJulianCentury = 36525.0;
constexpr double kHoursPerJulianCentury = kDaysPerJulianCentury * 24.0;

// Mean elements, degrees, as polynomials in Julian centuries T (Meeus 1998).
double moon_mean_longitude(double t) {  // L', eq. 47.1
  return 218.3164477 + t * (481267.88123421 + t * (-0.0015786 + t * (1.0 / 538841.0 - t / 65194000.0)));
}
double moon_mean_anomaly(double t) {  // M', eq. 47.4
  return 134.9633964 + t * (477198.8675055 + t * (0.0087414 + t * (1.0 / 69699.0 - t / 14712000.0)));
}
double moon_node_longitude(double t) {  // Omega, eq. 47.7
  return 125.0445479 + t * (-1934.1362891 + t * (0.0020754 + t * (1.0 / 467441.0 - t / 60616000.0)));
}
double sun_mean_longitude(double t) {  // L0, eq. 25.2
  return 280.46646 + t * (36000.76983 + t * 0.0003032);
}
double sun_mean_anomaly(double t) {  // M, eq. 25.3
  return 357.52911 + t * (35999.05029 - t * 0.0001537);
}
double mean_obliquity(double t) {  // eq. 22.2, arcseconds converted
  const double arcsec = 21.448 + t * (-46.8150 + t * (-0.00059 + t * 0.001813));
  return 23.0 + 26.0 / 60.0 + arcsec / 3600.0;
}

// First derivatives at T = 0, degrees per century.
constexpr double kMoonLongitudeRate = 481267.88123421;
constexpr double kMoonAnomalyRate = 477198.8675055;
constexpr double kNodeRate = -1934.1362891;
constexpr double kSunLongitudeRate = 36000.76983;
constexpr double kSunAnomalyRate = 35999.05029;

}  // namespace

double wrap_deg_360(double angle_deg) {
  double r = std::fmod(angle_deg, 360.0);
  if (r < 0) r += 360.0;
  return r;
}

AstronomicalArguments astronomical_arguments(TimeS time_s) {
  const double days_since_j2000 = time_s / kSecondsPerDay + (kUnixEpochJulianDay - kJ2000JulianDay);
  const double t = days_since_j2000 / kDaysPerJulianCentury;
  AstronomicalArguments a;
  const double s = moon_mean_longitude(t);
  const double h = sun_mean_longitude(t);
  a.s_deg = wrap_deg_360(s);
  a.h_deg = wrap_deg_360(h);
  a.p_deg = wrap_deg_360(s - moon_mean_anomaly(t));
  a.n_deg = wrap_deg_360(moon_node_longitude(t));
  a.p1_deg = wrap_deg_360(h - sun_mean_anomaly(t));
  a.obliquity_deg = mean_obliquity(t);
  // Hour angle of the mean Sun: 180 deg at 00:00 UT. fmod of the seconds keeps
  // full precision of the time of day.
  double seconds_of_day = std::fmod(time_s, kSecondsPerDay);
  if (seconds_of_day < 0) seconds_of_day += kSecondsPerDay;
  a.t_deg = wrap_deg_360(180.0 + seconds_of_day * (360.0 / kSecondsPerDay));
  a.tau_deg = wrap_deg_360(a.t_deg + a.h_deg - a.s_deg);
  return a;
}

const AstronomicalRates& astronomical_rates() {
  static const AstronomicalRates rates = [] {
    AstronomicalRates r{};
    r.s_deg_per_h = kMoonLongitudeRate / kHoursPerJulianCentury;
    r.h_deg_per_h = kSunLongitudeRate / kHoursPerJulianCentury;
    r.p_deg_per_h = (kMoonLongitudeRate - kMoonAnomalyRate) / kHoursPerJulianCentury;
    r.n_deg_per_h = kNodeRate / kHoursPerJulianCentury;
    r.p1_deg_per_h = (kSunLongitudeRate - kSunAnomalyRate) / kHoursPerJulianCentury;
    r.tau_deg_per_h = 15.0 + r.h_deg_per_h - r.s_deg_per_h;
    return r;
  }();
  return rates;
}

}  // namespace strandline::tide
