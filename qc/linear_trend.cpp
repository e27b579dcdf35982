#include "qc/linear_trend.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "qc/student_t.h"

namespace strandline {

LinearTrend fit_linear_trend(const std::vector<TrendSample>& samples, bool weighted) {
  constexpr double nan = std::numeric_limits<double>::quiet_NaN();
  LinearTrend r;
  r.rate_m_per_yr = r.intercept_m = r.t_mean_years = r.se_naive_m_per_yr = nan;
  r.lag1_autocorrelation = r.n_effective = r.se_m_per_yr = r.dof = r.t_quantile = r.ci95_low = r.ci95_high = nan;
  const std::size_t n = samples.size();
  r.n = n;
  if (n < 3) return r;
  std::vector<double> w(n);
  double sw = 0, st = 0, sx = 0;
  for (std::size_t i = 0; i < n; ++i) {
    w[i] = weighted ? 1.0 / (samples[i].sigma_m * samples[i].sigma_m) : 1.0;
    sw += w[i];
    st += w[i] * samples[i].t_years;
    sx += w[i] * samples[i].value_m;
  }
  const double tm = st / sw, xm = sx / sw;
  double stt = 0, stx = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const double dt = samples[i].t_years - tm;
    stt += w[i] * dt * dt;
    stx += w[i] * dt * (samples[i].value_m - xm);
  }
  if (!(stt > 0)) return r;
  r.valid = true;
  r.t_mean_years = tm;
  r.rate_m_per_yr = stx / stt;
  r.intercept_m = xm;
  std::vector<double> e(n);
  double see = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const double res = samples[i].value_m - xm - r.rate_m_per_yr * (samples[i].t_years - tm);
    e[i] = std::sqrt(w[i]) * res;
    see += e[i] * e[i];
  }
  const double s2 = see / double(n - 2);
  r.se_naive_m_per_yr = std::sqrt(s2 / stt);
  double num = 0;
  for (std::size_t i = 1; i < n; ++i) num += e[i] * e[i - 1];
  const double rho = see > 0 ? std::clamp(num / see, 0.0, 0.999) : 0.0;
  r.lag1_autocorrelation = see > 0 ? num / see : 0.0;
  r.n_effective = double(n) * (1 - rho) / (1 + rho);
  if (r.n_effective > 3) {
    r.ci_valid = true;
    r.dof = r.n_effective - 2;
    r.se_m_per_yr = r.se_naive_m_per_yr * std::sqrt(double(n - 2) / r.dof);
    r.t_quantile = student_t_quantile(0.975, r.dof);
    r.ci95_low = r.rate_m_per_yr - r.t_quantile * r.se_m_per_yr;
    r.ci95_high = r.rate_m_per_yr + r.t_quantile * r.se_m_per_yr;
  }
  return r;
}

}  // namespace strandline
