#include "server/app/steps/step_list.h"

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
#include "qc/sensor_offset_step.h"
#include "qc/sparse_period_step.h"
#include "qc/storm_response_step.h"
#include "qc/uncertainty_step.h"

namespace strandline {

namespace {

// One entry of the list: the step class S gives the factory and the parameter table.
template <class S>
StepEntry entry(std::string name, bool enabled_by_default, bool can_disable, std::string summary) {
  return {std::move(name), enabled_by_default, can_disable, std::move(summary), &S::make,
          [] { return params_markdown_table(S::Params::fields(), typename S::Params{}); }};
}

}  // namespace

const StepList& step_list() {
  // Pipeline order: name, enabled by default, can be disabled, summary.
  static const StepList list = {
      entry<WaterLevelStep>("water_level", true, false,
                            "still water level at image time (gauge interpolation / tide prediction)"),
      entry<WaveConditionsStep>("wave_conditions", true, false,
                                "deep-water H0 and L0 at image time (linear-theory deshoaling)"),
      entry<SlopeStep>("slope", true, false, "beach-face slope per transect (fixed, default, or estimated)"),
      entry<WaveTermsStep>("wave_terms", true, false,
                           "Stockdon (2006) setup and R2% with the slope; the wave term applied"),
      entry<CorrectStep>("correct", true, false, "horizontal shift to the reference contour"),
      entry<SensorOffsetStep>("sensor_offsets", true, false,
                              "offsets between sensor families: estimated, applied as the run configuration says"),
      // QC filters: flag, never delete (storm_response first so the outlier filters spare real change).
      entry<ImageQualityStep>("image_quality", true, true, "cloud fraction and geolocation RMSE thresholds"),
      entry<StormResponseStep>("storm_response", true, true,
                               "landward jumps after high waves that persist: kept as real change"),
      entry<DespikeStep>("despike", true, true, "a point far from both neighbours in the same direction"),
      entry<HampelStep>("hampel", true, true, "running median +- k * 1.4826 * MAD over a window in days"),
      entry<ImplausibleRateStep>("implausible_rate", true, true, "rate of change from the previous accepted point"),
      entry<ImageMisregistrationStep>("image_misregistration", true, true,
                                      "whole-image shift fitted across transects"),
      entry<AlongshoreStep>("alongshore", true, true, "a point at odds with neighbouring transects on the same image"),
      entry<SparsePeriodStep>("sparse_period", true, true, "too few accepted points around a point (warns)"),
      entry<UncertaintyStep>("uncertainty", true, false, "per-point sigma_m from independent terms"),
  };
  return list;
}

Pipeline configured_pipeline(const nlohmann::json& config) { return Pipeline::from_config(config, step_list()); }

}  // namespace strandline
