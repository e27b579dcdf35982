// The rules of the series inputs — water levels, waves, slopes — written once
// and applied by the batch readers (water_level_csv, wave_csv,
// transect_params_csv) and the HTTP uploads (server/app/upload_rows.h).
// Per row: `*_row` parse and check one record's text fields. Per file: the
// `*FileRules` classes, fed the valid rows in order, and `finish` for rules on
// the whole record. Problems carry the field, the value and the reason; the
// caller sets the line (and the batch throws the first one).
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

#include "corrections/core/site_table.h"
#include "server/io/column_rules.h"
#include "server/io/observation_rules.h"

namespace strandline {

// ---- water levels: time,level_m (metres on the site datum) ----

const InputColumns& water_level_input_columns();

// Units rule: a gauge record in metres spans at most this much, and no value lies
// farther than this from its median (tidal ranges stay below ~16 m).
inline constexpr double kMaxWaterLevelSpread_m = 25.0;

struct WaterLevelSample {
  TimeS time_s = 0;
  double level_m = 0;
};

std::optional<RowProblem> water_level_row(std::string_view time_text, std::string_view level_text,
                                          WaterLevelSample& out);

class WaterLevelFileRules {
 public:
  explicit WaterLevelFileRules(RowPlace place = line_place) : place_(std::move(place)) {}
  // Times strictly increasing; records the sample when admitted.
  std::optional<RowProblem> admit(const WaterLevelSample& sample, std::string_view time_text, std::int64_t line);
  // Whole-record rules on the admitted samples: at least two, and the units
  // rule. Row problems (a value far from the median) carry their line; a
  // problem of the whole record has line 0 and no field.
  std::vector<RowProblem> finish() const;

 private:
  RowPlace place_;
  std::vector<WaterLevelSample> samples_;
  std::vector<std::int64_t> lines_;
};

// ---- waves: time,hs_m,tp_s[,dir_deg][,depth_m] ----

const InputColumns& wave_input_columns();

struct WaveSampleText {
  std::string_view time, hs_m, tp_s, dir_deg, depth_m;  // empty view: empty cell or absent column
};

struct WaveFields {
  TimeS time_s = 0;
  double hs_m = kUnknown, tp_s = kUnknown, dir_deg = kUnknown, depth_m = kUnknown;
};

std::optional<RowProblem> wave_row(const WaveSampleText& text, WaveFields& out);

class WaveFileRules {
 public:
  explicit WaveFileRules(RowPlace place = line_place) : place_(std::move(place)) {}
  // Times strictly increasing; a depth on every row or on none (one record is
  // taken at one place).
  std::optional<RowProblem> admit(const WaveFields& row, const WaveSampleText& text, std::int64_t line);
  // At least one row.
  std::optional<RowProblem> finish() const;

 private:
  RowPlace place_;
  std::int64_t rows_ = 0;
  TimeS last_time_s_ = 0;
  std::int64_t last_line_ = 0;
  bool first_has_depth_ = false;
  std::int64_t first_line_ = 0;
};

// ---- slopes: transect_id,slope[,slope_sigma] (tan beta) ----

// The slope columns; `with_z_ref` adds the batch --transect-params column z_ref_m
// and makes slope optional.
const InputColumns& slope_input_columns(bool with_z_ref);

// Checks a slope value from any source (option, file, upload): 0 < s <= 1.
// Returns the reason when invalid.
std::optional<std::string> slope_problem(double slope);

struct SlopeFields {
  std::string transect_id;
  double slope = kUnknown;
  double slope_sigma = kUnknown;
};

// `slope_required`: an empty slope is a problem (else it stays unknown).
std::optional<RowProblem> slope_row(std::string_view transect_id, std::string_view slope_text,
                                    std::string_view sigma_text, bool slope_required, SlopeFields& out);

class SlopeFileRules {
 public:
  explicit SlopeFileRules(RowPlace place = line_place) : place_(std::move(place)) {}
  // A transect listed once.
  std::optional<RowProblem> admit(const std::string& transect_id, std::int64_t line);

 private:
  RowPlace place_;
  std::unordered_map<std::string, std::int64_t> seen_;
};

}  // namespace strandline
