// Weighted linear trend of a shoreline series with a 95% confidence interval
// that accounts for serial correlation.
//   weights     w = 1/sigma^2 (all 1 when `weighted` is false)
//   fit         x = a + b (t - t_w), t_w the weighted mean time, by weighted least squares
//   naive SE    se_b = sqrt(s^2 / sum w (t - t_w)^2), s^2 = sum w e^2 / (n - 2)
//               (residual-scaled: the scatter about the line, not the stated sigmas,
//               sets the width; unweighted it is scipy.stats.linregress's stderr)
//   serial      rho = lag-1 autocorrelation of the standardised residuals sqrt(w) e
//   correlation in time order (negative values taken as 0), effective sample size
//               n_eff = n (1 - rho) / (1 + rho), and the SE recomputed with n_eff - 2
//               degrees of freedom: se = se_b sqrt((n - 2) / (n_eff - 2))
//               (Santer et al. 2000, J. Geophys. Res. 105(D6), 7337-7356)
//   interval    b -+ t_{0.975, n_eff - 2} se
// Times are in (Julian) years, values in metres: rates in m/yr.
#pragma once

#include <vector>

namespace strandline {

struct TrendSample {
  double t_years;
  double value_m;
  double sigma_m = 1.0;  // used when weighted
};

struct LinearTrend {
  bool valid = false;  // at least 3 points spread in time
  std::size_t n = 0;
  double rate_m_per_yr, intercept_m, t_mean_years;  // x = intercept + rate (t - t_mean)
  double se_naive_m_per_yr;
  double lag1_autocorrelation, n_effective;
  bool ci_valid = false;  // n_eff > 3
  double se_m_per_yr, dof, t_quantile, ci95_low, ci95_high;
};

// Samples in time order (the autocorrelation follows that order).
LinearTrend fit_linear_trend(const std::vector<TrendSample>& samples, bool weighted);

}  // namespace strandline
