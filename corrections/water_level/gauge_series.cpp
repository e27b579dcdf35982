#include "corrections/water_level/gauge_series.h"

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "corrections/core/errors.h"
#include "corrections/tide/constituent_table.h"
#include "corrections/tide/harmonic_fit.h"

namespace strandline {

std::optional<std::size_t> bracket_within_gap(const std::vector<double>& x, double at, double max_gap) {
  if (x.empty() || !(at >= x.front()) || !(at <= x.back())) return std::nullopt;
  auto it = std::lower_bound(x.begin(), x.end(), at);
  std::size_t hi = static_cast<std::size_t>(it - x.begin());
  if (x[hi] == at) return hi == x.size() - 1 && hi > 0 ? hi - 1 : hi;  // exact sample: no gap question
  const std::size_t lo = hi - 1;
  if (x[hi] - x[lo] > max_gap) return std::nullopt;
  return lo;
}

std::optional<double> interpolate_within_gap(const std::vector<double>& x, const std::vector<double>& y,
                                             double at, double max_gap) {
  auto lo = bracket_within_gap(x, at, max_gap);
  if (!lo) return std::nullopt;
  const std::size_t i = *lo;
  if (x[i] == at) return y[i];
  if (i + 1 >= x.size()) return y[i];
  if (x[i + 1] == at) return y[i + 1];
  const double w = (at - x[i]) / (x[i + 1] - x[i]);
  return y[i] + w * (y[i + 1] - y[i]);
}

GaugeSeries::GaugeSeries(std::vector<TimeS> times_s, std::vector<double> levels_m, double sigma_m,
                         GaugeOptions options)
    : times_(std::move(times_s)), levels_(std::move(levels_m)), sigma_m_(sigma_m) {
  if (times_.size() != levels_.size()) throw std::invalid_argument("GaugeSeries: times and levels differ in length");
  for (std::size_t i = 1; i < times_.size(); ++i)
    if (!(times_[i] > times_[i - 1])) throw std::invalid_argument("GaugeSeries: times not strictly increasing");
  if (times_.size() >= 2) {
    std::vector<double> intervals(times_.size() - 1);
    for (std::size_t i = 1; i < times_.size(); ++i) intervals[i - 1] = times_[i] - times_[i - 1];
    auto mid = intervals.begin() + static_cast<std::ptrdiff_t>(intervals.size() / 2);
    std::nth_element(intervals.begin(), mid, intervals.end());
    median_interval_s_ = *mid;
  }
  interpolated_ = levels_;
  if (options.guide_interval_s > 0 && known(median_interval_s_) && median_interval_s_ > options.guide_interval_s)
    fit_guide(options);
}

void GaugeSeries::fit_guide(const GaugeOptions&) {
  // Only constituents well below the record's Nyquist frequency (0.8 of it):
  // faster ones alias onto slower ones and make the fit singular.
  const double nyquist_deg_per_h = 180.0 / (median_interval_s_ / 3600.0);
  tide::HarmonicFitOptions fit_options;
  for (const std::string& name : tide::default_fit_constituents())
    if (tide::speed_deg_per_h(*tide::find_constituent(name)) < 0.8 * nyquist_deg_per_h)
      fit_options.constituents.push_back(name);
  guide_record_ = {{"median_interval_s", median_interval_s_}};
  try {
    const tide::HarmonicFitResult fit = tide::fit_harmonics(times_, levels_, fit_options, "gauge record");
    auto predictor = std::make_shared<const tide::TidePredictor>(fit.constants);
    for (std::size_t i = 0; i < times_.size(); ++i) interpolated_[i] = levels_[i] - predictor->level_m(times_[i]);
    guide_ = std::move(predictor);
    nlohmann::json names = nlohmann::json::array();
    for (const auto& c : fit.constants.constituents) names.push_back(c.name);
    guide_record_["constituents"] = names;
  } catch (const InputError& e) {
    // Too short or too gappy to fit: plain interpolation, and provenance says why.
    guide_record_["not_guided"] = e.what();
  }
}

std::optional<WaterLevelAt> GaugeSeries::at(TimeS time_s, double max_gap_s) const {
  const auto lo = bracket_within_gap(times_, time_s, max_gap_s);
  if (!lo) return std::nullopt;
  const std::size_t i = *lo;
  WaterLevelAt out{kUnknown, sigma_m_, false};
  if (i + 1 < times_.size()) out.sample_interval_s = times_[i + 1] - times_[i];
  if (times_[i] == time_s || i + 1 >= times_.size()) {
    out.level_m = levels_[i];
    return out;
  }
  if (times_[i + 1] == time_s) {
    out.level_m = levels_[i + 1];
    return out;
  }
  const double t0 = times_[i], t1 = times_[i + 1];
  const double f = (time_s - t0) / (t1 - t0);
  out.level_m = interpolated_[i] + f * (interpolated_[i + 1] - interpolated_[i]);
  if (guide_) out.level_m += guide_->level_m(time_s);
  // Divided second difference at sample k from its neighbours, when both lie
  // within the gap limit (a neighbour across a long gap says nothing of y'' here).
  auto second_difference = [&](std::size_t k) -> double {
    if (k == 0 || k + 1 >= times_.size()) return kUnknown;
    const double hl = times_[k] - times_[k - 1], hr = times_[k + 1] - times_[k];
    if (hl > max_gap_s || hr > max_gap_s) return kUnknown;
    const double left = (interpolated_[k] - interpolated_[k - 1]) / hl;
    const double right = (interpolated_[k + 1] - interpolated_[k]) / hr;
    return 2.0 * (right - left) / (hl + hr);
  };
  const double d0 = second_difference(i), d1 = second_difference(i + 1);
  double curvature = kUnknown;
  if (known(d0) && known(d1)) curvature = std::max(std::abs(d0), std::abs(d1));
  else if (known(d0)) curvature = std::abs(d0);
  else if (known(d1)) curvature = std::abs(d1);
  // Two isolated samples: the error between them cannot be estimated.
  out.interpolation_sigma_m = known(curvature) ? 0.5 * curvature * (time_s - t0) * (t1 - time_s) : kUnknown;
  return out;
}

nlohmann::json GaugeSeries::describe() const {
  nlohmann::json j = {{"kind", "gauge"}, {"samples", times_.size()}};
  if (!times_.empty()) {
    j["first"] = format_time_utc(times_.front());
    j["last"] = format_time_utc(times_.back());
  }
  if (known(sigma_m_)) j["sigma_m"] = sigma_m_;
  else j["sigma_m"] = nullptr;
  j["median_interval_s"] = known(median_interval_s_) ? nlohmann::json(median_interval_s_) : nlohmann::json(nullptr);
  j["interpolation"] = guide_ ? "linear on the residual from a harmonic fit of the record" : "linear";
  if (!guide_record_.is_null()) j["harmonic_guide"] = guide_record_;
  return j;
}

}  // namespace strandline
