// Views of one transect's corrected series shared by the QC filters: which rows
// take part, a robust noise level per sensor class, and a running level (median
// and MAD over a window in days) that breaks at storm onsets so that a storm's
// step change is not smeared over the points before it.
#pragma once

#include <cstddef>
#include <vector>

#include "corrections/core/run_inputs.h"
#include "corrections/core/site_table.h"

namespace strandline {

// Corrected and not rejected by any flag so far.
inline bool qc_usable(const SiteTable& table, std::size_t row) {
  return known(table.chainage_m[row]) && table.accepted(row);
}

// Mask over the transect's rows [begin, end): qc_usable per row.
std::vector<char> usable_mask(const SiteTable& table, std::size_t transect);

// Robust noise (1-sigma, metres) per row of the transect, by sensor class: from
// differences of consecutive usable points of the same class,
// kMadToSigma * MAD(diff) / sqrt(2) (real change between neighbouring images is
// small next to the noise). Classes with fewer than `min_pairs` differences
// take the value pooled over all classes, then the sensor table's sigma, then
// `fallback_m`.
std::vector<double> class_noise_m(const SiteTable& table, std::size_t transect, const RunInputs& inputs,
                                  const std::vector<char>& mask, std::size_t min_pairs = 10,
                                  double fallback_m = 10.0);

struct LevelWindow {
  double half_width_days = 45.0;
  std::size_t min_points = 5;  // widen to the nearest points when the window holds fewer
  bool break_at_storm_onsets = true;
};

struct RunningLevel {
  std::vector<double> median_m;  // per row of the transect; NaN when no usable point
  std::vector<double> mad_m;     // MAD of the window about its median
  std::vector<std::size_t> count;  // points in the window
};

// Running median and MAD of the usable points around each row (the row itself
// included when usable), within the row's segment. A segment starts at each
// usable storm_response point that follows a usable point without that flag.
RunningLevel running_level(const SiteTable& table, std::size_t transect, const std::vector<char>& mask,
                           const LevelWindow& window);

}  // namespace strandline
