#include "corrections/water_level/gauge_series.h"

#include <algorithm>
#include <stdexcept>

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

GaugeSeries::GaugeSeries(std::vector<TimeS> times_s, std::vector<double> levels_m, double sigma_m)
    : times_(std::move(times_s)), levels_(std::move(levels_m)), sigma_m_(sigma_m) {
  if (times_.size() != levels_.size()) throw std::invalid_argument("GaugeSeries: times and levels differ in length");
  for (std::size_t i = 1; i < times_.size(); ++i)
    if (!(times_[i] > times_[i - 1])) throw std::invalid_argument("GaugeSeries: times not strictly increasing");
}

std::optional<WaterLevelAt> GaugeSeries::at(TimeS time_s, double max_gap_s) const {
  auto level = interpolate_within_gap(times_, levels_, time_s, max_gap_s);
  if (!level) return std::nullopt;
  return WaterLevelAt{*level, sigma_m_, false};
}

nlohmann::json GaugeSeries::describe() const {
  nlohmann::json j = {{"kind", "gauge"}, {"samples", times_.size()}};
  if (!times_.empty()) {
    j["first"] = format_time_utc(times_.front());
    j["last"] = format_time_utc(times_.back());
  }
  if (known(sigma_m_)) j["sigma_m"] = sigma_m_;
  else j["sigma_m"] = nullptr;
  return j;
}

}  // namespace strandline
