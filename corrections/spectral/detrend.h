// Linear detrending: the residual of a least-squares line y ~ a + b t. Linear in
// y, so detrend(x + s w) = detrend(x) + s detrend(w): the slope search may
// detrend the two parts once.
#pragma once

#include <span>
#include <vector>

namespace strandline::spectral {

struct LineFit {
  double intercept = 0;  // a
  double slope = 0;      // b (per time unit)
};

// Least-squares line through (t, y); a constant when all t are equal; zero for no points.
LineFit fit_line(std::span<const double> t, std::span<const double> y);

std::vector<double> detrend_linear(std::span<const double> t, std::span<const double> y);

// Residual of a least-squares fit of a line plus, when `seasonal`, annual and
// semi-annual sinusoids (t in days). Also linear in y.
std::vector<double> detrend_days(std::span<const double> t_days, std::span<const double> y, bool seasonal);

}  // namespace strandline::spectral
