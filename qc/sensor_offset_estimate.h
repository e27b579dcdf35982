// Offset of one sensor family against a reference family, from the points both
// families place on a transect in the same short time bins (so any slow or
// irregular shoreline change cancels and no trend model is needed):
//   per bin b   d_b = median(family) - median(reference)   (medians: gross outliers
//               are still in the data when the step runs, before the QC filters)
//               w_b = 1 / (sigma_f^2 / n_f + sigma_r^2 / n_r), sigma the sensor table's
//   offset      delta = sum w_b d_b / sum w_b   (weighted mean)
//   SE          residual-scaled: s^2 = sum w_b (d_b - delta)^2 / (B - 1),
//               se = sqrt(s^2 / sum w_b), widened for serial correlation with the
//               lag-1 autocorrelation rho of sqrt(w_b)(d_b - delta) in time order:
//               n_eff = B (1 - rho) / (1 + rho), se *= sqrt((B - 1) / (n_eff - 1))
//               (Santer et al. 2000, J. Geophys. Res. 105(D6), 7337-7356)
//   interval    delta -+ t_{0.975, n_eff - 1} se, given when n_eff > 3
// The site offset applies the same estimator to the bin series pooled over the
// transects (per bin the weighted mean of the transects' d_b): errors shared by
// the transects of one image then show in the scatter between bins instead of
// being averaged away as if independent.
#pragma once

#include <string>
#include <vector>

#include "corrections/core/run_inputs.h"
#include "corrections/core/sensor_offset.h"
#include "corrections/core/site_table.h"

namespace strandline {

struct OffsetBin {
  long long bin = 0;  // floor(time / bin width)
  double diff_m = 0;
  double weight = 0;
  std::size_t n_family = 0, n_reference = 0;
};

// Family name per sensor index of the table (empty: sensor not in the table).
std::vector<std::string> sensor_families(const SiteTable& table, const RunInputs& inputs);
// The sensor table's sigma per sensor index (1 where the table gives none: equal weights).
std::vector<double> sensor_sigmas_m(const SiteTable& table, const RunInputs& inputs);

// Bins of one transect where both families have points; `usable` marks the rows
// taking part (per table row), `position_m` their positions. In bin order.
std::vector<OffsetBin> transect_offset_bins(const SiteTable& table, std::size_t transect,
                                            const std::vector<double>& position_m, const std::vector<char>& usable,
                                            const std::vector<std::string>& families, const std::string& family,
                                            const std::string& reference, double bin_days,
                                            const std::vector<double>& sigma_by_sensor_m);

// Per bin the weighted mean of the transects' differences (weights add up).
std::vector<OffsetBin> pool_offset_bins(const std::vector<std::vector<OffsetBin>>& per_transect);

// The estimator above; offset unknown with fewer than `min_bins` bins.
FamilyOffset estimate_family_offset(const std::vector<OffsetBin>& bins, const std::string& family,
                                    const std::string& reference, std::size_t min_bins);

}  // namespace strandline
