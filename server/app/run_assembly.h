// One assembly of a run for both faces: what a face gathered (from files or from
// the store) plus the run configuration become the engine's RunInputs, the
// configured pipeline and, after the run, the provenance record. The batch
// (`correct`, `slope`) and service runs differ only in where the material came
// from, so the same inputs and the same configuration give the same rows.
#pragma once

#include <memory>
#include <optional>
#include <string>
#include <unordered_map>
#include <vector>

#include <nlohmann/json.hpp>

#include "corrections/core/run_inputs.h"
#include "corrections/core/sensor_table.h"
#include "corrections/engine/pipeline.h"
#include "corrections/tide/constituent_set.h"
#include "corrections/waves/wave_record.h"
#include "server/app/run_config.h"

namespace strandline::app {

// What a face read for a run, before the configuration applies to it.
struct RunMaterial {
  std::vector<TimeS> gauge_times_s;  // the water-level record (empty: none)
  std::vector<double> gauge_levels_m;
  std::optional<tide::ConstituentSet> tide;  // harmonic constants (alone, or where the gauge has none)
  std::string tide_label;                    // where they came from, for provenance
  std::vector<WaveSample> waves;             // empty: no wave record
  std::unordered_map<std::string, SlopeValue> listed_slopes;
  std::unordered_map<std::string, double> z_ref_by_transect;
  SensorTable sensors = SensorTable::defaults();
  nlohmann::json inputs = nlohmann::json::array();  // what was read, for provenance
};

// Row counts of a run, for provenance.
struct RowCounts {
  std::size_t input = 0;     // rows read
  std::size_t rejected = 0;  // refused by the input rules (skipped)
};

class PreparedRun {
 public:
  // Throws InputError when the run has no water-level source at all.
  PreparedRun(RunConfig config, RunMaterial material);
  PreparedRun(const PreparedRun&) = delete;
  PreparedRun& operator=(const PreparedRun&) = delete;

  const RunConfig& config() const { return config_; }
  const RunInputs& inputs() const { return inputs_; }
  const SensorTable& sensors() const { return material_.sensors; }

  // Transects of `table` that would get no slope (no listed slope, no slope for
  // every transect, no default, no estimation), at most `limit` of them.
  std::vector<std::string> transects_without_slope(const SiteTable& table, std::size_t limit = 10) const;

  RunRecord run(SiteTable& table, const ProgressFn& progress = {}) const;

  // The summary JSON (server/io/summary_json) of every transect with the run's
  // cautions, and of one transect.
  nlohmann::json summary(const SiteTable& table) const;
  nlohmann::json transect_summary(const SiteTable& table, std::size_t transect) const;

  // {"version", "configuration", "inputs", "water_levels", "waves", "steps",
  //  "rows": {"input", "rejected", "cleaned", "accepted"}, "started", "finished"};
  // faces add keys of their own (the command, a service run's scope).
  nlohmann::json provenance(const RunRecord& record, const SiteTable& table, const RowCounts& rows,
                            const std::string& started, const std::string& finished) const;

 private:
  RunConfig config_;
  RunMaterial material_;
  std::unique_ptr<WaterLevelSource> gauge_, tide_, blended_;
  std::unique_ptr<WaveSource> waves_;
  RunInputs inputs_;
};

// What the correction did to the rows of a run: a row is corrected when its
// correction is known; the others lack a water level or a slope (or both: counted
// under the water level, the first missing input).
struct CorrectionCounts {
  std::size_t rows = 0, corrected = 0, accepted = 0;
  std::size_t no_water_level = 0, no_slope = 0, other = 0;  // uncorrected, by reason
  std::size_t coarse_gauge = 0;                  // rows between gauge samples over ~1 h apart
  std::size_t slope_minimum_at_range_edge = 0;   // transects whose search ended on the range
};
CorrectionCounts correction_counts(const SiteTable& table);

}  // namespace strandline::app
