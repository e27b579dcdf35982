// The wave term as the slope search sees it. With s = 1/tan(beta) the corrected
// chainage of an image is x + s (eta - z_ref) + W(tan beta), W the wave term in
// horizontal metres:
//   none    W = 0
//   setup   W = 0.35 sqrt(H0 L0): free of the slope, so the search keeps its closed
//           form with W as a constant horizontal term
//   runup   W = R2%(tan beta) / tan beta: not linear in s, and piecewise (the
//           dissipative form applies where xi0 < 0.3), so the search takes the grid
//           + refine path through corrected_series(); each call re-evaluates every
//           image's regime at the slope asked for.
// Images without a sea state (no_wave_data) get W = 0, as in the correct step.
#pragma once

#include <cstddef>
#include <functional>
#include <span>
#include <vector>

#include "corrections/core/run_inputs.h"

namespace strandline {

// Same signature as spectral::CorrectedSeriesFn: the corrected chainage per image.
using WaveCorrectedSeriesFn = std::function<void(double tan_beta, std::span<double> corrected_out)>;

class WaveSlopeTerms {
 public:
  // `rows`: the table rows handed to the slope search, in the search's order.
  WaveSlopeTerms(const SiteTable& table, std::span<const std::size_t> rows, const RunInputs& inputs);
  // Per image H0, L0 directly (NaN: no sea state at that image).
  WaveSlopeTerms(std::vector<double> h0_m, std::vector<double> l0_m, WaveCorrection correction);

  // True unless the wave term depends on the slope (`runup` with waves).
  bool closed_form() const { return correction_ != WaveCorrection::runup; }
  // The slope-free horizontal term per image for the closed form: the setup's
  // 0.35 sqrt(H0 L0) with `setup`; empty with `none` or without waves.
  std::vector<double> horizontal_m() const;
  // W(tan beta) per image.
  void horizontal_at(double tan_beta, std::span<double> out) const;
  // The corrected series x + (w + 0) / tan beta + W(tan beta) for the grid path;
  // `raw_m` and `water_m` (eta - z_ref) must outlive the returned function.
  WaveCorrectedSeriesFn corrected_series(std::span<const double> raw_m, std::span<const double> water_m) const;

  std::size_t size() const { return h0_m_.size(); }
  // Images in the dissipative regime at `tan_beta` (xi0 < 0.3).
  std::size_t dissipative_count(double tan_beta) const;

 private:
  std::vector<double> h0_m_, l0_m_;
  WaveCorrection correction_ = WaveCorrection::none;
  bool have_waves_ = false;
};

}  // namespace strandline
