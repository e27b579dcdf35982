// Small robust statistics shared by the QC filters.
#pragma once

#include <vector>

namespace strandline {

// MAD -> standard deviation for Gaussian data: 1 / Phi^-1(3/4) (Hampel 1974;
// checked against scipy.stats.norm.ppf in tests/reference/check_trend.py).
inline constexpr double kMadToSigma = 1.482602218505602;

// Median of `values` (reordered in place); NaN when empty.
double median_in_place(std::vector<double>& values);
// Median absolute deviation from `centre` (the values are not modified).
double mad_about(const std::vector<double>& values, double centre);

// Upper tail probability of a chi-square variable with 1 or 2 degrees of freedom
// (closed forms: erfc(sqrt(x/2)) and exp(-x/2)).
double chi_square_survival(double x, int dof);

}  // namespace strandline
