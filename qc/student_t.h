// Student's t distribution for real degrees of freedom (effective sample sizes
// are not integers): CDF through the regularised incomplete beta function
// (continued fraction evaluated by the modified Lentz method, as in Press et al.,
// Numerical Recipes, 3rd ed., section 6.4 - recalled from memory) and the
// quantile by bisection. Checked against scipy.stats.t in
// tests/reference/check_trend.py.
#pragma once

namespace strandline {

// I_x(a, b), 0 <= x <= 1, a, b > 0.
double regularized_incomplete_beta(double x, double a, double b);
// P(T <= t) for T ~ t(dof), dof > 0.
double student_t_cdf(double t, double dof);
// t with P(T <= t) = p, 0 < p < 1.
double student_t_quantile(double p, double dof);

}  // namespace strandline
