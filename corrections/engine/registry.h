// The one explicit list of steps, in pipeline order (physics order: water level,
// wave conditions, slope, wave terms, correction, QC filters, uncertainty).
// Adding a step = one entry in registry.cpp.
#pragma once

#include <functional>
#include <memory>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "corrections/core/step.h"

namespace strandline {

struct StepEntry {
  std::string name;
  bool enabled_by_default;
  bool can_disable;  // false for steps the correction cannot do without
  std::string summary;
  // Builds the step from its parameters object (may be null); `pointer` is the
  // JSON pointer of that object for error messages.
  std::function<std::unique_ptr<Step>(const nlohmann::json& params, const std::string& pointer)> make;
};

const std::vector<StepEntry>& step_registry();

}  // namespace strandline
