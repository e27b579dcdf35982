#include "corrections/spectral/tidal_band.h"

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "corrections/core/time_utc.h"

namespace strandline::spectral {

double distance_to_seasonal_cpd(double f_cpd) {
  const double annual = 1.0 / kDaysPerJulianYear;
  return std::min(std::abs(f_cpd - annual), std::abs(f_cpd - 2 * annual));
}

TidalBand find_tidal_band(std::span<const double> frequencies_cpd, std::span<const double> power,
                          double span_days, const TidalBandOptions& options) {
  if (frequencies_cpd.size() != power.size()) throw std::invalid_argument("find_tidal_band: sizes differ");
  TidalBand band;
  const std::size_t n = power.size();
  if (n < 3 || !(span_days > 0)) {
    band.reason = "record too short for a spectrum";
    return band;
  }
  band.rayleigh_cpd = 1.0 / span_days;
  band.half_width_cpd = options.half_width_cpd;
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
    if (distance_to_seasonal_cpd(frequencies_cpd[k]) < band.rayleigh_cpd) {
      if (!band.seasonal_peak_skipped && chosen == n) {
        band.seasonal_peak_skipped = true;
        band.skipped_peak_cpd = frequencies_cpd[k];
      }
      continue;
    }
    chosen = k;
    break;
  }
  if (chosen == n) {
    band.reason = "every spectral peak lies on the seasonal cycle (1 or 2 cycles per year)";
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
  for (std::size_t k = 0; k < n; ++k) {
    const double f = frequencies_cpd[k];
    if (std::abs(f - band.peak_cpd) > options.half_width_cpd) continue;
    if (distance_to_seasonal_cpd(f) < band.rayleigh_cpd) continue;
    band.bins.push_back(k);
    band.frequencies_cpd.push_back(f);
    band.weights_cpd.push_back(spacing);
  }
  band.found = !band.bins.empty();
  if (!band.found) band.reason = "tidal band empty after removing the seasonal lines";
  return band;
}

}  // namespace strandline::spectral
