#include "corrections/spectral/residual_screen.h"

#include <algorithm>
#include <cmath>
#include <stdexcept>

namespace strandline::spectral {

double median_of(std::vector<double> values) {
  if (values.empty()) return 0.0;
  const std::size_t mid = values.size() / 2;
  std::nth_element(values.begin(), values.begin() + static_cast<long>(mid), values.end());
  const double upper = values[mid];
  if (values.size() % 2 == 1) return upper;
  const double lower = *std::max_element(values.begin(), values.begin() + static_cast<long>(mid));
  return 0.5 * (lower + upper);
}

double quantile_of(std::vector<double> values, double q) {
  if (values.empty()) return 0.0;
  std::sort(values.begin(), values.end());
  const double position = q * static_cast<double>(values.size() - 1);
  const auto below = static_cast<std::size_t>(std::floor(position));
  const std::size_t above = std::min(below + 1, values.size() - 1);
  const double fraction = position - static_cast<double>(below);
  return values[below] + fraction * (values[above] - values[below]);
}

std::size_t screen_residuals(std::span<const double> values, std::vector<char>& keep,
                             const ResidualScreenOptions& options) {
  if (keep.size() != values.size()) throw std::invalid_argument("screen_residuals: keep has the wrong length");
  std::vector<std::size_t> kept;
  for (std::size_t i = 0; i < values.size(); ++i)
    if (keep[i]) kept.push_back(i);
  const std::size_t n = kept.size();
  if (n < 2 * options.half_window + 1) return 0;
  std::vector<double> departure(n), window;
  for (std::size_t i = 0; i < n; ++i) {
    const std::size_t lo = i >= options.half_window ? i - options.half_window : 0;
    const std::size_t hi = std::min(n - 1, i + options.half_window);
    window.clear();
    for (std::size_t j = lo; j <= hi; ++j) window.push_back(values[kept[j]]);
    departure[i] = values[kept[i]] - median_of(window);
  }
  std::vector<double> absolute(n);
  const double centre = median_of(departure);
  for (std::size_t i = 0; i < n; ++i) absolute[i] = std::abs(departure[i] - centre);
  const double mad = median_of(absolute);
  if (!(mad > 0)) return 0;
  const double limit = options.k * 1.4826 * mad;
  std::size_t removed = 0;
  for (std::size_t i = 0; i < n; ++i)
    if (absolute[i] > limit) {
      keep[kept[i]] = 0;
      ++removed;
    }
  return removed;
}

}  // namespace strandline::spectral
