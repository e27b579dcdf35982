#include "corrections/engine/registry.h"

#include "corrections/steps/correct_step.h"
#include "corrections/steps/slope_step.h"
#include "corrections/steps/water_level_step.h"
#include "corrections/steps/wave_conditions_step.h"
#include "corrections/steps/wave_terms_step.h"
#include "qc/alongshore_step.h"
#include "qc/despike_step.h"
#include "qc/hampel_step.h"
#include "qc/image_misregistration_step.h"
#include "qc/image_quality_step.h"
#include "qc/implausible_rate_step.h"
#include "qc/sparse_period_step.h"
#include "qc/storm_response_step.h"
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
      // QC filters: flag, never delete (storm_response first so the outlier filters spare real change).
      {"image_quality", true, true, "cloud fraction and geolocation RMSE thresholds", ImageQualityStep::make},
      {"storm_response", true, true, "landward jumps after high waves that persist: kept as real change",
       StormResponseStep::make},
      {"despike", true, true, "a point far from both neighbours in the same direction", DespikeStep::make},
      {"hampel", true, true, "running median +- k * 1.4826 * MAD over a window in days", HampelStep::make},
      {"implausible_rate", true, true, "rate of change from the previous accepted point", ImplausibleRateStep::make},
      {"image_misregistration", true, true, "whole-image shift fitted across transects", ImageMisregistrationStep::make},
      {"alongshore", true, true, "a point at odds with neighbouring transects on the same image", AlongshoreStep::make},
      {"sparse_period", true, true, "too few accepted points around a point (warns)", SparsePeriodStep::make},
      {"uncertainty", true, false, "per-point sigma_m from independent terms", UncertaintyStep::make},
  };
  return registry;
}

}  // namespace strandline
