// What a pipeline needs to know of a step kind: its name, whether it runs by
// default and may be switched off, how to build it from its parameters and how
// its parameters are documented.
// The list itself (the physics order of every step) is assembled above the
// step libraries, in server/app/steps/step_list.h: the engine knows no step.
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
  // The step's parameter table (Markdown, from its field list) as server/FORMATS.md shows it.
  std::function<std::string()> parameter_docs;
};

// Steps in pipeline order.
using StepList = std::vector<StepEntry>;

}  // namespace strandline
