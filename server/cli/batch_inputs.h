// The batch face of run assembly, shared by `correct` and `slope`: reads the
// command-line options into the run configuration (the same object a service
// run takes: options override a --config file), reads the input files into the
// run material, and prepares the run with server/app/run_assembly.
#pragma once

#include <memory>
#include <string>

#include "server/app/run_assembly.h"
#include "server/cli/args.h"
#include "server/io/observations_csv.h"

namespace strandline::cli {

struct BatchInputs {
  std::string observations_path;
  ObservationFile observations;
  std::unique_ptr<app::PreparedRun> run;
};

struct BatchOptions {
  bool skip_invalid = false;
  bool estimate_slopes = false;  // `slope` always estimates
  bool trend_window = false;     // --trend-from/--trend-to (`correct` writes a summary)
};

// Declares the options shared by batch commands (those `options` lets the
// command accept), so that parsing and --help both know them.
void add_batch_options(Args& args, const BatchOptions& options);

// Reads the shared options from parsed `args` and loads the files.
// Throws UsageError / InputError / ConfigError.
BatchInputs load_batch_inputs(const Args& args, const BatchOptions& options);

// Refuses a run in which some transect would get no slope (a usage error naming them).
void check_slope_coverage(const BatchInputs& batch);

}  // namespace strandline::cli
