#include "corrections/engine/registry.h"

#include "corrections/steps/correct_step.h"
#include "corrections/steps/slope_step.h"
#include "corrections/steps/water_level_step.h"
#include "qc/uncertainty_step.h"

namespace strandline {

const std::vector<StepEntry>& step_registry() {
  // Pipeline order. {name, enabled by default, can be disabled, summary, factory}
  static const std::vector<StepEntry> registry = {
      {"water_level", true, false, "still water level at image time (gauge interpolation / tide prediction)",
       WaterLevelStep::make},
      {"slope", true, false, "beach-face slope per transect (fixed, default, or estimated)", SlopeStep::make},
      {"correct", true, false, "horizontal shift to the reference contour", CorrectStep::make},
      {"uncertainty", true, false, "per-point sigma_m from independent terms", UncertaintyStep::make},
  };
  return registry;
}

}  // namespace strandline
