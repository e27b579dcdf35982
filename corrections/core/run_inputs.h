// Everything a run reads besides the points: water levels, waves, slopes, the
// sensor table, reference elevations. Sources are interfaces so that gauge
// series, harmonic predictions and stored server data plug in alike.
#pragma once

#include <optional>
#include <string>
#include <unordered_map>

#include <nlohmann/json.hpp>

#include "corrections/core/sensor_offset.h"
#include "corrections/core/sensor_table.h"
#include "corrections/core/site_table.h"
#include "corrections/core/time_utc.h"

namespace strandline {

struct WaterLevelAt {
  double level_m = kUnknown;  // on the site datum
  double sigma_m = kUnknown;  // 1-sigma, vertical; unknown when the source cannot say
  bool predicted = false;     // from harmonic constituents rather than a gauge
  // A gauge value between samples: the estimated interpolation error (added in
  // quadrature to the level's sigma) and the spacing of the samples around it.
  double interpolation_sigma_m = 0.0;
  double sample_interval_s = kUnknown;
};

class WaterLevelSource {
 public:
  virtual ~WaterLevelSource() = default;
  // The level at `time_s`, or nothing when the source cannot give one without
  // extrapolating (outside the record, or the samples around `time_s` are more
  // than `max_gap_s` apart).
  virtual std::optional<WaterLevelAt> at(TimeS time_s, double max_gap_s) const = 0;
  // For provenance: kind, record span, limits.
  virtual nlohmann::json describe() const = 0;
};

struct WaveAt {
  double hs_m = kUnknown;
  double tp_s = kUnknown;
  double dir_deg = kUnknown;
  double depth_m = kUnknown;  // depth of the record (nearshore buoy); unknown = deep water
};

class WaveSource {
 public:
  virtual ~WaveSource() = default;
  // Conditions at `time_s`, or nothing outside the record or across a gap
  // longer than `max_gap_s`.
  virtual std::optional<WaveAt> at(TimeS time_s, double max_gap_s) const = 0;
  virtual nlohmann::json describe() const = 0;
};

struct SlopeValue {
  double slope = kUnknown;
  double slope_sigma = kUnknown;
};

// How each transect gets its slope: a listed slope first, else the one slope for
// every transect, else the estimate (when asked for), else the default.
struct SlopePlan {
  std::optional<SlopeValue> all;                            // one slope for every transect
  std::unordered_map<std::string, SlopeValue> per_transect;  // listed slopes, by transect id
  std::optional<SlopeValue> default_value;                  // when nothing else gives one
  bool estimate = false;                                    // estimate from the data (spectral search)
  double search_min = 0.01;                                 // tan(beta) range of the estimate
  double search_max = 0.2;
};

enum class WaveCorrection { none, setup, runup };

struct RunInputs {
  double reference_elevation_m = 0.0;
  std::unordered_map<std::string, double> z_ref_by_transect;  // overrides per transect
  const WaterLevelSource* water_levels = nullptr;
  const WaveSource* waves = nullptr;
  WaveCorrection wave_correction = WaveCorrection::setup;
  const SensorTable* sensors = nullptr;
  SensorOffsetMode sensor_offset_mode = SensorOffsetMode::estimate;  // the sensor_offsets step
  SlopePlan slopes;

  double z_ref_for(const std::string& transect_id) const {
    auto it = z_ref_by_transect.find(transect_id);
    return it == z_ref_by_transect.end() ? reference_elevation_m : it->second;
  }
};

}  // namespace strandline
