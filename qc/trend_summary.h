// The trend and seasonal part of a transect summary.
//   points   accepted, corrected, with sigma_m > 0, inside the optional window
//   weights  1/sigma^2 with sigma^2 = sigma_m^2 - sigma_slope_m^2: the slope term is
//            common to every point of the transect (a shared bias, not noise), so it
//            stays out of the weights and is carried by re-evaluating the trend with
//            the positions recomputed at the slope's 95% interval bounds:
//              slope_term = max |rate(bound) - rate|,
//              combined half-width = sqrt(statistical half-width^2 + slope_term^2)
// Writes keys into `out` (see the formats reference) and appends cautions.
#pragma once

#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "corrections/core/run_inputs.h"
#include "corrections/core/site_table.h"

namespace strandline {

void add_trend_summary(const SiteTable& table, std::size_t transect, const RunInputs& inputs, TimeS from_s,
                       TimeS to_s, nlohmann::json& out, std::vector<std::string>& cautions);

// Position of row `i` re-corrected with `slope` instead of the transect's slope.
double chainage_at_slope(const SiteTable& table, std::size_t i, double z_ref_m, double used_slope, double slope,
                         WaveCorrection wave_correction);

}  // namespace strandline
