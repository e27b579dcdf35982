// A site's harmonic constants: the mean level (with an optional linear rate,
// e.g. sea-level rise) and amplitude/Greenwich phase lag (UTC) per constituent.
// The same struct is the output of the harmonic analysis and the input of the
// prediction.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "corrections/core/site_table.h"
#include "corrections/core/time_utc.h"

namespace strandline::tide {

struct HarmonicConstant {
  std::string name;  // canonical name from the constituent table
  double amplitude_m = 0.0;
  double phase_deg = 0.0;  // Greenwich phase lag g, UTC
  double amplitude_se_m = kUnknown;
  double phase_se_deg = kUnknown;
  std::optional<bool> resolvable;  // set by the harmonic analysis
};

inline constexpr TimeS kDefaultZ0Epoch = 946684800.0;  // 2000-01-01T00:00:00Z

struct ConstituentSet {
  std::string datum = "MSL";
  double z0_m = 0.0;
  double z0_rate_m_per_yr = 0.0;
  TimeS z0_epoch_s = kDefaultZ0Epoch;
  std::vector<HarmonicConstant> constituents;
  double residual_std_m = kUnknown;  // from the harmonic analysis, when known
  nlohmann::json record;             // analysis record information (null when none)
};

}  // namespace strandline::tide
