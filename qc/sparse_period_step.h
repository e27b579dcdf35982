// Step `sparse_period` (warns only): an accepted point with fewer than
// `min_points` accepted points (itself included) within +-half_window_days.
// Trends and filters lean on few points there.
#pragma once

#include "corrections/core/param_fields.h"
#include "corrections/core/step.h"

namespace strandline {

class SparsePeriodStep final : public TransectStep {
 public:
  struct Params {
    double half_window_days = 60.0;
    long long min_points = 3;
    static const ParamList<Params>& fields();  // each parameter: name, unit, range, meaning
  };
  static std::unique_ptr<Step> make(const nlohmann::json& params, const std::string& pointer);
  explicit SparsePeriodStep(const Params& p);

 private:
  void process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const override;
  Params p_;
};

}  // namespace strandline
