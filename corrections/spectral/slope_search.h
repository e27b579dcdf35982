// The spectral beach-slope search on plain arrays (Vos et al. 2020, GRL, "Beach
// slopes from satellite-derived shorelines"): the right slope is the one whose
// tide correction leaves the least energy in the tidal band of the corrected,
// linearly detrended series.
//
// With s = 1/tan(beta) the corrected series is y = x + h + s w (x raw chainage,
// h a slope-free horizontal term such as the setup 0.35 sqrt(H0 L0), w = eta -
// z_ref), so the band energy is the quadratic E(s) = A s^2 + 2 B s + C and the
// minimum is s* = -B/A, exactly, from two spectra and a cross-spectrum (see
// band_energy.h). Corrections that are not linear in s (runup) go through
// `CorrectedSeriesFn`: a grid over tan(beta) and a golden-section refinement in
// the best cell.
//
// Steps: (1) tidal band from the spectrum of detrended w at the image times
// (tidal_band.h); (2) provisional slope on all images; (3) residual screen of the
// provisionally corrected series (residual_screen.h), repeated `screen_passes`
// times with the updated slope; (4) final slope; (5) seeded bootstrap over the
// kept images for sigma and the 95% interval (percentiles); (6) verdict.
// Not identifiable when: fewer than `min_images` kept, no clear tidal peak, the
// minimum on the edge of the search range, or the horizontal tidal excursion
// (q95 - q05 of w over the kept images, divided by the steepest tan(beta) of the
// 95% interval, so that the verdict holds for every slope the data allow) below
// `min_excursion_m` (about 10 m: the method's published limit, recalled from memory).
// An identifiable estimate whose interval reaches an end of the search range or
// is wider than the slope is marked (ci_touches_range, ci_wider_than_value).
#pragma once

#include <cstdint>
#include <functional>
#include <span>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "corrections/spectral/band_energy.h"
#include "corrections/spectral/fast_lomb_scargle.h"
#include "corrections/spectral/residual_screen.h"
#include "corrections/spectral/tidal_band.h"

namespace strandline::spectral {

// The spectrum's frequency grid (fixed per searcher; the FFT plan is made for it).
struct SpectrumGrid {
  double f_min_cpd = 1.0 / 400.0;  // cycles per day
  double f_max_cpd = 1.0 / 10.0;
  std::size_t count = 4000;
  FastLombScargleOptions fast;
  std::vector<double> frequencies_cpd() const;
};

struct SlopeSearchOptions {
  double tan_beta_min = 0.01;
  double tan_beta_max = 0.2;
  TidalBandOptions band;
  ResidualScreenOptions screen;
  // Remove annual and semi-annual sinusoids with the line (band_energy.h). The
  // published method removes the line only.
  bool remove_seasonal = true;
  int screen_passes = 2;
  std::size_t min_images = 40;
  double min_excursion_m = 10.0;
  std::size_t bootstrap_count = 200;
  std::uint64_t seed = 1;
  double curve_step = 0.0025;  // tan(beta) step of the reported energy curve and of the grid path
};

struct SlopeSeries {
  std::span<const double> times_s;       // seconds (UTC), any order
  std::span<const double> chainage_m;    // raw chainage x
  std::span<const double> water_m;       // w = eta - z_ref at image time
  std::span<const double> horizontal_m;  // optional slope-free horizontal term (empty = none)
};

// Fills `corrected_out` (one value per image, in input order) with the corrected
// chainage for the given tan(beta).
using CorrectedSeriesFn = std::function<void(double tan_beta, std::span<double> corrected_out)>;

struct EnergyPoint {
  double tan_beta;
  double energy;
};

struct SlopeEstimate {
  bool identifiable = false;
  std::vector<std::string> reasons;  // why not identifiable (empty when identifiable)
  double tan_beta = 0;               // best slope found (NaN when no band)
  double sigma = 0;                  // bootstrap standard deviation (NaN without bootstrap)
  double ci95_low = 0, ci95_high = 0;
  double excursion_m = 0;            // horizontal tidal excursion at the estimate
  double excursion_min_m = 0;        // at the steepest slope of the 95% interval (the one judged)
  bool ci_touches_range = false;     // the interval reaches an end of the search range
  bool ci_wider_than_value = false;  // the interval is wider than the slope itself
  std::size_t images_given = 0, images_used = 0, images_screened = 0;
  std::vector<char> kept;            // per input image
  TidalBand band;
  Quadratic energy;                  // E(s), s = 1/tan(beta) (closed-form path)
  std::vector<EnergyPoint> curve;    // over the search range
  std::string method;                // "closed_form" or "grid_refine"
  bool remove_seasonal = false;      // the detrending used

  nlohmann::json details() const;    // the slope_details JSON
};

class SlopeSearcher {
 public:
  explicit SlopeSearcher(const SpectrumGrid& grid = {});

  // Closed-form path (correction linear in 1/tan(beta)).
  SlopeEstimate estimate(const SlopeSeries& series, const SlopeSearchOptions& options) const;
  // Grid + refine path: `corrected` gives the corrected series; `water_m` is
  // still needed for the tidal band and the excursion.
  SlopeEstimate estimate(std::span<const double> times_s, std::span<const double> water_m,
                         const CorrectedSeriesFn& corrected, const SlopeSearchOptions& options) const;

  // Spectrum of detrended w at the image times (days), on the grid.
  std::vector<double> water_spectrum(std::span<const double> times_days, std::span<const double> water_m,
                                     bool remove_seasonal) const;
  const SpectrumGrid& grid() const { return grid_; }

 private:
  SlopeEstimate run(std::span<const double> times_s, std::span<const double> water_m, const CorrectedSeriesFn& corrected,
                    const std::vector<double>* linear_x, const SlopeSearchOptions& options) const;
  SpectrumGrid grid_;
  std::vector<double> frequencies_cpd_;
  FastLombScargle fast_;
};

// Grid over [tan_min, tan_max] with `step`, then golden-section refinement of
// tan(beta) within the cells around the best grid point, minimising
// basis.energy(corrected(tan_beta)) over the images where multiplicity > 0.
struct GridSearchResult {
  double tan_beta = 0;
  double energy = 0;
  bool at_edge = false;  // best grid point is an end of the range
  std::vector<EnergyPoint> curve;
};
GridSearchResult grid_refine_search(const BandBasis& basis, const CorrectedSeriesFn& corrected, double tan_min,
                                    double tan_max, double step, std::span<const double> multiplicity = {},
                                    double tolerance = 1e-7);

}  // namespace strandline::spectral
