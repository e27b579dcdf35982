// Throughput of the wave calculations: the dispersion solve (Fenton & McKee
// start + Newton), deshoaling, and the Stockdon terms, over a spread of sea
// states and depths. Prints JSON.
#include <chrono>
#include <cmath>
#include <cstdio>
#include <random>
#include <vector>

#include "corrections/waves/linear_waves.h"
#include "corrections/waves/stockdon.h"

int main() {
  using namespace strandline;
  using clock = std::chrono::steady_clock;
  const std::size_t n = 2'000'000;
  std::mt19937_64 rng(3);
  std::uniform_real_distribution<double> period(3.0, 22.0), log_depth(std::log(0.2), std::log(500.0)),
      height(0.2, 6.0), slope(0.01, 0.2);
  std::vector<double> t(n), h(n), hs(n), b(n);
  for (std::size_t i = 0; i < n; ++i) {
    t[i] = period(rng);
    h[i] = std::exp(log_depth(rng));
    hs[i] = height(rng);
    b[i] = slope(rng);
  }
  double sink = 0;
  auto start = clock::now();
  for (std::size_t i = 0; i < n; ++i) sink += wavenumber_rad_m(t[i], h[i]);
  const double ns_dispersion = std::chrono::duration<double, std::nano>(clock::now() - start).count() / n;
  start = clock::now();
  for (std::size_t i = 0; i < n; ++i) sink += deshoal_to_deep_water(hs[i], t[i], h[i]);
  const double ns_deshoal = std::chrono::duration<double, std::nano>(clock::now() - start).count() / n;
  start = clock::now();
  for (std::size_t i = 0; i < n; ++i) sink += stockdon_terms(hs[i], deep_water_wavelength_m(t[i]), b[i]).runup_m;
  const double ns_stockdon = std::chrono::duration<double, std::nano>(clock::now() - start).count() / n;
  std::printf("{\"cases\": %zu, \"ns_per_dispersion_solve\": %.1f, \"ns_per_deshoal\": %.1f, "
              "\"ns_per_stockdon\": %.1f, \"checksum\": %.6e}\n",
              n, ns_dispersion, ns_deshoal, ns_stockdon, sink);
  return 0;
}
