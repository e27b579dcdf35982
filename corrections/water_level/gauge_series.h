// A water-level record from a gauge (or any time series on the site datum):
// linear interpolation between the two samples around an image time, never
// extrapolation, and no value across a gap longer than the limit.
#pragma once

#include <vector>

#include "corrections/core/run_inputs.h"

namespace strandline {

class GaugeSeries final : public WaterLevelSource {
 public:
  // Times must be strictly increasing (the reader checks and reports the line).
  // `sigma_m` is the 1-sigma of a level at image time (unknown = NaN).
  GaugeSeries(std::vector<TimeS> times_s, std::vector<double> levels_m, double sigma_m);

  std::optional<WaterLevelAt> at(TimeS time_s, double max_gap_s) const override;
  nlohmann::json describe() const override;

  const std::vector<TimeS>& times() const { return times_; }
  const std::vector<double>& levels() const { return levels_; }
  bool covers(TimeS time_s, double max_gap_s) const { return at(time_s, max_gap_s).has_value(); }

 private:
  std::vector<TimeS> times_;
  std::vector<double> levels_;
  double sigma_m_;
};

// Linear interpolation of y(x) at `x` between bracketing samples, or nothing when
// `x` lies outside [x.front(), x.back()] or the bracketing samples are more than
// `max_gap` apart. `x` strictly increasing. Shared by water levels and waves.
std::optional<double> interpolate_within_gap(const std::vector<double>& x, const std::vector<double>& y,
                                             double at, double max_gap);

// Index i such that x[i] <= at <= x[i+1] (x strictly increasing), with the same
// rules as interpolate_within_gap; nothing when they fail.
std::optional<std::size_t> bracket_within_gap(const std::vector<double>& x, double at, double max_gap);

}  // namespace strandline
