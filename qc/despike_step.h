// Step `despike`: a point far from both its neighbours in the same direction.
// Neighbours are the previous and next usable points of the transect (not more
// than `max_gap_days` away). The point is a spike when both differences have
// the same sign and both exceed max(min_jump_m, k * sqrt(noise_i^2 + noise_n^2)),
// noise being the transect's robust noise of each point's sensor class.
// storm_response points are left alone.
#pragma once

#include "corrections/core/param_fields.h"
#include "corrections/core/step.h"

namespace strandline {

class DespikeStep final : public TransectStep {
 public:
  struct Params {
    double k = 4.0;
    double min_jump_m = 20.0;
    double max_gap_days = 60.0;
    static const ParamList<Params>& fields();  // each parameter: name, unit, range, meaning
  };
  static std::unique_ptr<Step> make(const nlohmann::json& params, const std::string& pointer);
  explicit DespikeStep(const Params& p);

 private:
  void process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const override;
  Params p_;
};

}  // namespace strandline
