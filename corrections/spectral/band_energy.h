// Band energy of the Lomb-Scargle periodogram of a detrended series:
//   E(y) = sum_k q_k P_y(w_k)   over the band frequencies w_k with weights q_k
// (quadrature weights in cycles per time unit, so E is the band integral).
// Detrending removes a least-squares fit of a line and, optionally, annual and
// semi-annual sinusoids (times in days): the beach's own seasonal cycle leaks
// into the band through the sampling's spectral window, and so does the part of
// the tide aliased onto it (K1, P1, K2 at a fixed time of day), so the two would
// otherwise trade off against each other in E(s). The fit is linear in the data,
// so it commutes with x + s w.
//
// For the corrected series y = x + s w the periodogram is a quadratic form, so
//   E(s) = A s^2 + 2 B s + C,  A = sum q P_ww, B = sum q P_xw, C = sum q P_xx,
// minimised at s* = -B / A. Images may carry a multiplicity (bootstrap count, 0 =
// left out): every sum of the periodogram and of the detrending line is then
// weighted by it, which is exactly the periodogram of the resampled series.
#pragma once

#include <span>
#include <vector>

#include <Eigen/Dense>

namespace strandline::spectral {

struct Quadratic {
  double a = 0, b = 0, c = 0;  // E(s) = a s^2 + 2 b s + c
  double at(double s) const { return (a * s + 2 * b) * s + c; }
  double argmin() const { return -b / a; }  // meaningful when a > 0
};

class BandBasis {
 public:
  // `times` in days, `omegas` in rad per day. `seasonal` adds the annual and
  // semi-annual sinusoids to the line that is removed.
  BandBasis(std::span<const double> times, std::span<const double> omegas, std::span<const double> weights,
            bool seasonal = false);

  std::size_t images() const { return static_cast<std::size_t>(cos_.rows()); }
  std::size_t frequencies() const { return omegas_.size(); }

  // Band energy of detrend(y), all images once. Detrends explicitly (QR least
  // squares) and sums the periodogram from cached cos/sin tables: independent of
  // the quadratic path.
  double energy(std::span<const double> y) const;
  // The same with images weighted by `multiplicity` (through the quadratic path).
  double energy(std::span<const double> y, std::span<const double> multiplicity) const;

  // The quadratic of x + s w with images weighted by `multiplicity` (empty = all once).
  Quadratic quadratic(std::span<const double> x, std::span<const double> w,
                      std::span<const double> multiplicity = {}) const;
  // One quadratic per row of `multiplicities` (rows x images), by matrix products.
  std::vector<Quadratic> quadratics(std::span<const double> x, std::span<const double> w,
                                    const Eigen::MatrixXd& multiplicities) const;

 private:
  Eigen::VectorXd t_;    // times relative to their mean
  Eigen::MatrixXd trend_;  // images x regressors of the detrending fit
  Eigen::MatrixXd cos_;  // images x frequencies: cos w t
  Eigen::MatrixXd sin_;
  Eigen::MatrixXd cos2_;  // cos 2wt, sin 2wt
  Eigen::MatrixXd sin2_;
  std::vector<double> omegas_, weights_;
  // For energy(): rotation and normalisers with every image once.
  std::vector<double> cos_tau_, sin_tau_, cc_, ss_;

  Quadratic assemble(const double* plain_sums, const double* sums, std::ptrdiff_t stride) const;
};

}  // namespace strandline::spectral
