#include "qc/despike_step.h"

#include <cmath>

#include "corrections/core/param_reader.h"
#include "qc/transect_series.h"

namespace strandline {

void DespikeStep::Params::validate(const std::string& pointer) const {
  if (!(k > 0)) throw ConfigError(pointer + "/k", "expected a positive number");
  if (!(min_jump_m >= 0)) throw ConfigError(pointer + "/min_jump_m", "expected a non-negative number of metres");
  if (!(max_gap_days > 0)) throw ConfigError(pointer + "/max_gap_days", "expected a positive number of days");
}

std::unique_ptr<Step> DespikeStep::make(const nlohmann::json& params, const std::string& pointer) {
  Params p;
  ParamReader r(params, pointer);
  r.number("k", p.k);
  r.number("min_jump_m", p.min_jump_m);
  r.number("max_gap_days", p.max_gap_days);
  r.finish();
  p.validate(pointer);
  return std::make_unique<DespikeStep>(p);
}

DespikeStep::DespikeStep(const Params& p)
    : TransectStep("despike", {{"k", p.k}, {"min_jump_m", p.min_jump_m}, {"max_gap_days", p.max_gap_days}}), p_(p) {}

void DespikeStep::process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const {
  const TransectInfo& t = table.transects[transect];
  const auto mask = usable_mask(table, transect);
  const auto noise = class_noise_m(table, transect, inputs, mask);
  std::vector<std::size_t> rows;
  for (std::size_t i = t.begin; i < t.end; ++i)
    if (mask[i - t.begin]) rows.push_back(i);
  const double max_gap_s = p_.max_gap_days * kSecondsPerDay;
  // Decide on the series as it came in, then flag: one spike must not hide its neighbour's test.
  std::vector<std::size_t> spikes;
  for (std::size_t k = 1; k + 1 < rows.size(); ++k) {
    const std::size_t i = rows[k], a = rows[k - 1], b = rows[k + 1];
    if (has_flag(table.flags[i], Flag::storm_response)) continue;
    if (table.time_s[i] - table.time_s[a] > max_gap_s || table.time_s[b] - table.time_s[i] > max_gap_s) continue;
    const double d_prev = table.chainage_m[i] - table.chainage_m[a];
    const double d_next = table.chainage_m[i] - table.chainage_m[b];
    if (d_prev * d_next <= 0) continue;
    const double ni = noise[i - t.begin];
    const double limit_prev = std::max(p_.min_jump_m, p_.k * std::hypot(ni, noise[a - t.begin]));
    const double limit_next = std::max(p_.min_jump_m, p_.k * std::hypot(ni, noise[b - t.begin]));
    if (std::abs(d_prev) > limit_prev && std::abs(d_next) > limit_next) spikes.push_back(i);
  }
  for (std::size_t i : spikes) table.add_flag(i, Flag::spike);
  log.count("spike", static_cast<std::int64_t>(spikes.size()));
}

}  // namespace strandline
