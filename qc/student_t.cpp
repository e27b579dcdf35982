#include "qc/student_t.h"

#include <cmath>
#include <stdexcept>

namespace strandline {

namespace {

double beta_continued_fraction(double x, double a, double b) {
  constexpr double kTiny = 1e-300, kEps = 1e-15;
  const double qab = a + b, qap = a + 1, qam = a - 1;
  double c = 1, d = 1 - qab * x / qap;
  if (std::abs(d) < kTiny) d = kTiny;
  d = 1 / d;
  double h = d;
  for (int m = 1; m <= 500; ++m) {
    const int m2 = 2 * m;
    double aa = m * (b - m) * x / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (std::abs(d) < kTiny) d = kTiny;
    c = 1 + aa / c;
    if (std::abs(c) < kTiny) c = kTiny;
    d = 1 / d;
    h *= d * c;
    aa = -(a + m) * (qab + m) * x / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (std::abs(d) < kTiny) d = kTiny;
    c = 1 + aa / c;
    if (std::abs(c) < kTiny) c = kTiny;
    d = 1 / d;
    const double del = d * c;
    h *= del;
    if (std::abs(del - 1) < kEps) break;
  }
  return h;
}

}  // namespace

double regularized_incomplete_beta(double x, double a, double b) {
  if (!(a > 0 && b > 0) || x < 0 || x > 1) throw std::invalid_argument("regularized_incomplete_beta: bad arguments");
  if (x == 0 || x == 1) return x;
  const double log_front = std::lgamma(a + b) - std::lgamma(a) - std::lgamma(b) + a * std::log(x) + b * std::log1p(-x);
  const double front = std::exp(log_front);
  // The continued fraction converges fast for x < (a + 1) / (a + b + 2); use the symmetry otherwise.
  if (x < (a + 1) / (a + b + 2)) return front * beta_continued_fraction(x, a, b) / a;
  return 1 - front * beta_continued_fraction(1 - x, b, a) / b;
}

double student_t_cdf(double t, double dof) {
  if (!(dof > 0)) throw std::invalid_argument("student_t_cdf: dof must be positive");
  const double x = dof / (dof + t * t);
  const double tail = 0.5 * regularized_incomplete_beta(x, 0.5 * dof, 0.5);  // P(T > |t|)
  return t >= 0 ? 1 - tail : tail;
}

double student_t_quantile(double p, double dof) {
  if (!(p > 0 && p < 1)) throw std::invalid_argument("student_t_quantile: p must lie in (0, 1)");
  if (p < 0.5) return -student_t_quantile(1 - p, dof);
  double lo = 0, hi = 1;
  while (student_t_cdf(hi, dof) < p) hi *= 2;
  for (int i = 0; i < 200 && hi - lo > 1e-12 * hi; ++i) {
    const double mid = 0.5 * (lo + hi);
    (student_t_cdf(mid, dof) < p ? lo : hi) = mid;
  }
  return 0.5 * (lo + hi);
}

}  // namespace strandline
