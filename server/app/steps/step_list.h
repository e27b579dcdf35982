// The one explicit list of steps, in pipeline order (physics order: water level,
// wave conditions, slope, wave terms, correction, QC filters, uncertainty), and
// pipelines configured from it. It sits above both step libraries (corrections/
// and qc/) so that neither includes the other's steps. Adding a step = one entry
// in step_list.cpp.
#pragma once

#include <nlohmann/json.hpp>

#include "corrections/engine/pipeline.h"
#include "corrections/engine/step_entry.h"

namespace strandline {

const StepList& step_list();

// A pipeline of the listed steps from a configuration object. Throws ConfigError.
Pipeline configured_pipeline(const nlohmann::json& config);
// Every step with its default parameters.
inline Pipeline default_pipeline() { return configured_pipeline(nlohmann::json::object()); }

}  // namespace strandline
