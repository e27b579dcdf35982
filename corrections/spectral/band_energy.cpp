#include "corrections/spectral/band_energy.h"

#include <cmath>
#include <stdexcept>

#include "corrections/spectral/detrend.h"

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

BandBasis::BandBasis(std::span<const double> times, std::span<const double> omegas, std::span<const double> weights)
    : omegas_(omegas.begin(), omegas.end()), weights_(weights.begin(), weights.end()) {
  if (omegas.size() != weights.size()) throw std::invalid_argument("BandBasis: omegas and weights differ in length");
  const Eigen::Index n = static_cast<Eigen::Index>(times.size()), nf = static_cast<Eigen::Index>(omegas.size());
  double mean = 0;
  for (double t : times) mean += t;
  if (n > 0) mean /= static_cast<double>(n);
  t_.resize(n);
  for (Eigen::Index j = 0; j < n; ++j) t_[j] = times[static_cast<std::size_t>(j)] - mean;
  cos_.resize(n, nf);
  sin_.resize(n, nf);
  for (Eigen::Index k = 0; k < nf; ++k)
    for (Eigen::Index j = 0; j < n; ++j) {
      const double phase = omegas[static_cast<std::size_t>(k)] * t_[j];
      cos_(j, k) = std::cos(phase);
      sin_(j, k) = std::sin(phase);
    }
  cos_tau_.resize(omegas.size());
  sin_tau_.resize(omegas.size());
  cc_.resize(omegas.size());
  ss_.resize(omegas.size());
  for (Eigen::Index k = 0; k < nf; ++k) {
    const double c2 = (cos_.col(k).array().square() - sin_.col(k).array().square()).sum();
    const double s2 = 2 * (cos_.col(k).array() * sin_.col(k).array()).sum();
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
  std::vector<double> t(images());
  for (std::size_t j = 0; j < t.size(); ++j) t[j] = t_[static_cast<Eigen::Index>(j)];
  const std::vector<double> r = detrend_linear(t, y);
  const Eigen::Map<const Eigen::VectorXd> rv(r.data(), static_cast<Eigen::Index>(r.size()));
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

std::vector<Quadratic> BandBasis::quadratics(std::span<const double> x, std::span<const double> w,
                                             const Eigen::MatrixXd& multiplicities) const {
  const Eigen::Index n = static_cast<Eigen::Index>(images()), nf = static_cast<Eigen::Index>(frequencies());
  if (x.size() != images() || w.size() != images() || multiplicities.cols() != n)
    throw std::invalid_argument("BandBasis::quadratics: sizes differ from the basis");
  const Eigen::Map<const Eigen::ArrayXd> xv(x.data(), n), wv(w.data(), n);
  const Eigen::ArrayXd t = t_.array();

  // Line-fit sums (1, t, t^2, x, t x, w, t w) and, per frequency, the ten sums
  // that give the detrended, rotated projections of x and w.
  Eigen::MatrixXd plain(n, 7);
  plain.col(0).setOnes();
  plain.col(1) = t.matrix();
  plain.col(2) = t.square().matrix();
  plain.col(3) = xv.matrix();
  plain.col(4) = (t * xv).matrix();
  plain.col(5) = wv.matrix();
  plain.col(6) = (t * wv).matrix();
  Eigen::MatrixXd table(n, 10 * nf);
  table.middleCols(0 * nf, nf) = cos_;
  table.middleCols(1 * nf, nf) = sin_;
  table.middleCols(2 * nf, nf) = cos_.array().colwise() * t;
  table.middleCols(3 * nf, nf) = sin_.array().colwise() * t;
  table.middleCols(4 * nf, nf) = cos_.array().colwise() * xv;
  table.middleCols(5 * nf, nf) = sin_.array().colwise() * xv;
  table.middleCols(6 * nf, nf) = cos_.array().colwise() * wv;
  table.middleCols(7 * nf, nf) = sin_.array().colwise() * wv;
  table.middleCols(8 * nf, nf) = cos_.array().square() - sin_.array().square();
  table.middleCols(9 * nf, nf) = 2 * cos_.array() * sin_.array();
  const Eigen::MatrixXd line_sums = multiplicities * plain;
  const Eigen::MatrixXd sums = multiplicities * table;

  std::vector<Quadratic> out(static_cast<std::size_t>(multiplicities.rows()));
  for (Eigen::Index r = 0; r < multiplicities.rows(); ++r) {
    const double s0 = line_sums(r, 0), st = line_sums(r, 1), stt = line_sums(r, 2);
    const double det = s0 * stt - st * st;
    auto line = [&](double sy, double sty) {
      const double b = det > 0 ? (s0 * sty - st * sy) / det : 0.0;
      const double a = s0 > 0 ? (sy - b * st) / s0 : 0.0;
      return std::pair{a, b};
    };
    const auto [ax, bx] = line(line_sums(r, 3), line_sums(r, 4));
    const auto [aw, bw] = line(line_sums(r, 5), line_sums(r, 6));
    Quadratic q;
    for (Eigen::Index k = 0; k < nf; ++k) {
      auto at = [&](int block) { return sums(r, block * nf + k); };
      const double c = at(0), s = at(1), tc = at(2), ts = at(3);
      const double xc = at(4) - ax * c - bx * tc, xs = at(5) - ax * s - bx * ts;
      const double wc = at(6) - aw * c - bw * tc, ws = at(7) - aw * s - bw * ts;
      const Rotation rot = rotation_from(s0, at(8), at(9));
      const double weight = weights_[static_cast<std::size_t>(k)];
      q.a += weight * cross_term(rot, wc, ws, wc, ws);
      q.b += weight * cross_term(rot, xc, xs, wc, ws);
      q.c += weight * cross_term(rot, xc, xs, xc, xs);
    }
    out[static_cast<std::size_t>(r)] = q;
  }
  return out;
}

}  // namespace strandline::spectral
