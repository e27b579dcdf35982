#include "corrections/spectral/detrend.h"

#include <cmath>
#include <numbers>
#include <stdexcept>

#include <Eigen/Dense>

#include "corrections/core/time_utc.h"

namespace strandline::spectral {

LineFit fit_line(std::span<const double> t, std::span<const double> y) {
  if (t.size() != y.size()) throw std::invalid_argument("fit_line: t and y differ in length");
  const std::size_t n = t.size();
  if (n == 0) return {};
  double mean_t = 0, mean_y = 0;
  for (std::size_t i = 0; i < n; ++i) {
    mean_t += t[i];
    mean_y += y[i];
  }
  mean_t /= static_cast<double>(n);
  mean_y /= static_cast<double>(n);
  double stt = 0, sty = 0;
  for (std::size_t i = 0; i < n; ++i) {
    stt += (t[i] - mean_t) * (t[i] - mean_t);
    sty += (t[i] - mean_t) * (y[i] - mean_y);
  }
  LineFit fit;
  fit.slope = stt > 0 ? sty / stt : 0.0;
  fit.intercept = mean_y - fit.slope * mean_t;
  return fit;
}

std::vector<double> detrend_linear(std::span<const double> t, std::span<const double> y) {
  const LineFit fit = fit_line(t, y);
  std::vector<double> r(y.size());
  for (std::size_t i = 0; i < y.size(); ++i) r[i] = y[i] - (fit.intercept + fit.slope * t[i]);
  return r;
}

std::vector<double> detrend_days(std::span<const double> t_days, std::span<const double> y, bool seasonal) {
  if (!seasonal) return detrend_linear(t_days, y);
  if (t_days.size() != y.size()) throw std::invalid_argument("detrend_days: t and y differ in length");
  const auto n = static_cast<Eigen::Index>(t_days.size());
  Eigen::MatrixXd g(n, 6);
  const double annual = 2 * std::numbers::pi / kDaysPerJulianYear;
  for (Eigen::Index j = 0; j < n; ++j) {
    const double t = t_days[static_cast<std::size_t>(j)] - t_days[0];
    g.row(j) << 1.0, t, std::cos(annual * t), std::sin(annual * t), std::cos(2 * annual * t), std::sin(2 * annual * t);
  }
  const Eigen::Map<const Eigen::VectorXd> yv(y.data(), n);
  const Eigen::VectorXd r = yv - g * g.colPivHouseholderQr().solve(yv);
  return {r.data(), r.data() + n};
}

}  // namespace strandline::spectral
