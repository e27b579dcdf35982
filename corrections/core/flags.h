// Point flags: names of our own, one table (flags.cpp) giving name, severity and
// meaning. A point is accepted when it carries no flag of severity `reject`.
// Flags never delete a point; they only explain it.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace strandline {

enum class Flag : std::uint8_t {
  // Correction inputs
  no_water_level,            // no water level within the gap limit / outside the record
  tide_predicted,            // water level from the harmonic prediction, not the gauge
  no_slope,                  // no slope for the transect: uncorrected
  default_slope,             // the configured default slope was used
  slope_not_identifiable,    // the spectral estimate was not identifiable
  no_wave_data,              // waves given but none within the gap limit at image time
  beyond_transect,           // raw chainage outside [0, transect length]
  // Quality control
  cloudy_image,
  poor_georeference,
  spike,
  hampel_outlier,
  implausible_rate,
  alongshore_outlier,
  image_misregistered,
  sparse_period,
  storm_response,
  sensor_offset_applied,     // the position was shifted by its sensor family's offset
  // Uncertainty terms that could not be known (sigma_m holds the known terms only)
  sigma_sensor_unknown,
  sigma_water_level_unknown,
  sigma_slope_unknown,
  sigma_wave_unknown,
  coarse_gauge,              // the gauge samples around the image are more than ~1 h apart
  slope_poorly_constrained,  // the slope's 95% interval touches the search range or exceeds the slope
  sigma_sensor_offset_unknown,
  count_  // keep last
};

enum class FlagSeverity : std::uint8_t { reject, warn, info };

struct FlagInfo {
  Flag flag;
  std::string_view name;
  FlagSeverity severity;
  std::string_view meaning;
};

using FlagSet = std::uint64_t;
static_assert(static_cast<int>(Flag::count_) <= 64, "FlagSet holds at most 64 flags");

constexpr FlagSet flag_bit(Flag f) { return FlagSet{1} << static_cast<unsigned>(f); }
constexpr bool has_flag(FlagSet set, Flag f) { return (set & flag_bit(f)) != 0; }

const std::vector<FlagInfo>& flag_table();
const FlagInfo& flag_info(Flag f);
std::optional<Flag> flag_from_name(std::string_view name);

// Bits of every flag whose severity is `reject`.
FlagSet rejecting_flags();
inline bool is_accepted(FlagSet set) { return (set & rejecting_flags()) == 0; }

// Names in table order, e.g. {"cloudy_image", "spike"}.
std::vector<std::string_view> flag_names(FlagSet set);
// The same joined with ';' (the CSV form).
std::string flag_list(FlagSet set);

}  // namespace strandline
