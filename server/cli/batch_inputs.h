// Loading everything a batch run needs from the command line, shared by the
// `correct` and `slope` subcommands: observations, water levels, slopes and
// per-transect parameters, the sensor table, the pipeline configuration.
// New input kinds (tide constituents, waves, transect geometry) plug in here.
#pragma once

#include <memory>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "corrections/core/run_inputs.h"
#include "corrections/engine/pipeline.h"
#include "server/cli/args.h"
#include "server/io/observations_csv.h"

namespace strandline::cli {

struct BatchInputs {
  std::string observations_path;
  ObservationFile observations;
  SensorTable sensors;
  std::vector<std::unique_ptr<WaterLevelSource>> water_level_sources;  // owned; inputs.water_levels points into it
  std::vector<std::unique_ptr<WaveSource>> wave_sources;
  RunInputs inputs;
  Pipeline pipeline = Pipeline::defaults();
  nlohmann::json input_files = nlohmann::json::array();  // {"role", "path", "sha256"} for provenance
  nlohmann::json parameters = nlohmann::json::object();  // command-line parameters for provenance

  void record_file(const std::string& role, const std::string& path);
};

struct BatchOptions {
  bool skip_invalid = false;
};

// Reads the options shared by batch commands from `args` (marking them used)
// and loads the files. Throws UsageError / InputError / ConfigError.
BatchInputs load_batch_inputs(Args& args, const BatchOptions& options);

// Checks that every transect will get a slope (or may be estimated) before a
// run starts: an unlisted transect without --default-slope is a usage error.
void check_slope_coverage(const BatchInputs& batch);

// The option lines shared by `correct` and `slope`, for --help.
std::string batch_options_help();

}  // namespace strandline::cli
