#include "corrections/spectral/fast_lomb_scargle.h"

#include <cmath>
#include <complex>
#include <memory>
#include <mutex>
#include <numbers>
#include <stdexcept>

#include <fftw3.h>

namespace strandline::spectral {

namespace {

std::mutex& fftw_planner_mutex() {
  static std::mutex m;
  return m;
}

struct FftwBuffer {
  explicit FftwBuffer(std::size_t n) : data(fftw_alloc_complex(n)), size(n) {
    if (!data) throw std::bad_alloc();
  }
  ~FftwBuffer() { fftw_free(data); }
  FftwBuffer(const FftwBuffer&) = delete;
  FftwBuffer& operator=(const FftwBuffer&) = delete;
  std::complex<double>* values() { return reinterpret_cast<std::complex<double>*>(data); }
  fftw_complex* data;
  std::size_t size;
};

// Adds value * L_i(u) to the p mesh points around fractional coordinate u
// (Lagrange weights; the mesh is periodic with `m` points).
void extirpolate(std::complex<double>* mesh, std::size_t m, double u, std::complex<double> value, int p) {
  const double nearest = std::floor(u);
  const long first = static_cast<long>(nearest) - (p - 1) / 2;
  const double offset = u - static_cast<double>(first);  // u relative to the first node (node i at i)
  if (offset == std::floor(offset)) {  // exactly on a node: all weight there
    const long node = static_cast<long>(offset) + first;
    mesh[static_cast<std::size_t>(((node % static_cast<long>(m)) + static_cast<long>(m)) % static_cast<long>(m))] += value;
    return;
  }
  // L_i(u) = prod_{k != i} (offset - k) / (i - k)
  double full = 1.0;
  for (int k = 0; k < p; ++k) full *= offset - k;
  double denominator = 1.0;  // prod_{k != 0} (0 - k) = (-1)^(p-1) (p-1)!
  for (int k = 1; k < p; ++k) denominator *= -static_cast<double>(k);
  for (int i = 0; i < p; ++i) {
    const double weight = full / ((offset - i) * denominator);
    long node = (first + i) % static_cast<long>(m);
    if (node < 0) node += static_cast<long>(m);
    mesh[static_cast<std::size_t>(node)] += value * weight;
    // next denominator: prod_{k != i+1} (i+1-k) from prod_{k != i} (i-k)
    if (i + 1 < p) denominator *= static_cast<double>(i + 1) / static_cast<double>(i + 1 - p);
  }
}

}  // namespace

std::vector<double> UniformAngularGrid::omegas() const {
  std::vector<double> w(count);
  for (std::size_t k = 0; k < count; ++k) w[k] = omega(k);
  return w;
}

std::size_t fft_friendly_size(std::size_t minimum) {
  std::size_t size = 1;
  while (size < minimum) size *= 2;
  return size;
}

FastLombScargle::FastLombScargle(const UniformAngularGrid& grid, const FastLombScargleOptions& options)
    : grid_(grid), options_(options) {
  if (!(grid.omega0 > 0) || !(grid.d_omega > 0) || grid.count == 0)
    throw std::invalid_argument("FastLombScargle: grid needs omega0 > 0, d_omega > 0, count > 0");
  if (options.mesh_oversampling < 2) throw std::invalid_argument("FastLombScargle: mesh_oversampling < 2");
  if (options.extirpolation_order < 2 || options.extirpolation_order > 12)
    throw std::invalid_argument("FastLombScargle: extirpolation_order outside 2..12");
  mesh_size_ = fft_friendly_size(static_cast<std::size_t>(options.mesh_oversampling) * 2 * grid.count);
  FftwBuffer buffer(mesh_size_);
  std::lock_guard lock(fftw_planner_mutex());
  // FFTW_ESTIMATE: planning is instant (FFTW_MEASURE takes seconds on a busy
  // machine); with a power-of-two mesh its plan is close to the measured one.
  plan_ = fftw_plan_dft_1d(static_cast<int>(mesh_size_), buffer.data, buffer.data, FFTW_BACKWARD, FFTW_ESTIMATE);
  if (!plan_) throw std::runtime_error("FastLombScargle: FFTW could not make a plan");
}

FastLombScargle::~FastLombScargle() {
  std::lock_guard lock(fftw_planner_mutex());
  fftw_destroy_plan(static_cast<fftw_plan>(plan_));
}

LombScargleSpectra FastLombScargle::compute(std::span<const double> times,
                                            const std::vector<std::span<const double>>& series) const {
  for (const auto& y : series)
    if (y.size() != times.size()) throw std::invalid_argument("FastLombScargle: series length differs from times");
  const std::size_t n = times.size(), m = mesh_size_, nf = grid_.count;
  const int p = options_.extirpolation_order;
  const auto plan = static_cast<fftw_plan>(plan_);
  LombScargleSpectra out;
  out.cc.assign(nf, 0.0);
  out.ss.assign(nf, 0.0);
  out.cos_part.assign(series.size(), std::vector<double>(nf, 0.0));
  out.sin_part.assign(series.size(), std::vector<double>(nf, 0.0));
  if (n == 0) return out;

  // Times relative to the first sample keep the phases small; the periodogram
  // does not depend on the time origin.
  const double t0 = times[0];
  std::vector<double> u(n);
  const double cycles_per_unit = grid_.d_omega / (2 * std::numbers::pi);
  for (std::size_t j = 0; j < n; ++j) {
    const double cycles = (times[j] - t0) * cycles_per_unit;
    u[j] = (cycles - std::floor(cycles)) * static_cast<double>(m);
  }
  FftwBuffer mesh(m);
  auto transform = [&](auto value_of) {
    std::fill(mesh.values(), mesh.values() + m, std::complex<double>(0.0, 0.0));
    for (std::size_t j = 0; j < n; ++j) extirpolate(mesh.values(), m, u[j], value_of(j), p);
    fftw_execute_dft(plan, mesh.data, mesh.data);
  };

  // Sums at 2 w_k: bins 2k of the transform of e^{2 i omega0 t}.
  transform([&](std::size_t j) { return std::polar(1.0, 2 * grid_.omega0 * (times[j] - t0)); });
  std::vector<double> cos_tau(nf), sin_tau(nf);
  for (std::size_t k = 0; k < nf; ++k) {
    const std::complex<double> z2 = mesh.values()[(2 * k) % m];
    const double two_wtau = std::atan2(z2.imag(), z2.real());
    cos_tau[k] = std::cos(0.5 * two_wtau);
    sin_tau[k] = std::sin(0.5 * two_wtau);
    // sum cos^2 w(t-tau) = N/2 + 1/2 sum cos 2w(t-tau) = N/2 + |z2|/2
    out.cc[k] = 0.5 * static_cast<double>(n) + 0.5 * std::abs(z2);
    out.ss[k] = 0.5 * static_cast<double>(n) - 0.5 * std::abs(z2);
  }
  for (std::size_t i = 0; i < series.size(); ++i) {
    const auto y = series[i];
    transform([&](std::size_t j) { return y[j] * std::polar(1.0, grid_.omega0 * (times[j] - t0)); });
    for (std::size_t k = 0; k < nf; ++k) {
      const std::complex<double> z = mesh.values()[k];
      out.cos_part[i][k] = cos_tau[k] * z.real() + sin_tau[k] * z.imag();
      out.sin_part[i][k] = cos_tau[k] * z.imag() - sin_tau[k] * z.real();
    }
  }
  return out;
}

std::vector<double> FastLombScargle::power(std::span<const double> times, std::span<const double> values) const {
  return compute(times, {values}).power(0);
}

}  // namespace strandline::spectral
