// The run configuration: one JSON object for batch runs (`--config FILE`, with
// command-line options written into it) and service runs (the run request body,
// else the site's processing defaults). Besides the pipeline's keys
// (`schema_version`, `threads`, `steps`) it holds the processing choices of a
// run, so that both faces read, check and record them the same way:
//   "reference_elevation_m": 0.0,
//   "wave_correction": "none" | "setup" | "runup",
//   "slope": {"fixed": v, "fixed_sigma": v,          one slope for every transect
//             "estimate": bool, "search_range": [min, max],   estimate where none is listed
//             "default": v, "default_sigma": v},              where neither gives one (flagged)
//   "trend_window": {"from": TIME, "to": TIME},
//   "sensor_offsets": "estimate" | "none" | "given"   (corrections/core/sensor_offset.h)
// A key left out takes the caller's default (RunDefaults): a site's reference
// elevation and default slope in the service, the built-in values in the batch.
// The effective configuration (every key resolved) is what provenance records.
#pragma once

#include <optional>

#include <nlohmann/json.hpp>

#include "corrections/core/run_inputs.h"
#include "corrections/engine/pipeline.h"
#include "qc/summary.h"

namespace strandline::app {

// Defaults that depend on where a run comes from.
struct RunDefaults {
  double reference_elevation_m = 0.0;
  std::optional<SlopeValue> default_slope;
  bool estimate_slopes = false;  // the service estimates where no slope is stored
};

struct RunSettings {
  double reference_elevation_m = 0.0;
  WaveCorrection wave_correction = WaveCorrection::setup;
  bool estimate_slopes = false;
  double search_min = 0.01, search_max = 0.2;
  std::optional<SlopeValue> fixed_slope;
  std::optional<SlopeValue> default_slope;
  SensorOffsetMode sensor_offsets = SensorOffsetMode::estimate;
  SummaryOptions summary;
};

struct RunConfig {
  Pipeline pipeline;
  RunSettings settings;
  nlohmann::json effective;  // pipeline configuration + every setting, resolved
};

// Throws ConfigError naming the JSON pointer of the first bad key.
RunConfig read_run_config(const nlohmann::json& config, const RunDefaults& defaults);

}  // namespace strandline::app
