// Per-transect parameters: `--slopes FILE` (CSV `transect_id,slope[,slope_sigma]`)
// and `--transect-params FILE` (CSV `transect_id` plus any of `slope`,
// `slope_sigma`, `z_ref_m`). Slopes are tan(beta), dimensionless, in (0, 1];
// the slope rules are series_rules.h, shared with the HTTP upload of slopes.
#pragma once

#include <istream>
#include <string>
#include <unordered_map>

#include "corrections/core/run_inputs.h"
#include "server/io/series_rules.h"

namespace strandline {

struct TransectParams {
  std::unordered_map<std::string, SlopeValue> slopes;
  std::unordered_map<std::string, double> z_ref_m;
};

// `require_slope`: the slope column must exist (the --slopes form).
TransectParams read_transect_params(std::istream& in, const std::string& file, bool require_slope);
TransectParams read_transect_params_file(const std::string& path, bool require_slope);

// slope_problem (the slope range rule) is declared in series_rules.h.

}  // namespace strandline
