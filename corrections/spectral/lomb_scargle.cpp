#include "corrections/spectral/lomb_scargle.h"

#include <cmath>
#include <stdexcept>

namespace strandline::spectral {

std::vector<double> LombScargleSpectra::power(std::size_t series) const { return cross_power(series, series); }

std::vector<double> LombScargleSpectra::cross_power(std::size_t a, std::size_t b) const {
  std::vector<double> p(frequencies());
  for (std::size_t k = 0; k < p.size(); ++k) {
    // A vanishing normaliser means the projection vanishes too (all phases equal).
    const double c = cc[k] > 0 ? cos_part[a][k] * cos_part[b][k] / cc[k] : 0.0;
    const double s = ss[k] > 0 ? sin_part[a][k] * sin_part[b][k] / ss[k] : 0.0;
    p[k] = 0.5 * (c + s);
  }
  return p;
}

LombScargleSpectra lomb_scargle_direct(std::span<const double> times, std::span<const double> omegas,
                                       const std::vector<std::span<const double>>& series) {
  for (const auto& y : series)
    if (y.size() != times.size()) throw std::invalid_argument("lomb_scargle_direct: series length differs from times");
  const std::size_t nf = omegas.size(), ns = series.size();
  LombScargleSpectra out;
  out.cc.resize(nf);
  out.ss.resize(nf);
  out.cos_part.assign(ns, std::vector<double>(nf));
  out.sin_part.assign(ns, std::vector<double>(nf));
  std::vector<double> yc(ns), ys(ns);
  for (std::size_t k = 0; k < nf; ++k) {
    const double w = omegas[k];
    double cc = 0, ss = 0, cs = 0;
    std::fill(yc.begin(), yc.end(), 0.0);
    std::fill(ys.begin(), ys.end(), 0.0);
    for (std::size_t j = 0; j < times.size(); ++j) {
      const double c = std::cos(w * times[j]), s = std::sin(w * times[j]);
      cc += c * c;
      ss += s * s;
      cs += c * s;
      for (std::size_t i = 0; i < ns; ++i) {
        yc[i] += series[i][j] * c;
        ys[i] += series[i][j] * s;
      }
    }
    const double tau = std::atan2(2 * cs, cc - ss) / (2 * w);
    const double ct = std::cos(w * tau), st = std::sin(w * tau);
    out.cc[k] = ct * ct * cc + 2 * ct * st * cs + st * st * ss;
    out.ss[k] = ct * ct * ss - 2 * ct * st * cs + st * st * cc;
    for (std::size_t i = 0; i < ns; ++i) {
      out.cos_part[i][k] = ct * yc[i] + st * ys[i];
      out.sin_part[i][k] = ct * ys[i] - st * yc[i];
    }
  }
  return out;
}

std::vector<double> lomb_scargle_power_direct(std::span<const double> times, std::span<const double> omegas,
                                              std::span<const double> values) {
  return lomb_scargle_direct(times, omegas, {values}).power(0);
}

}  // namespace strandline::spectral
