// Annual harmonic of a shoreline series: weighted least squares of
//     x = c0 + c1 (t - t_mean) + A cos(2 pi (t - 2000.0) - phi)
// (t in Julian years, so the phase counts from 2000-01-01T00:00Z, one Julian
// year per cycle: phi / 360 * 365.25 is the day of the year at which the
// shoreline is most seaward). The linear term keeps a trend from leaking into
// the harmonic. The amplitude's 1-sigma comes from the residual-scaled
// covariance (no serial-correlation adjustment: read it as a lower bound).
#pragma once

#include <vector>

#include "qc/linear_trend.h"

namespace strandline {

struct SeasonalFit {
  bool valid = false;  // >= 8 points over at least one year
  double amplitude_m, amplitude_sigma_m, phase_deg, peak_day_of_year;
};

SeasonalFit fit_annual_harmonic(const std::vector<TrendSample>& samples, bool weighted);

}  // namespace strandline
