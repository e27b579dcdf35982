#include "qc/despike_step.h"

#include <cmath>

#include "qc/transect_series.h"

namespace strandline {

const ParamList<DespikeStep::Params>& DespikeStep::Params::fields() {
  static const ParamList<Params> list = {
      {.name = "k", .member = member_of<&Params::k>, .lower = greater_than(0),
       .meaning = "both jumps exceed k √(noise² + noise_neighbour²)"},
      {.name = "min_jump_m", .member = member_of<&Params::min_jump_m>, .unit = "m", .lower = at_least(0),
       .meaning = "and both exceed this"},
      {.name = "max_gap_days", .member = member_of<&Params::max_gap_days>, .unit = "days", .lower = greater_than(0),
       .meaning = "neighbours farther apart in time are not compared"},
  };
  return list;
}

std::unique_ptr<Step> DespikeStep::make(const nlohmann::json& params, const std::string& pointer) {
  return std::make_unique<DespikeStep>(read_params(Params::fields(), params, pointer));
}

DespikeStep::DespikeStep(const Params& p) : TransectStep("despike", params_json(Params::fields(), p)), p_(p) {}

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
