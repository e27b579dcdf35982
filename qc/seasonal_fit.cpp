#include "qc/seasonal_fit.h"

#include <cmath>
#include <limits>
#include <numbers>

#include <Eigen/Dense>

namespace strandline {

SeasonalFit fit_annual_harmonic(const std::vector<TrendSample>& samples, bool weighted) {
  constexpr double nan = std::numeric_limits<double>::quiet_NaN();
  SeasonalFit f{false, nan, nan, nan, nan};
  const std::size_t n = samples.size();
  if (n < 8) return f;
  double t0 = samples.front().t_years, t1 = t0, tm = 0;
  for (const auto& s : samples) {
    t0 = std::min(t0, s.t_years);
    t1 = std::max(t1, s.t_years);
    tm += s.t_years / double(n);
  }
  if (t1 - t0 < 1.0) return f;
  Eigen::MatrixXd a(n, 4);
  Eigen::VectorXd y(n);
  for (std::size_t i = 0; i < n; ++i) {
    const double sw = weighted ? 1.0 / samples[i].sigma_m : 1.0;
    const double phase = 2 * std::numbers::pi * (samples[i].t_years - 2000.0);
    a.row(i) << sw, sw * (samples[i].t_years - tm), sw * std::cos(phase), sw * std::sin(phase);
    y(i) = sw * samples[i].value_m;
  }
  const Eigen::MatrixXd normal = a.transpose() * a;
  Eigen::LDLT<Eigen::MatrixXd> ldlt(normal);
  if (ldlt.info() != Eigen::Success) return f;
  const Eigen::VectorXd c = ldlt.solve(a.transpose() * y);
  const double s2 = (y - a * c).squaredNorm() / double(n - 4);
  const Eigen::MatrixXd cov = s2 * ldlt.solve(Eigen::MatrixXd::Identity(4, 4));
  const double ca = c(2), cb = c(3);
  f.amplitude_m = std::hypot(ca, cb);
  if (!(f.amplitude_m > 0)) return f;
  f.valid = true;
  const double var = (ca * ca * cov(2, 2) + cb * cb * cov(3, 3) + 2 * ca * cb * cov(2, 3)) / (f.amplitude_m * f.amplitude_m);
  f.amplitude_sigma_m = std::sqrt(std::max(0.0, var));
  double phi = std::atan2(cb, ca) * 180.0 / std::numbers::pi;
  if (phi < 0) phi += 360.0;
  f.phase_deg = phi;
  f.peak_day_of_year = phi / 360.0 * 365.25;
  return f;
}

}  // namespace strandline
