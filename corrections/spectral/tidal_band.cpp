#include "corrections/spectral/tidal_band.h"

#include <algorithm>
#include <cmath>
#include <complex>
#include <numbers>
#include <stdexcept>

#include "corrections/core/time_utc.h"

namespace strandline::spectral {

namespace {

constexpr double kTwoPi = 2 * std::numbers::pi;

const double kSeasonalCpd[] = {1.0 / kDaysPerJulianYear, -1.0 / kDaysPerJulianYear, 2.0 / kDaysPerJulianYear,
                               -2.0 / kDaysPerJulianYear};

// Seasonal leakage of f_k = f0 + k df for k < count, by phase recurrence.
std::vector<double> leakage_on_grid(std::span<const double> t, double f0, double df, std::size_t count) {
  std::vector<double> leak(count, 0.0);
  std::vector<std::complex<double>> acc(count);
  const double n = static_cast<double>(t.size());
  for (double fs : kSeasonalCpd) {
    std::fill(acc.begin(), acc.end(), std::complex<double>(0, 0));
    for (double tj : t) {
      std::complex<double> z = std::polar(1.0, kTwoPi * (f0 - fs) * tj);
      const std::complex<double> step = std::polar(1.0, kTwoPi * df * tj);
      for (std::size_t k = 0; k < count; ++k) {
        acc[k] += z;
        z *= step;
      }
    }
    for (std::size_t k = 0; k < count; ++k) leak[k] = std::max(leak[k], std::norm(acc[k]) / (n * n));
  }
  return leak;
}

}  // namespace

double distance_to_seasonal_cpd(double f_cpd) {
  const double annual = 1.0 / kDaysPerJulianYear;
  return std::min(std::abs(f_cpd - annual), std::abs(f_cpd - 2 * annual));
}

double spectral_window(std::span<const double> times_days, double d_cpd) {
  if (times_days.empty()) return 0.0;
  std::complex<double> sum(0, 0);
  for (double t : times_days) sum += std::polar(1.0, kTwoPi * d_cpd * t);
  const double n = static_cast<double>(times_days.size());
  return std::norm(sum) / (n * n);
}

double seasonal_leakage(std::span<const double> times_days, double f_cpd) {
  double worst = 0;
  for (double fs : kSeasonalCpd) worst = std::max(worst, spectral_window(times_days, f_cpd - fs));
  return worst;
}

TidalBand find_tidal_band(std::span<const double> frequencies_cpd, std::span<const double> power,
                          std::span<const double> times_days, const TidalBandOptions& options) {
  if (frequencies_cpd.size() != power.size()) throw std::invalid_argument("find_tidal_band: sizes differ");
  TidalBand band;
  const std::size_t n = power.size();
  const double span_days = times_days.empty() ? 0.0 : times_days.back() - times_days.front();
  if (n < 3 || !(span_days > 0)) {
    band.reason = "record too short for a spectrum";
    return band;
  }
  band.rayleigh_cpd = 1.0 / span_days;
  band.half_width_cpd = options.half_width_cpd;
  auto seasonal = [&](double f, double leakage) {
    return distance_to_seasonal_cpd(f) < band.rayleigh_cpd || leakage >= options.seasonal_window;
  };
  std::vector<double> sorted(power.begin(), power.end());
  std::nth_element(sorted.begin(), sorted.begin() + static_cast<long>(n / 2), sorted.end());
  const double median = sorted[n / 2];

  // Local maxima, strongest first.
  std::vector<std::size_t> peaks;
  for (std::size_t k = 0; k < n; ++k) {
    const bool left = k == 0 || power[k] >= power[k - 1];
    const bool right = k + 1 == n || power[k] > power[k + 1];
    if (left && right) peaks.push_back(k);
  }
  std::sort(peaks.begin(), peaks.end(), [&](std::size_t a, std::size_t b) { return power[a] > power[b]; });
  std::size_t chosen = n;
  for (std::size_t k : peaks) {
    if (seasonal(frequencies_cpd[k], seasonal_leakage(times_days, frequencies_cpd[k]))) {
      if (!band.seasonal_peak_skipped) {
        band.seasonal_peak_skipped = true;
        band.skipped_peak_cpd = frequencies_cpd[k];
      }
      continue;
    }
    chosen = k;
    break;
  }
  if (chosen == n) {
    band.reason = "every spectral peak lies on the seasonal cycle (1 or 2 cycles per year or their aliases)";
    return band;
  }
  band.peak_cpd = frequencies_cpd[chosen];
  band.peak_power = power[chosen];
  band.peak_to_median = median > 0 ? power[chosen] / median : INFINITY;
  if (!(band.peak_to_median >= options.min_peak_to_median)) {
    band.reason = "no clear tidal peak (peak/median power " + std::to_string(band.peak_to_median) + " below " +
                  std::to_string(options.min_peak_to_median) + ")";
    return band;
  }
  const double spacing = (frequencies_cpd.back() - frequencies_cpd.front()) / static_cast<double>(n - 1);
  std::size_t first = n, last = 0;
  for (std::size_t k = 0; k < n; ++k)
    if (std::abs(frequencies_cpd[k] - band.peak_cpd) <= options.half_width_cpd) {
      first = std::min(first, k);
      last = k;
    }
  const std::vector<double> leakage =
      leakage_on_grid(times_days, frequencies_cpd[first], spacing, last - first + 1);
  for (std::size_t k = first; k <= last; ++k) {
    if (seasonal(frequencies_cpd[k], leakage[k - first])) continue;
    band.bins.push_back(k);
    band.frequencies_cpd.push_back(frequencies_cpd[k]);
    band.weights_cpd.push_back(spacing);
  }
  band.found = !band.bins.empty();
  if (!band.found) band.reason = "tidal band empty after removing the seasonal lines";
  return band;
}

}  // namespace strandline::spectral
