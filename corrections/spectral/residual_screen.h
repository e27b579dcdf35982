// First robust outlier screen of the slope search, applied to the residuals of a
// provisional correction (never to raw positions: the raw series swings by
// (tidal range)/tan(beta), so trimming raw extremes removes the most informative
// images and biases the slope steep). A point is screened out when it departs from
// the running median of its neighbours (a window of images in time order) by more
// than k * 1.4826 * MAD of all such departures (Hampel identifier).
#pragma once

#include <cstddef>
#include <span>
#include <vector>

namespace strandline::spectral {

struct ResidualScreenOptions {
  std::size_t half_window = 5;  // neighbours on each side in the running median
  double k = 3.5;               // common practice: 3 to 3.5
};

// `values` in time order; `keep` (same length) marks the points to consider and
// is cleared where a point is screened out. Returns the number screened out.
std::size_t screen_residuals(std::span<const double> values, std::vector<char>& keep,
                             const ResidualScreenOptions& options);

// Median of a copy (0 for no values).
double median_of(std::vector<double> values);
// Linearly interpolated quantile (q in [0, 1]) of a copy, as numpy's default.
double quantile_of(std::vector<double> values, double q);

}  // namespace strandline::spectral
