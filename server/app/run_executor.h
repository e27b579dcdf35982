// One service run over a site's stored inputs: loads the live inputs of the
// transects in scope into the run material, prepares the run as the batch does
// (run_assembly.h) and returns each transect's typed rows and summary. The run
// manager calls it on a worker thread.
#pragma once

#include <cstdint>
#include <functional>
#include <set>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "server/app/run_config.h"
#include "server/store/store.h"

namespace strandline::app {

// The transects a run covers: every one, or those with inputs changed since
// the last finished run (site-wide inputs changed = every one).
std::set<std::string> transects_in_scope(store::Store& store, const store::RunInfo& run);

struct RunOutput {
  std::vector<store::TransectResult> results;
  nlohmann::json provenance;
};

// `progress(done, total)` is called as transects finish. Throws InputError /
// ConfigError / StoreError (the run fails with that reason).
RunOutput execute_run(store::Store& store, const store::RunInfo& run, const std::set<std::string>& transects,
                      const ProgressFn& progress);

// The run configuration of a service run: the request body, or the site's
// processing defaults when the body is empty, with the site's reference
// elevation and default slope as defaults. Throws ConfigError.
RunConfig run_config_for(const store::Site& site, const nlohmann::json& options);

}  // namespace strandline::app
