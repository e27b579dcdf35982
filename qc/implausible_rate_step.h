// Step `implausible_rate`: the change from the previous accepted point is more
// than the beach can do in the time between them plus what the noise allows:
//     |x_i - x_ref| > max_rate_m_per_day * dt_days + k * sqrt(noise_i^2 + noise_ref^2)
// x_ref is the last accepted point before i. A flagged point does not become the
// reference. When `max_consecutive` points in a row fail against one
// reference, the reference is the odd one out: those points are released (not
// flagged) and the walk restarts from the latest of them. storm_response points
// are never flagged (a storm moves a beach tens of metres in a day) but do
// become the reference.
#pragma once

#include "corrections/core/param_fields.h"
#include "corrections/core/step.h"

namespace strandline {

class ImplausibleRateStep final : public TransectStep {
 public:
  struct Params {
    double max_rate_m_per_day = 1.0;  // common practice: sustained non-storm change is well below 1 m/day
    double k = 4.0;
    long long max_consecutive = 2;
    static const ParamList<Params>& fields();  // each parameter: name, unit, range, meaning
  };
  static std::unique_ptr<Step> make(const nlohmann::json& params, const std::string& pointer);
  explicit ImplausibleRateStep(const Params& p);

 private:
  void process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const override;
  Params p_;
};

}  // namespace strandline
