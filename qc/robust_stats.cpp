#include "qc/robust_stats.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>

namespace strandline {

double median_in_place(std::vector<double>& values) {
  if (values.empty()) return std::numeric_limits<double>::quiet_NaN();
  const std::size_t mid = values.size() / 2;
  std::nth_element(values.begin(), values.begin() + mid, values.end());
  const double upper = values[mid];
  if (values.size() % 2 == 1) return upper;
  const double lower = *std::max_element(values.begin(), values.begin() + mid);
  return 0.5 * (lower + upper);
}

double mad_about(const std::vector<double>& values, double centre) {
  std::vector<double> dev;
  dev.reserve(values.size());
  for (double v : values) dev.push_back(std::abs(v - centre));
  return median_in_place(dev);
}

double chi_square_survival(double x, int dof) {
  if (!(x > 0)) return 1.0;
  if (dof == 1) return std::erfc(std::sqrt(0.5 * x));
  if (dof == 2) return std::exp(-0.5 * x);
  throw std::invalid_argument("chi_square_survival: 1 or 2 degrees of freedom");
}

}  // namespace strandline
