// Speed of the harmonic tide: prediction per time (astronomical arguments and
// nodal corrections recomputed at every time) and the least-squares analysis
// of a year-long gappy record. Results go to tests/bench/RESULTS.md.
#include <chrono>
#include <cstdio>
#include <random>

#include "corrections/tide/harmonic_fit.h"
#include "corrections/tide/tide_predictor.h"

namespace {

double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

}  // namespace

int main() {
  using namespace strandline;
  using namespace strandline::tide;
  // Invented constants: every constituent of the default fit list, decreasing amplitudes.
  ConstituentSet set;
  double amplitude = 0.8;
  for (const auto& name : default_fit_constituents()) {
    set.constituents.push_back({name, amplitude, 37.0 * static_cast<double>(set.constituents.size()), kUnknown,
                                kUnknown, std::nullopt});
    amplitude *= 0.85;
  }
  const TidePredictor predictor(set);
  const double t0 = 1.6e9;
  const int n_predict = 525600 / 10;  // one year every 10 min
  double checksum = 0;
  auto start = std::chrono::steady_clock::now();
  for (int k = 0; k < n_predict; ++k) checksum += predictor.level_m(t0 + 600.0 * k);
  const double predict_s = seconds_since(start);
  std::printf("prediction: %zu constituents, %d times: %.3f s (%.2f us per time; checksum %.6f)\n",
              set.constituents.size(), n_predict, predict_s, 1e6 * predict_s / n_predict, checksum);

  // 372 days every 30 min, 30% dropped at random, fit with the default list.
  std::mt19937 rng(1);
  std::uniform_real_distribution<double> keep(0, 1);
  std::vector<double> times, levels;
  for (double t = t0; t <= t0 + 372 * 86400.0; t += 1800) {
    if (keep(rng) < 0.3) continue;
    times.push_back(t);
    levels.push_back(predictor.level_m(t));
  }
  start = std::chrono::steady_clock::now();
  const HarmonicFitResult fit = fit_harmonics(times, levels, HarmonicFitOptions{}, "bench");
  const double fit_s = seconds_since(start);
  std::printf("fit: %zu samples, %zu constituents fitted (%zu unknowns): %.3f s; residual std %.2e m\n",
              fit.samples, fit.constants.constituents.size(), 1 + 2 * fit.constants.constituents.size(), fit_s,
              fit.constants.residual_std_m);
  return 0;
}
