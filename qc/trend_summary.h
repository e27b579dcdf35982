// The trend and seasonal part of a transect summary.
//   points   accepted, corrected, with sigma_m > 0, inside the optional window
//   weights  1/sigma^2 with sigma^2 = sigma_m^2 - sigma_slope_m^2 - sigma_sensor_offset_m^2
//            (the applied sensor offset's term: see TrendOffsetTerm): the slope term is
//            common to every point of the transect (a shared bias, not noise), so it
//            stays out of the weights and is carried by re-evaluating the trend with
//            the positions recomputed at the slope's 95% interval bounds:
//              slope_term = max |rate(bound) - rate|,
//              combined half-width = sqrt(statistical half-width^2 + slope term^2)
// Typed values only; server/io/summary_json writes them (keys: server/FORMATS.md).
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "corrections/core/run_inputs.h"
#include "corrections/core/site_table.h"

namespace strandline {

// How the trend's interval accounts for serial correlation (reported with it).
inline constexpr std::string_view kTrendSerialCorrelationMethod = "AR(1) effective sample size (Santer et al. 2000)";

struct Interval {
  double low = kUnknown;
  double high = kUnknown;
};

// The window of the trend and seasonal fit (unknown bound: open) and the points used.
struct TrendWindow {
  TimeS from_s = kUnknown;
  TimeS to_s = kUnknown;
  std::size_t n_points = 0;
};

// The slope's share of the trend's uncertainty; known only when the slope has a 95% interval.
struct TrendSlopeTerm {
  Interval rate_at_slope_ci95_m_per_yr;  // the rates refitted at the slope's [low, high] bounds (in that order)
  double slope_term_m_per_yr = kUnknown;
  std::optional<Interval> ci95_with_slope_m_per_yr;  // only when the statistical interval exists
};

// The applied sensor offsets' share (sensor_offsets step): each shifted family's
// offset is common to all its points (a shared bias, like the slope term), so
// it stays out of the weights and is carried by refitting with that family's
// points moved by the offset's 95% half-width (t_{0.975,dof} SE of an estimated
// offset, 1.96 sigma of a given one):
//   offset term = sqrt(sum over families (rate(moved) - rate)^2)
//   combined half-width = sqrt(statistical^2 + slope term^2 (when known) + offset term^2)
struct TrendOffsetTerm {
  double offset_term_m_per_yr = kUnknown;  // unknown when an applied offset has no sigma
  std::optional<Interval> ci95_with_sensor_offsets_m_per_yr;  // needs the statistical interval and the term
};

struct TrendSummary {
  double rate_m_per_yr = kUnknown;
  double intercept_m = kUnknown;  // fitted position at the weighted mean time
  TimeS intercept_time_s = kUnknown;
  double se_naive_m_per_yr = kUnknown;
  double lag1_autocorrelation = kUnknown;
  double n_effective = kUnknown;
  double se_m_per_yr = kUnknown;  // unknown when n_eff <= 3
  double dof = kUnknown;
  std::optional<Interval> ci95_m_per_yr;  // statistical only
  std::optional<TrendSlopeTerm> slope_term;
  std::optional<TrendOffsetTerm> sensor_offset_term;  // only when offsets were applied to trend points
};

struct SeasonalSummary {
  double amplitude_m = kUnknown;
  double amplitude_sigma_m = kUnknown;
  double phase_deg = kUnknown;
  double most_seaward_day_of_year = kUnknown;
};

struct TrendPart {
  TrendWindow window;
  std::optional<TrendSummary> trend;        // none with fewer than 3 points
  std::optional<SeasonalSummary> seasonal;  // none with fewer than 8 points or under a year
};

// Fits the trend and the annual harmonic of one transect and appends their cautions.
TrendPart summarise_trend(const SiteTable& table, std::size_t transect, const RunInputs& inputs, TimeS from_s,
                          TimeS to_s, std::vector<std::string>& cautions);

// Position of row `i` re-corrected with `slope` instead of the transect's slope.
double chainage_at_slope(const SiteTable& table, std::size_t i, double z_ref_m, double used_slope, double slope,
                         WaveCorrection wave_correction);

}  // namespace strandline
