// `strandline serve --demo`: the invented demo site (demo_data/synthetic)
// stored as uploads, with one finished run, so the service starts with data.
#pragma once

#include <string>

#include "server/app/run_manager.h"
#include "server/store/store.h"

namespace strandline::app {

inline constexpr const char* kDemoSiteId = "demo";

// Creates the site, uploads its inputs and runs it (blocking until the run is done).
// Returns the run id.
std::int64_t load_demo_site(store::Store& store, RunManager& runs);

}  // namespace strandline::app
