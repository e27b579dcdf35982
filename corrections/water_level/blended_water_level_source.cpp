#include "corrections/water_level/blended_water_level_source.h"

#include <algorithm>
#include <limits>

namespace strandline {

BlendedWaterLevelSource::BlendedWaterLevelSource(const GaugeSeries& gauge, const WaterLevelSource& prediction)
    : gauge_(gauge), prediction_(prediction) {
  const auto& times = gauge_.times();
  const auto& levels = gauge_.levels();
  if (times.empty()) return;
  const std::size_t step = std::max<std::size_t>(1, times.size() / 5000);
  double sum = 0;
  std::size_t count = 0;
  for (std::size_t i = 0; i < times.size(); i += step) {
    auto p = prediction_.at(times[i], std::numeric_limits<double>::infinity());
    if (!p) continue;
    sum += levels[i] - p->level_m;
    ++count;
  }
  if (count > 0) mean_offset_m_ = sum / static_cast<double>(count);
}

std::optional<WaterLevelAt> BlendedWaterLevelSource::at(TimeS time_s, double max_gap_s) const {
  if (auto g = gauge_.at(time_s, max_gap_s)) return g;
  return prediction_.at(time_s, max_gap_s);
}

nlohmann::json BlendedWaterLevelSource::describe() const {
  nlohmann::json j = {{"kind", "gauge_then_prediction"},
                      {"gauge", gauge_.describe()},
                      {"prediction", prediction_.describe()}};
  j["mean_gauge_minus_prediction_m"] = known(mean_offset_m_) ? nlohmann::json(mean_offset_m_) : nlohmann::json(nullptr);
  return j;
}

}  // namespace strandline
