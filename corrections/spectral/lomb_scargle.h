// Lomb-Scargle periodogram in the convention of scipy.signal.lombscargle
// (scipy 1.10, precenter=False, normalize=False): angular frequencies in radians
// per time unit, and for each frequency w
//   P(w) = 1/2 [ (sum y cos w(t-tau))^2 / sum cos^2 w(t-tau)
//              + (sum y sin w(t-tau))^2 / sum sin^2 w(t-tau) ],
//   tan(2 w tau) = sum sin 2wt / sum cos 2wt.
// The spectra keep the rotated projections of every series so that the
// cross-periodogram of two series (the bilinear form behind P) is available:
//   P_xy(w) = 1/2 [ Xc Yc / CC + Xs Ys / SS ],  P_(x+s y) = P_xx + 2 s P_xy + s^2 P_yy.
#pragma once

#include <cstddef>
#include <span>
#include <vector>

namespace strandline::spectral {

struct LombScargleSpectra {
  std::vector<double> cc;  // sum cos^2 w(t - tau), per frequency
  std::vector<double> ss;  // sum sin^2 w(t - tau)
  // Per series, per frequency: sum y cos w(t - tau) and sum y sin w(t - tau).
  std::vector<std::vector<double>> cos_part;
  std::vector<std::vector<double>> sin_part;

  std::size_t frequencies() const { return cc.size(); }
  std::vector<double> power(std::size_t series) const;
  std::vector<double> cross_power(std::size_t a, std::size_t b) const;
};

// The O(N F) definition, summed literally as scipy does (the test oracle).
// Every series has the length of `times`.
LombScargleSpectra lomb_scargle_direct(std::span<const double> times, std::span<const double> omegas,
                                       const std::vector<std::span<const double>>& series);

// Power of one series, O(N F).
std::vector<double> lomb_scargle_power_direct(std::span<const double> times, std::span<const double> omegas,
                                              std::span<const double> values);

}  // namespace strandline::spectral
