// Per-transect parameters: `--slopes FILE` (CSV `transect_id,slope[,slope_sigma]`)
// and `--transect-params FILE` (CSV `transect_id` plus any of `slope`,
// `slope_sigma`, `z_ref_m`). Slopes are tan(beta), dimensionless, in (0, 1].
#pragma once

#include <istream>
#include <string>
#include <unordered_map>

#include "corrections/core/run_inputs.h"

namespace strandline {

struct TransectParams {
  std::unordered_map<std::string, SlopeValue> slopes;
  std::unordered_map<std::string, double> z_ref_m;
};

// `require_slope`: the slope column must exist (the --slopes form).
TransectParams read_transect_params(std::istream& in, const std::string& file, bool require_slope);
TransectParams read_transect_params_file(const std::string& path, bool require_slope);

// Checks a slope value from any source (option or file): finite, 0 < s <= 1.
// Returns the reason when invalid.
std::optional<std::string> slope_problem(double slope);

}  // namespace strandline
