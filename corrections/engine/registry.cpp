#include "corrections/engine/registry.h"

#include "corrections/steps/correct_step.h"
#include "corrections/steps/slope_step.h"
#include "corrections/steps/water_level_step.h"
#include "corrections/steps/wave_conditions_step.h"
#include "corrections/steps/wave_terms_step.h"
#include "qc/uncertainty_step.h"

namespace strandline {

const std::vector<StepEntry>& step_registry() {
  // Pipeline order. {name, enabled by default, can be disabled, summary, factory}
  static const std::vector<StepEntry> registry = {
      {"water_level", true, false, "still water level at image time (gauge interpolation / tide prediction)",
       WaterLevelStep::make},
      {"wave_conditions", true, false, "deep-water H0 and L0 at image time (linear-theory deshoaling)",
       WaveConditionsStep::make},
      {"slope", true, false, "beach-face slope per transect (fixed, default, or estimated)", SlopeStep::make},
      {"wave_terms", true, false, "Stockdon (2006) setup and R2% with the slope; the wave term applied",
       WaveTermsStep::make},
      {"correct", true, false, "horizontal shift to the reference contour", CorrectStep::make},
      {"uncertainty", true, false, "per-point sigma_m from independent terms", UncertaintyStep::make},
  };
  return registry;
}

}  // namespace strandline
