// Step `slope`: the beach-face slope of each transect from the run's SlopePlan:
// a listed slope (--slopes / --transect-params), a slope for every transect
// (--slope), or the default with a flag. Points of a transect without a slope
// are flagged no_slope and stay uncorrected.
#pragma once

#include "corrections/core/step.h"

namespace strandline {

class SlopeStep final : public TransectStep {
 public:
  struct Params {
    void validate(const std::string&) const {}
  };
  static std::unique_ptr<Step> make(const nlohmann::json& params, const std::string& pointer);
  explicit SlopeStep(const Params& p);

 private:
  void process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const override;
  Params p_;
};

// The slope a plan gives a transect without estimation, if any.
std::optional<SlopeValue> planned_slope(const SlopePlan& plan, const std::string& transect_id);

}  // namespace strandline
