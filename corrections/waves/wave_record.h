// A record of sea states (buoy or hindcast): Hs, Tp and mean direction, and the
// depth of the record when it is nearshore. Interpolated linearly to an image
// time between the two samples around it (direction along the shorter arc),
// never extrapolated, and nothing across a gap longer than the limit.
#pragma once

#include <vector>

#include "corrections/core/run_inputs.h"

namespace strandline {

struct WaveSample {
  TimeS time_s = 0;
  double hs_m = kUnknown;
  double tp_s = kUnknown;
  double dir_deg = kUnknown;  // unknown allowed: direction is recorded, not used in H0
  double depth_m = kUnknown;  // unknown = deep water
};

class WaveRecord final : public WaveSource {
 public:
  // Times strictly increasing (the reader checks and names the line); throws
  // std::invalid_argument otherwise.
  explicit WaveRecord(std::vector<WaveSample> samples);

  std::optional<WaveAt> at(TimeS time_s, double max_gap_s) const override;
  nlohmann::json describe() const override;

  const std::vector<WaveSample>& samples() const { return samples_; }

 private:
  std::vector<WaveSample> samples_;
  std::vector<TimeS> times_;  // copy of the sample times for bracket_within_gap
};

// Angle a + w (b - a) along the shorter arc, in [0, 360); NaN when either is unknown.
double interpolate_direction_deg(double a_deg, double b_deg, double w);

}  // namespace strandline
