#include "qc/hampel_step.h"

#include <cmath>

#include "corrections/core/param_reader.h"
#include "qc/robust_stats.h"
#include "qc/transect_series.h"

namespace strandline {

void HampelStep::Params::validate(const std::string& pointer) const {
  if (!(half_window_days > 0)) throw ConfigError(pointer + "/half_window_days", "expected a positive number of days");
  if (min_points < 3 || min_points > 1000) throw ConfigError(pointer + "/min_points", "expected 3 to 1000");
  if (!(k > 0)) throw ConfigError(pointer + "/k", "expected a positive number");
  if (!(min_threshold_m >= 0)) throw ConfigError(pointer + "/min_threshold_m", "expected a non-negative number of metres");
}

std::unique_ptr<Step> HampelStep::make(const nlohmann::json& params, const std::string& pointer) {
  Params p;
  ParamReader r(params, pointer);
  r.number("half_window_days", p.half_window_days);
  r.integer("min_points", p.min_points);
  r.number("k", p.k);
  r.number("min_threshold_m", p.min_threshold_m);
  r.finish();
  p.validate(pointer);
  return std::make_unique<HampelStep>(p);
}

HampelStep::HampelStep(const Params& p)
    : TransectStep("hampel", {{"half_window_days", p.half_window_days},
                              {"min_points", p.min_points},
                              {"k", p.k},
                              {"min_threshold_m", p.min_threshold_m}}),
      p_(p) {}

void HampelStep::process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const {
  const TransectInfo& t = table.transects[transect];
  const auto mask = usable_mask(table, transect);
  const auto noise = class_noise_m(table, transect, inputs, mask);
  const auto level = running_level(table, transect, mask,
                                   {p_.half_window_days, static_cast<std::size_t>(p_.min_points), true});
  std::int64_t flagged = 0;
  for (std::size_t i = t.begin; i < t.end; ++i) {
    const std::size_t k = i - t.begin;
    if (!mask[k] || has_flag(table.flags[i], Flag::storm_response)) continue;
    if (level.count[k] < 3) continue;  // too few points to judge
    const double scale = std::max(kMadToSigma * level.mad_m[k], noise[k]);
    const double deviation = std::abs(table.chainage_m[i] - level.median_m[k]);
    if (deviation > p_.k * scale && deviation > p_.min_threshold_m) {
      table.add_flag(i, Flag::hampel_outlier);
      ++flagged;
    }
  }
  log.count("hampel_outlier", flagged);
}

}  // namespace strandline
