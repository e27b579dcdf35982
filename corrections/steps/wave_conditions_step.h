// Step `wave_conditions`: the deep-water sea state at each image time, before
// the slope search needs it. From the run's WaveSource (Hs, Tp, record depth):
//   hs0_m = Hs deshoaled to deep water with linear theory (no refraction)
//   l0_m  = g Tp^2 / (2 pi)
// Without a wave record the columns stay empty; with one, a point whose time has
// no sea state within `max_gap_s` gets the no_wave_data flag and empty columns.
#pragma once

#include "corrections/core/param_fields.h"
#include "corrections/core/step.h"

namespace strandline {

class WaveConditionsStep final : public TransectStep {
 public:
  struct Params {
    double max_gap_s = 3 * 3600.0;  // samples around an image time at most this far apart
    static const ParamList<Params>& fields();  // each parameter: name, unit, range, meaning
  };
  static std::unique_ptr<Step> make(const nlohmann::json& params, const std::string& pointer);
  explicit WaveConditionsStep(const Params& p);
  const Params& params() const { return p_; }

 private:
  void process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const override;
  Params p_;
};

}  // namespace strandline
