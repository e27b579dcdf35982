// One corrected, quality-controlled point as a run delivers it: the typed
// result that every writer (CSV, JSON, GeoPackage/GeoJSON) and the store take.
// Formatting (decimals, escaping, null vs empty) belongs to the writers alone.
#pragma once

#include <string>

#include "corrections/core/flags.h"
#include "corrections/core/site_table.h"

namespace strandline {

struct CleanedRow {
  std::string transect_id;
  TimeS time_s = 0;
  std::string sensor;
  std::string image_id;
  double chainage_raw_m = kUnknown;
  double water_level_m = kUnknown;
  double setup_m = kUnknown;
  double runup_m = kUnknown;
  double wave_level_m = kUnknown;
  double z_ref_m = kUnknown;
  double slope = kUnknown;
  double correction_m = kUnknown;
  double sensor_offset_m = kUnknown;  // subtracted sensor-family offset (unknown: none applied)
  double chainage_m = kUnknown;
  double sigma_m = kUnknown;
  double sigma_sensor_m = kUnknown;
  double sigma_water_level_m = kUnknown;
  double sigma_slope_m = kUnknown;
  double sigma_wave_m = kUnknown;
  double sigma_sensor_offset_m = kUnknown;  // only where a sensor offset was applied
  double cloud_fraction = kUnknown;
  double georef_rmse_m = kUnknown;
  FlagSet flags = 0;
  bool accepted = false;
};

// Row `row` of a processed table.
CleanedRow cleaned_row(const SiteTable& table, std::size_t row);

}  // namespace strandline
