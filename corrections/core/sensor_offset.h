// Offsets between sensor families, as estimated and as applied by the
// sensor_offsets step (qc/sensor_offset_step.h). Sign: satellite minus truth,
// positive seaward; an offset is always of `family` relative to `reference_family`.
#pragma once

#include <cmath>
#include <cstddef>
#include <limits>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace strandline {

// How a run treats offsets between sensor families.
//   estimate  estimate and report; apply the site offsets whose 95% interval excludes 0
//   none      estimate and report only (cautions when significant)
//   given     apply the sensor table's offset_m per sensor; estimates are still reported
enum class SensorOffsetMode { estimate, none, given };

inline std::string_view sensor_offset_mode_name(SensorOffsetMode m) {
  switch (m) {
    case SensorOffsetMode::estimate: return "estimate";
    case SensorOffsetMode::none: return "none";
    case SensorOffsetMode::given: return "given";
  }
  return "none";
}
inline std::optional<SensorOffsetMode> sensor_offset_mode_from_name(std::string_view name) {
  for (auto m : {SensorOffsetMode::estimate, SensorOffsetMode::none, SensorOffsetMode::given})
    if (sensor_offset_mode_name(m) == name) return m;
  return std::nullopt;
}

struct FamilyOffset {
  static constexpr double nan = std::numeric_limits<double>::quiet_NaN();
  std::string family;
  std::string reference_family;
  double offset_m = nan;  // family minus reference
  double se_m = nan;      // standard error (serial correlation accounted for)
  double dof = nan;
  double ci95_low_m = nan, ci95_high_m = nan;  // NaN when the interval cannot be given
  std::size_t n_bins = 0;        // time bins holding both families
  std::size_t n_points = 0;      // points of `family` in those bins
  std::size_t n_reference_points = 0;
  bool significant() const { return !std::isnan(ci95_low_m) && (ci95_low_m > 0 || ci95_high_m < 0); }
};

// The site's part: estimates pooled over the run's transects and what was applied.
struct SiteSensorOffsets {
  SensorOffsetMode mode = SensorOffsetMode::none;
  bool ran = false;  // the step ran in this run
  std::string reference_family;
  std::vector<FamilyOffset> estimates;
  // Applied offset and its 1-sigma per family (estimate mode) or per sensor's family (given mode).
  std::map<std::string, double> applied_m;
  std::map<std::string, double> applied_sigma_m;
};

}  // namespace strandline
