// Per-transect and per-site summaries of a finished run, as typed values: unknown
// numbers stay NaN, missing parts std::nullopt. server/io/summary_json writes them
// (the batch summary file, GET /v1/sites/{site}/summary and the GeoPackage
// transect layer all read that one form).
#pragma once

#include <map>
#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "corrections/core/run_inputs.h"
#include "corrections/core/site_table.h"
#include "qc/trend_summary.h"

namespace strandline {

inline constexpr int kSummarySchemaVersion = 1;

struct SummaryOptions {
  TimeS trend_from_s = kUnknown;  // optional window for trends
  TimeS trend_to_s = kUnknown;
};

// One family's offset on a transect or across the site, and whether the run
// shifted that family's positions (sensor_offsets step).
struct SensorOffsetReport {
  FamilyOffset estimate;
  bool corrected = false;
};

// A sensor's measured scatter beside its stated sigma, from the differences d
// between consecutive accepted points of that sensor on a transect (pooled over
// the run's transects): 1.4826 * MAD(d) / sqrt(2) (a difference of two
// independent errors has twice their variance; real change between neighbouring
// images of one sensor is small next to the noise). Residuals about a running
// median were tried and read 25% low for a sparse sensor (the median of a few
// points follows each of them).
struct SensorNoise {
  std::string sensor;
  std::string class_name;
  std::string family;
  double stated_sigma_m = kUnknown;    // the sensor table's
  double measured_sigma_m = kUnknown;  // unknown with fewer than 2 differences
  std::size_t n = 0;                   // differences used
};

struct TransectSummary {
  std::string transect_id;
  double slope = kUnknown;
  double slope_sigma = kUnknown;
  double slope_ci95_low = kUnknown;  // the interval is reported only when `low` is known
  double slope_ci95_high = kUnknown;
  SlopeSource slope_source = SlopeSource::none;
  bool slope_identifiable = true;
  double z_ref_m = kUnknown;
  std::size_t n_observations = 0;
  std::size_t n_corrected = 0;  // with a corrected position
  std::size_t n_accepted = 0;   // of those, carrying no rejecting flag
  std::map<std::string, std::size_t> counts_by_flag;  // flag name -> points carrying it
  TimeS first_accepted_s = kUnknown;
  TimeS last_accepted_s = kUnknown;
  double mean_interval_days = kUnknown;  // between accepted points; unknown with fewer than 2
  TrendWindow trend_window;
  std::optional<TrendSummary> trend;
  std::optional<SeasonalSummary> seasonal;
  std::vector<SensorOffsetReport> sensor_offsets;  // this transect's own estimates
  std::vector<SensorNoise> sensor_noise;           // from this transect's points (sensors it holds)
  std::vector<std::string> cautions;
  nlohmann::json slope_details;  // the slope step's record, as it stored it (null: none)
};

struct SiteSummary {
  int schema_version = kSummarySchemaVersion;
  double reference_elevation_m = 0.0;
  std::optional<WaveCorrection> wave_correction;  // none: the run had no wave record
  std::vector<TransectSummary> transects;
  std::optional<SiteSensorOffsets> sensor_offsets;  // none: the step did not run
  std::vector<SensorOffsetReport> site_sensor_offsets;  // estimates pooled over the run's transects
  std::vector<SensorNoise> sensor_noise;            // per sensor present in the run, by name
  std::vector<std::string> cautions;  // the standard cautions of every output
};

TransectSummary transect_summary(const SiteTable& table, std::size_t transect, const RunInputs& inputs,
                                 const SummaryOptions& options);
// The same without the run's inputs (the slope-bound re-evaluation then assumes a
// slope-free wave term, exact for `none` and `setup`).
TransectSummary transect_summary(const SiteTable& table, std::size_t transect, const SummaryOptions& options);

// The noise report of every sensor present in `table` (pooled over its transects),
// or of the sensors of one transect.
std::vector<SensorNoise> sensor_noise_report(const SiteTable& table, const RunInputs& inputs);
std::vector<SensorNoise> sensor_noise_report(const SiteTable& table, std::size_t transect, const RunInputs& inputs);

SiteSummary site_summary(const SiteTable& table, const RunInputs& inputs, const SummaryOptions& options);
// The site-wide parts alone (sensor offsets pooled over the run's transects, the
// per-sensor noise, the cautions), no transect summaries: what a service run keeps
// in its provenance for GET .../summary, whose transects come from several runs.
SiteSummary site_level_summary(const SiteTable& table, const RunInputs& inputs);
void add_site_level_parts(const SiteTable& table, const RunInputs& inputs, SiteSummary& summary);

}  // namespace strandline
