// A water-level record from a gauge (or any time series on the site datum):
// interpolation between the two samples around an image time, never
// extrapolation, and no value across a gap longer than the limit.
//
// Linear interpolation of a tide damps it between samples: at 3-hourly sampling
// the interpolated levels regress on the true ones with a slope of ~0.96, which
// flattens every slope estimated from them by as much. So a coarse record
// (median sample interval above `guide_interval_s`) is first fitted with the
// harmonic constituents it can resolve below its Nyquist frequency
// (tide/harmonic_fit.h), and the interpolation runs on the residual (surge,
// fit error), the prediction adding the tide's shape back between samples.
//
// Each value carries an interpolation error estimate: for linear interpolation
// between t0 and t1 the error is -1/2 y''(t) (t - t0)(t1 - t) (the Lagrange
// remainder), with y'' the larger of the divided second differences at the two
// samples of the interpolated series (levels, or residuals when guided).
#pragma once

#include <memory>
#include <string>
#include <vector>

#include "corrections/core/run_inputs.h"
#include "corrections/tide/tide_predictor.h"

namespace strandline {

struct GaugeOptions {
  // Records sampled more coarsely than this (median interval) are guided by a
  // harmonic fit of their own; 0 = never guide.
  double guide_interval_s = 3600.0;
};

class GaugeSeries final : public WaterLevelSource {
 public:
  // Times must be strictly increasing (the reader checks and reports the line).
  // `sigma_m` is the 1-sigma of a level at a sample (unknown = NaN: the
  // water-level step applies its default).
  GaugeSeries(std::vector<TimeS> times_s, std::vector<double> levels_m, double sigma_m, GaugeOptions options = {});

  std::optional<WaterLevelAt> at(TimeS time_s, double max_gap_s) const override;
  nlohmann::json describe() const override;

  const std::vector<TimeS>& times() const { return times_; }
  const std::vector<double>& levels() const { return levels_; }
  bool covers(TimeS time_s, double max_gap_s) const { return at(time_s, max_gap_s).has_value(); }
  double median_interval_s() const { return median_interval_s_; }
  bool guided() const { return guide_ != nullptr; }

 private:
  void fit_guide(const GaugeOptions& options);

  std::vector<TimeS> times_;
  std::vector<double> levels_;
  double sigma_m_;
  double median_interval_s_ = kUnknown;
  std::shared_ptr<const tide::TidePredictor> guide_;  // null: plain interpolation
  std::vector<double> interpolated_;  // what is interpolated: levels, or levels minus the guide
  nlohmann::json guide_record_;       // provenance of the guide (or why there is none)
};

// Linear interpolation of y(x) at `x` between bracketing samples, or nothing when
// `x` lies outside [x.front(), x.back()] or the bracketing samples are more than
// `max_gap` apart (a gap exactly equal to the limit is interpolated). `x` strictly
// increasing. Shared by water levels and waves.
std::optional<double> interpolate_within_gap(const std::vector<double>& x, const std::vector<double>& y,
                                             double at, double max_gap);

// Index i such that x[i] <= at <= x[i+1] (x strictly increasing), with the same
// rules as interpolate_within_gap; nothing when they fail.
std::optional<std::size_t> bracket_within_gap(const std::vector<double>& x, double at, double max_gap);

}  // namespace strandline
