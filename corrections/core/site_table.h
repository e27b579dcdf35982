// The compact table a run works on: a few numbers per point, columns side by side
// (structure of arrays), points grouped by transect and sorted by time within a
// transect. Text never lives here: strings are interned once (ids, sensor names)
// and the input file is re-streamed when outputs are written.
//
// Unknown values are NaN in double columns ("unknown stays unknown, never 0").
#pragma once

#include <cmath>
#include <cstdint>
#include <limits>
#include <optional>
#include <string>
#include <unordered_map>
#include <vector>

#include <nlohmann/json.hpp>

#include "corrections/core/flags.h"
#include "corrections/core/sensor_offset.h"
#include "corrections/core/time_utc.h"

namespace strandline {

inline constexpr double kUnknown = std::numeric_limits<double>::quiet_NaN();
inline bool known(double v) { return !std::isnan(v); }

enum class SlopeSource : std::uint8_t { none, fixed, estimated, default_value };
std::string_view slope_source_name(SlopeSource s);  // "none", "fixed", "estimated", "default"

// Optional geometry of a transect in the work CRS (metres).
struct TransectGeometry {
  double origin_x_m = kUnknown;
  double origin_y_m = kUnknown;
  double azimuth_deg = kUnknown;  // clockwise from grid north, pointing seaward
  double length_m = kUnknown;
  bool present() const { return known(origin_x_m) && known(origin_y_m) && known(azimuth_deg); }
};

struct TransectInfo {
  std::string id;
  std::size_t begin = 0;  // first point row of this transect in the table
  std::size_t end = 0;    // one past the last
  TransectGeometry geometry;

  // Per-transect parameters (inputs) and results of the slope step.
  double z_ref_m = kUnknown;          // reference elevation for this transect
  double slope = kUnknown;            // tan(beta) used for the correction
  double slope_sigma = kUnknown;      // 1-sigma uncertainty of the slope
  double slope_ci95_low = kUnknown;
  double slope_ci95_high = kUnknown;
  SlopeSource slope_source = SlopeSource::none;
  bool slope_identifiable = true;
  nlohmann::json slope_details;  // what the slope step found (band, energy curve, verdict)
  std::vector<FamilyOffset> sensor_offsets;  // this transect's own estimates (sensor_offsets step)

  std::size_t size() const { return end - begin; }
};

struct SiteTable {
  // ---- raw inputs, one entry per point ----
  std::vector<std::uint32_t> transect;   // index into transects
  std::vector<std::uint32_t> image;      // index into image_ids
  std::vector<std::uint16_t> sensor;     // index into sensor_names
  std::vector<std::uint32_t> input_row;  // 0-based data row of the input file
  std::vector<TimeS> time_s;
  std::vector<double> chainage_raw_m;
  std::vector<double> cloud_fraction;  // 0..1, NaN unknown
  std::vector<double> georef_rmse_m;   // NaN unknown

  // ---- derived columns (filled by steps) ----
  std::vector<double> water_level_m;        // still water level at image time (datum metres)
  std::vector<double> water_level_sigma_m;  // 1-sigma of the water level (vertical)
  std::vector<double> hs0_m;                // deep-water significant wave height
  std::vector<double> l0_m;                 // deep-water wavelength from Tp
  std::vector<double> setup_m;              // Stockdon setup (vertical)
  std::vector<double> runup_m;              // Stockdon R2% (vertical)
  std::vector<double> wave_level_m;         // the wave term entering the correction
  std::vector<double> wave_sigma_m;         // 1-sigma of the wave term (vertical)
  std::vector<double> correction_m;         // chainage_m - chainage_raw_m
  std::vector<double> sensor_offset_m;      // sensor offset subtracted from the position (NaN: none)
  std::vector<double> chainage_m;           // corrected position of the z_ref contour
  std::vector<double> sigma_m;              // total 1-sigma horizontal uncertainty
  std::vector<double> sigma_sensor_m;       // terms of sigma_m (horizontal metres)
  std::vector<double> sigma_water_level_m;
  std::vector<double> sigma_slope_m;
  std::vector<double> sigma_wave_m;
  std::vector<double> sigma_sensor_offset_m;  // 1-sigma of the applied sensor offset (NaN: none applied)
  std::vector<FlagSet> flags;

  // ---- dictionaries ----
  std::vector<TransectInfo> transects;
  std::vector<std::string> image_ids;
  std::vector<std::string> sensor_names;

  // ---- site results ----
  SiteSensorOffsets sensor_offsets;

  std::size_t size() const { return time_s.size(); }
  bool accepted(std::size_t row) const { return is_accepted(flags[row]); }
  void add_flag(std::size_t row, Flag f) { flags[row] |= flag_bit(f); }

  // Sets every derived column to unknown and clears flags, for `size()` points.
  void reset_derived();
};

// Builds a SiteTable from points appended in any order: interns ids, then sorts
// by (transect, time) and fills the transect ranges. Used by every reader.
class SiteTableBuilder {
 public:
  struct Point {
    std::uint32_t input_row;
    TimeS time_s;
    double chainage_raw_m;
    double cloud_fraction = kUnknown;
    double georef_rmse_m = kUnknown;
  };

  std::uint32_t transect_index(const std::string& id);
  std::uint32_t image_index(const std::string& id);
  std::uint16_t sensor_index(const std::string& name);
  // Index of an existing transect, if any.
  std::optional<std::uint32_t> find_transect(const std::string& id) const;

  // Returns false when (transect, image) was already added (a duplicate).
  bool add(std::uint32_t transect, std::uint32_t image, std::uint16_t sensor, const Point& p);
  // Input row of the first point stored for (transect, image).
  std::uint32_t first_row_of(std::uint32_t transect, std::uint32_t image) const;

  std::size_t size() const { return points_.size(); }
  SiteTable build() &&;

 private:
  struct Staged {
    std::uint32_t transect, image;
    std::uint16_t sensor;
    Point p;
  };
  std::vector<Staged> points_;
  std::vector<std::string> transect_ids_, image_ids_, sensor_names_;
  std::unordered_map<std::string, std::uint32_t> transect_lookup_, image_lookup_;
  std::unordered_map<std::string, std::uint16_t> sensor_lookup_;
  std::unordered_map<std::uint64_t, std::uint32_t> seen_pairs_;  // (transect, image) -> input row
};

}  // namespace strandline
