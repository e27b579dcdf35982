// Fast Lomb-Scargle by extirpolation and FFT (Press & Rybicki 1989, ApJ 338:277),
// on FFTW, O(N log N), for a uniform grid of angular frequencies
//   w_k = omega0 + k d_omega,  k = 0 .. count-1.
//
// Each sample y_j e^{i omega0 t_j} is spread ("extirpolated") onto a periodic mesh
// of M points by Lagrange weights of `extirpolation_order` points, placed at the
// fractional mesh coordinate u_j = M frac(t_j d_omega / 2 pi); one complex FFT
// then gives sum_j y_j e^{i w_k t_j} for every k at once. Because e^{i k d_omega t}
// is exactly M-periodic in u, wrapping the mesh is exact, so the mesh needs no
// room for the time span: only its density matters. The sums at 2 w_k (for tau
// and the normalisers) come from a second FFT of e^{2 i omega0 t_j}, read at
// bins 2k. Accuracy is set by the mesh oversampling mu = M / (2 count) (mesh
// points per cycle of the highest mesh frequency used) and the order p. Measured
// worst error of the power relative to the spectrum's peak, against the direct
// sum on irregular series (tests/unit/fast_lomb_scargle_test.cpp):
//   mu 4: p 4 2e-3, p 6 1e-4, p 8 3e-5, p 10 7e-6;  mu 8: p 4 1e-4, p 6 3e-6,
//   p 8 2e-7, p 10 1e-8.
// The error scales with the magnitude of the samples, so a series with a large
// mean (raw chainage) shows a larger error relative to its tidal peak than a
// detrended one, most where sum sin^2 w(t - tau) is small (near the aliases of a
// near-regular sampling). Default mu = 8, p = 10: 2e-7 to 4e-6 of the peak
// against scipy (tests/reference/check_lomb_scargle.py asserts 5e-6; the unit
// test 2e-6 against the direct sum).
// The slope search only picks the tidal peak from this spectrum; its band
// energies are summed directly (band_energy.h), so this accuracy is ample.
//
// The FFTW plan is made once per instance (under a global lock: FFTW's planner
// is not thread-safe) and executed with new arrays, so one instance serves every
// thread concurrently.
#pragma once

#include <cstddef>
#include <span>
#include <vector>

#include "corrections/spectral/lomb_scargle.h"

namespace strandline::spectral {

struct UniformAngularGrid {
  double omega0 = 0;   // first angular frequency (rad per time unit), > 0
  double d_omega = 0;  // spacing, > 0
  std::size_t count = 0;
  double omega(std::size_t k) const { return omega0 + static_cast<double>(k) * d_omega; }
  std::vector<double> omegas() const;
};

struct FastLombScargleOptions {
  int mesh_oversampling = 8;    // mu: mesh points >= mu * 2 * count, rounded up to a power of two
  int extirpolation_order = 10;  // p: Lagrange points per sample
};

class FastLombScargle {
 public:
  explicit FastLombScargle(const UniformAngularGrid& grid, const FastLombScargleOptions& options = {});
  ~FastLombScargle();
  FastLombScargle(const FastLombScargle&) = delete;
  FastLombScargle& operator=(const FastLombScargle&) = delete;

  // Same result as lomb_scargle_direct on grid.omegas(), to the stated accuracy.
  LombScargleSpectra compute(std::span<const double> times, const std::vector<std::span<const double>>& series) const;
  std::vector<double> power(std::span<const double> times, std::span<const double> values) const;

  const UniformAngularGrid& grid() const { return grid_; }
  std::size_t mesh_size() const { return mesh_size_; }

 private:
  UniformAngularGrid grid_;
  FastLombScargleOptions options_;
  std::size_t mesh_size_ = 0;
  void* plan_ = nullptr;  // fftw_plan (kept out of the header)
};

// Smallest power of two >= minimum (FFTW_ESTIMATE plans these well).
std::size_t fft_friendly_size(std::size_t minimum);

}  // namespace strandline::spectral
