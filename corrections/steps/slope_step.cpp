#include "corrections/steps/slope_step.h"

#include "corrections/core/param_reader.h"

namespace strandline {

std::optional<SlopeValue> planned_slope(const SlopePlan& plan, const std::string& transect_id) {
  if (auto it = plan.per_transect.find(transect_id); it != plan.per_transect.end()) return it->second;
  if (plan.all) return plan.all;
  return std::nullopt;
}

std::unique_ptr<Step> SlopeStep::make(const nlohmann::json& params, const std::string& pointer) {
  Params p;
  ParamReader r(params, pointer);
  r.finish();
  p.validate(pointer);
  return std::make_unique<SlopeStep>(p);
}

SlopeStep::SlopeStep(const Params& p) : TransectStep("slope", nlohmann::json::object()), p_(p) {}

void SlopeStep::process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const {
  TransectInfo& t = table.transects[transect];
  auto flag_all = [&](Flag f) {
    for (std::size_t i = t.begin; i < t.end; ++i) table.add_flag(i, f);
  };
  if (auto fixed = planned_slope(inputs.slopes, t.id)) {
    t.slope = fixed->slope;
    t.slope_sigma = fixed->slope_sigma;
    t.slope_source = SlopeSource::fixed;
    log.count("fixed");
  } else if (inputs.slopes.default_value) {
    t.slope = inputs.slopes.default_value->slope;
    t.slope_sigma = inputs.slopes.default_value->slope_sigma;
    t.slope_source = SlopeSource::default_value;
    flag_all(Flag::default_slope);
    log.count("default");
  } else {
    t.slope_source = SlopeSource::none;
    flag_all(Flag::no_slope);
    log.count("none");
    return;
  }
  if (known(t.slope_sigma)) {
    t.slope_ci95_low = std::max(0.0, t.slope - 1.959964 * t.slope_sigma);
    t.slope_ci95_high = t.slope + 1.959964 * t.slope_sigma;
  }
}

}  // namespace strandline
