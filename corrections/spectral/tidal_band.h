// The tidal band of the slope search: the peak of the Lomb-Scargle spectrum of
// the water level sampled at the image times (the tide as aliased by the
// sampling), and the frequencies within a half-width of it.
//
// Seasonal guard: with images at a fixed time of day, K1/P1 alias to 1 cycle
// per year and K2 to 2, where the beach has its own seasonal cycle. A frequency
// is seasonal when it lies within the Rayleigh resolution 1/T (T = record span)
// of 1 or 2 cycles per year, or on an alias of those lines through the sampling
// (regular revisits make f and f + n/revisit indistinguishable): spectral window
// |mean_j exp(2 pi i (f -+ f_s) t_j)|^2 >= `seasonal_window` (0.25: inside the
// main lobe of the alias, about 0.6/T from its centre). A seasonal peak is skipped
// for the strongest clear peak that is not; seasonal frequencies are dropped from
// the band as well, so the seasonal cycle never enters the band energy.
#pragma once

#include <span>
#include <string>
#include <vector>

namespace strandline::spectral {

struct TidalBandOptions {
  // Half-width of the band around the peak, cycles per day. 8.64e-4 c/d = 1e-8 Hz,
  // the published method's band (Vos et al. 2020; value recalled from memory).
  double half_width_cpd = 8.64e-4;
  // A peak is clear when its power is at least this many times the median power
  // of the spectrum (our choice: aliased tides give ratios of 100s, a spectrum of
  // noise-like (randomly sampled) tides rarely exceeds 10-15).
  double min_peak_to_median = 20.0;
  double seasonal_window = 0.25;
};

struct TidalBand {
  bool found = false;
  std::string reason;              // why no band, when !found
  double peak_cpd = 0;             // frequency of the chosen peak, cycles per day
  double peak_power = 0;
  double peak_to_median = 0;
  double rayleigh_cpd = 0;         // 1 / record span
  double half_width_cpd = 0;       // as requested
  bool seasonal_peak_skipped = false;
  double skipped_peak_cpd = 0;     // the strongest peak when it was seasonal
  std::vector<std::size_t> bins;   // indices into the frequency grid
  std::vector<double> frequencies_cpd;
  std::vector<double> weights_cpd; // quadrature weights (grid spacing), sum = band width covered
};

// `frequencies_cpd` uniform and increasing, `power` the spectrum on them,
// `times_days` the image times (increasing).
TidalBand find_tidal_band(std::span<const double> frequencies_cpd, std::span<const double> power,
                          std::span<const double> times_days, const TidalBandOptions& options);

// Spectral window of the sampling at frequency d: |mean_j exp(2 pi i d t_j)|^2.
double spectral_window(std::span<const double> times_days, double d_cpd);
// Largest spectral window between f and +-1, +-2 cycles per year.
double seasonal_leakage(std::span<const double> times_days, double f_cpd);

// Distance (cycles per day) from f to the nearest of 1 and 2 cycles per year.
double distance_to_seasonal_cpd(double f_cpd);

}  // namespace strandline::spectral
