#include "corrections/spectral/detrend.h"

#include <stdexcept>

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

}  // namespace strandline::spectral
