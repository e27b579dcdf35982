// One run of the engine over a site's stored inputs: loads the live inputs of
// the transects in scope, runs the configured pipeline, and turns each
// transect's rows into the stored result (JSON rows, CSV rows, summary). No
// HTTP here: the run manager calls it on a worker thread.
#pragma once

#include <cstdint>
#include <functional>
#include <set>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "corrections/engine/pipeline.h"
#include "server/store/store.h"

namespace strandline::http {

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

// The effective pipeline configuration of a run: the request body, or the
// site's processing defaults when the body is empty. Throws ConfigError.
Pipeline pipeline_for(const store::Site& site, const nlohmann::json& options);

}  // namespace strandline::http
