#include "corrections/spectral/band_energy.h"

#include <cmath>
#include <complex>
#include <stdexcept>

#include <numbers>

#include "corrections/core/time_utc.h"

namespace strandline::spectral {

namespace {

// Periodogram terms of one (detrended, rotated) frequency from its raw sums.
struct Rotation {
  double cos_tau, sin_tau, cc, ss;
};

Rotation rotation_from(double count, double cos2_sum, double sin2_sum) {
  const double two_wtau = std::atan2(sin2_sum, cos2_sum);
  const double r = std::hypot(cos2_sum, sin2_sum);
  return {std::cos(0.5 * two_wtau), std::sin(0.5 * two_wtau), 0.5 * (count + r), 0.5 * (count - r)};
}

double cross_term(const Rotation& rot, double ac, double as, double bc, double bs) {
  const double a_cos = rot.cos_tau * ac + rot.sin_tau * as, a_sin = rot.cos_tau * as - rot.sin_tau * ac;
  const double b_cos = rot.cos_tau * bc + rot.sin_tau * bs, b_sin = rot.cos_tau * bs - rot.sin_tau * bc;
  const double c = rot.cc > 0 ? a_cos * b_cos / rot.cc : 0.0;
  const double s = rot.ss > 0 ? a_sin * b_sin / rot.ss : 0.0;
  return 0.5 * (c + s);
}

}  // namespace

BandBasis::BandBasis(std::span<const double> times, std::span<const double> omegas, std::span<const double> weights,
                     bool seasonal)
    : omegas_(omegas.begin(), omegas.end()), weights_(weights.begin(), weights.end()) {
  if (omegas.size() != weights.size()) throw std::invalid_argument("BandBasis: omegas and weights differ in length");
  const Eigen::Index n = static_cast<Eigen::Index>(times.size()), nf = static_cast<Eigen::Index>(omegas.size());
  double mean = 0;
  for (double t : times) mean += t;
  if (n > 0) mean /= static_cast<double>(n);
  t_.resize(n);
  for (Eigen::Index j = 0; j < n; ++j) t_[j] = times[static_cast<std::size_t>(j)] - mean;
  trend_.resize(n, seasonal ? 6 : 2);
  trend_.col(0).setOnes();
  trend_.col(1) = t_;
  if (seasonal) {
    const double annual = 2 * std::numbers::pi / kDaysPerJulianYear;
    trend_.col(2) = (annual * t_.array()).cos().matrix();
    trend_.col(3) = (annual * t_.array()).sin().matrix();
    trend_.col(4) = (2 * annual * t_.array()).cos().matrix();
    trend_.col(5) = (2 * annual * t_.array()).sin().matrix();
  }
  cos_.resize(n, nf);
  sin_.resize(n, nf);
  // cos/sin of w_k t by rotation when the band is uniform (it is in the slope
  // search): one complex multiply per entry instead of a sincos.
  bool uniform = nf > 2;
  for (Eigen::Index k = 2; k < nf && uniform; ++k) {
    const double d0 = omegas[1] - omegas[0], dk = omegas[static_cast<std::size_t>(k)] - omegas[static_cast<std::size_t>(k - 1)];
    uniform = std::abs(dk - d0) <= 1e-9 * std::abs(d0);
  }
  for (Eigen::Index j = 0; j < n; ++j) {
    if (uniform) {
      const double dw = (omegas.back() - omegas.front()) / static_cast<double>(nf - 1);
      std::complex<double> z = std::polar(1.0, omegas[0] * t_[j]);
      const std::complex<double> step = std::polar(1.0, dw * t_[j]);
      for (Eigen::Index k = 0; k < nf; ++k) {
        if (k % 32 == 0) z = std::polar(1.0, (omegas[0] + static_cast<double>(k) * dw) * t_[j]);  // bound drift
        cos_(j, k) = z.real();
        sin_(j, k) = z.imag();
        z *= step;
      }
    } else {
      for (Eigen::Index k = 0; k < nf; ++k) {
        const double phase = omegas[static_cast<std::size_t>(k)] * t_[j];
        cos_(j, k) = std::cos(phase);
        sin_(j, k) = std::sin(phase);
      }
    }
  }
  cos2_ = cos_.array().square() - sin_.array().square();
  sin2_ = 2 * cos_.array() * sin_.array();
  cos_tau_.resize(omegas.size());
  sin_tau_.resize(omegas.size());
  cc_.resize(omegas.size());
  ss_.resize(omegas.size());
  for (Eigen::Index k = 0; k < nf; ++k) {
    const double c2 = cos2_.col(k).sum();
    const double s2 = sin2_.col(k).sum();
    const Rotation r = rotation_from(static_cast<double>(n), c2, s2);
    const auto i = static_cast<std::size_t>(k);
    cos_tau_[i] = r.cos_tau;
    sin_tau_[i] = r.sin_tau;
    cc_[i] = r.cc;
    ss_[i] = r.ss;
  }
}

double BandBasis::energy(std::span<const double> y) const {
  if (y.size() != images()) throw std::invalid_argument("BandBasis::energy: wrong series length");
  const Eigen::Map<const Eigen::VectorXd> yv(y.data(), static_cast<Eigen::Index>(y.size()));
  const Eigen::VectorXd rv = yv - trend_ * trend_.colPivHouseholderQr().solve(yv);
  const Eigen::VectorXd yc = cos_.transpose() * rv, ys = sin_.transpose() * rv;
  double e = 0;
  for (std::size_t k = 0; k < frequencies(); ++k) {
    const auto i = static_cast<Eigen::Index>(k);
    const Rotation rot{cos_tau_[k], sin_tau_[k], cc_[k], ss_[k]};
    e += weights_[k] * cross_term(rot, yc[i], ys[i], yc[i], ys[i]);
  }
  return e;
}

double BandBasis::energy(std::span<const double> y, std::span<const double> multiplicity) const {
  const std::vector<double> zero(y.size(), 0.0);
  return quadratic(y, zero, multiplicity).c;
}

Quadratic BandBasis::quadratic(std::span<const double> x, std::span<const double> w,
                               std::span<const double> multiplicity) const {
  Eigen::MatrixXd m(1, static_cast<Eigen::Index>(images()));
  if (multiplicity.empty()) {
    m.setOnes();
  } else {
    if (multiplicity.size() != images()) throw std::invalid_argument("BandBasis::quadratic: wrong multiplicity length");
    for (std::size_t j = 0; j < images(); ++j) m(0, static_cast<Eigen::Index>(j)) = multiplicity[j];
  }
  return quadratics(x, w, m).front();
}

// Layout of the weighted sums (one row per multiplicity vector):
//   plain: G'MG (upper triangle, row by row), G'Mx, G'Mw          (p(p+1)/2 + 2p)
//   sums:  blocks of nf: G_a cos, G_a sin (a < p), x cos, x sin, w cos, w sin,
//          cos 2wt, sin 2wt                                        ((2p + 6) nf)
// `stride` is the distance between consecutive entries of a row.
Quadratic BandBasis::assemble(const double* plain, const double* sums, std::ptrdiff_t stride) const {
  const Eigen::Index p = trend_.cols(), nf = static_cast<Eigen::Index>(frequencies());
  Eigen::MatrixXd gram(p, p);
  Eigen::VectorXd gx(p), gw(p);
  Eigen::Index col = 0;
  for (Eigen::Index a = 0; a < p; ++a)
    for (Eigen::Index b = a; b < p; ++b) gram(a, b) = gram(b, a) = plain[stride * col++];
  for (Eigen::Index a = 0; a < p; ++a) gx[a] = plain[stride * col++];
  for (Eigen::Index a = 0; a < p; ++a) gw[a] = plain[stride * col++];
  // Rank-revealing solve: a resample may not determine every regressor.
  const Eigen::CompleteOrthogonalDecomposition<Eigen::MatrixXd> solver(gram);
  const Eigen::VectorXd cx = solver.solve(gx), cw = solver.solve(gw);
  const double count = gram(0, 0);
  const Eigen::Index base = 2 * p * nf;
  auto at = [&](Eigen::Index index) { return sums[stride * index]; };
  Quadratic q;
  for (Eigen::Index k = 0; k < nf; ++k) {
    double xc = at(base + k), xs = at(base + nf + k);
    double wc = at(base + 2 * nf + k), ws = at(base + 3 * nf + k);
    for (Eigen::Index a = 0; a < p; ++a) {
      const double gc = at(2 * a * nf + k), gs = at((2 * a + 1) * nf + k);
      xc -= cx[a] * gc;
      xs -= cx[a] * gs;
      wc -= cw[a] * gc;
      ws -= cw[a] * gs;
    }
    const Rotation rot = rotation_from(count, at(base + 4 * nf + k), at(base + 5 * nf + k));
    const double weight = weights_[static_cast<std::size_t>(k)];
    q.a += weight * cross_term(rot, wc, ws, wc, ws);
    q.b += weight * cross_term(rot, xc, xs, wc, ws);
    q.c += weight * cross_term(rot, xc, xs, xc, xs);
  }
  return q;
}

std::vector<Quadratic> BandBasis::quadratics(std::span<const double> x, std::span<const double> w,
                                             const Eigen::MatrixXd& multiplicities) const {
  const Eigen::Index n = static_cast<Eigen::Index>(images()), nf = static_cast<Eigen::Index>(frequencies());
  if (x.size() != images() || w.size() != images() || multiplicities.cols() != n)
    throw std::invalid_argument("BandBasis::quadratics: sizes differ from the basis");
  const Eigen::Map<const Eigen::ArrayXd> xv(x.data(), n), wv(w.data(), n);
  const Eigen::Index p = trend_.cols();
  const Eigen::Index n_plain = p * (p + 1) / 2 + 2 * p, n_sums = (2 * p + 6) * nf, base = 2 * p * nf;
  // Regressors and data side by side: [G | x | w].
  Eigen::MatrixXd gxw(n, p + 2);
  gxw.leftCols(p) = trend_;
  gxw.col(p) = xv.matrix();
  gxw.col(p + 1) = wv.matrix();
  std::vector<Quadratic> out(static_cast<std::size_t>(multiplicities.rows()));

  if (multiplicities.rows() == 1) {
    // One vector: weight the few regressor columns, then two small products.
    const Eigen::VectorXd m = multiplicities.row(0).transpose();
    const Eigen::MatrixXd weighted = gxw.array().colwise() * m.array();
    const Eigen::MatrixXd cross = trend_.transpose() * weighted;  // p x (p + 2)
    const Eigen::MatrixXd cs = cos_.transpose() * weighted, sn = sin_.transpose() * weighted;  // nf x (p + 2)
    std::vector<double> plain(static_cast<std::size_t>(n_plain)), sums(static_cast<std::size_t>(n_sums));
    std::size_t col = 0;
    for (Eigen::Index a = 0; a < p; ++a)
      for (Eigen::Index b = a; b < p; ++b) plain[col++] = cross(a, b);
    for (Eigen::Index a = 0; a < p; ++a) plain[col++] = cross(a, p);
    for (Eigen::Index a = 0; a < p; ++a) plain[col++] = cross(a, p + 1);
    auto put = [&](Eigen::Index block, const Eigen::VectorXd& v) {
      for (Eigen::Index k = 0; k < nf; ++k) sums[static_cast<std::size_t>(block * nf + k)] = v[k];
    };
    for (Eigen::Index a = 0; a < p; ++a) {
      put(2 * a, cs.col(a));
      put(2 * a + 1, sn.col(a));
    }
    put(2 * p + 0, cs.col(p));
    put(2 * p + 1, sn.col(p));
    put(2 * p + 2, cs.col(p + 1));
    put(2 * p + 3, sn.col(p + 1));
    put(2 * p + 4, cos2_.transpose() * m);
    put(2 * p + 5, sin2_.transpose() * m);
    out[0] = assemble(plain.data(), sums.data(), 1);
    return out;
  }

  // Many vectors: every weighted sum is linear in the multiplicities, so one
  // matrix product per table gives them for all rows.
  Eigen::MatrixXd plain(n, n_plain);
  Eigen::Index col = 0;
  for (Eigen::Index a = 0; a < p; ++a)
    for (Eigen::Index b = a; b < p; ++b) plain.col(col++) = trend_.col(a).cwiseProduct(trend_.col(b));
  for (Eigen::Index a = 0; a < p; ++a) plain.col(col++) = (trend_.col(a).array() * xv).matrix();
  for (Eigen::Index a = 0; a < p; ++a) plain.col(col++) = (trend_.col(a).array() * wv).matrix();
  Eigen::MatrixXd table(n, n_sums);
  for (Eigen::Index a = 0; a < p; ++a) {
    table.middleCols((2 * a) * nf, nf) = cos_.array().colwise() * trend_.col(a).array();
    table.middleCols((2 * a + 1) * nf, nf) = sin_.array().colwise() * trend_.col(a).array();
  }
  table.middleCols(base + 0 * nf, nf) = cos_.array().colwise() * xv;
  table.middleCols(base + 1 * nf, nf) = sin_.array().colwise() * xv;
  table.middleCols(base + 2 * nf, nf) = cos_.array().colwise() * wv;
  table.middleCols(base + 3 * nf, nf) = sin_.array().colwise() * wv;
  table.middleCols(base + 4 * nf, nf) = cos2_;
  table.middleCols(base + 5 * nf, nf) = sin2_;
  // Row-major results so that each row's sums are contiguous.
  const Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor> plain_sums = multiplicities * plain;
  const Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor> sums = multiplicities * table;
  for (Eigen::Index r = 0; r < multiplicities.rows(); ++r)
    out[static_cast<std::size_t>(r)] = assemble(plain_sums.row(r).data(), sums.row(r).data(), 1);
  return out;
}

}  // namespace strandline::spectral
