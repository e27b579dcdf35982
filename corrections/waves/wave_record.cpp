#include "corrections/waves/wave_record.h"

#include <cmath>
#include <stdexcept>

#include "corrections/water_level/gauge_series.h"

namespace strandline {

double interpolate_direction_deg(double a_deg, double b_deg, double w) {
  if (!known(a_deg) || !known(b_deg)) return kUnknown;
  double delta = std::fmod(b_deg - a_deg, 360.0);
  if (delta > 180.0) delta -= 360.0;
  if (delta < -180.0) delta += 360.0;
  double d = std::fmod(a_deg + w * delta, 360.0);
  if (d < 0) d += 360.0;
  return d;
}

WaveRecord::WaveRecord(std::vector<WaveSample> samples) : samples_(std::move(samples)) {
  times_.reserve(samples_.size());
  for (const auto& s : samples_) {
    if (!times_.empty() && !(s.time_s > times_.back()))
      throw std::invalid_argument("WaveRecord: times not strictly increasing");
    times_.push_back(s.time_s);
  }
}

std::optional<WaveAt> WaveRecord::at(TimeS time_s, double max_gap_s) const {
  auto lo = bracket_within_gap(times_, time_s, max_gap_s);
  if (!lo) return std::nullopt;
  const WaveSample& a = samples_[*lo];
  if (a.time_s == time_s || *lo + 1 >= samples_.size()) return WaveAt{a.hs_m, a.tp_s, a.dir_deg, a.depth_m};
  const WaveSample& b = samples_[*lo + 1];
  if (b.time_s == time_s) return WaveAt{b.hs_m, b.tp_s, b.dir_deg, b.depth_m};
  const double w = (time_s - a.time_s) / (b.time_s - a.time_s);
  auto lerp = [w](double x, double y) { return x + w * (y - x); };
  return WaveAt{lerp(a.hs_m, b.hs_m), lerp(a.tp_s, b.tp_s), interpolate_direction_deg(a.dir_deg, b.dir_deg, w),
                lerp(a.depth_m, b.depth_m)};
}

nlohmann::json WaveRecord::describe() const {
  nlohmann::json j = {{"kind", "wave_record"}, {"samples", samples_.size()}};
  if (!samples_.empty()) {
    j["first"] = format_time_utc(samples_.front().time_s);
    j["last"] = format_time_utc(samples_.back().time_s);
    bool nearshore = known(samples_.front().depth_m);
    j["record_depth"] = nearshore ? "nearshore (deshoaled with linear theory)" : "deep water";
  }
  return j;
}

}  // namespace strandline
