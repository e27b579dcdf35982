#include "qc/implausible_rate_step.h"

#include <cmath>

#include "qc/transect_series.h"

namespace strandline {

const ParamList<ImplausibleRateStep::Params>& ImplausibleRateStep::Params::fields() {
  static const ParamList<Params> list = {
      {.name = "max_rate_m_per_day", .member = member_of<&Params::max_rate_m_per_day>, .unit = "m/day",
       .lower = greater_than(0),
       .meaning = "fastest change allowed outside storms (common practice: well below 1 m/day)"},
      {.name = "k", .member = member_of<&Params::k>, .lower = greater_than(0),
       .meaning = "k √(noise² + noise_ref²) allowed on top of the rate"},
      {.name = "max_consecutive", .member = member_of<&Params::max_consecutive>, .lower = at_least(1),
       .upper = at_most(100),
       .meaning = "more failures in a row than this release them: the reference was the odd one"},
  };
  return list;
}

std::unique_ptr<Step> ImplausibleRateStep::make(const nlohmann::json& params, const std::string& pointer) {
  return std::make_unique<ImplausibleRateStep>(read_params(Params::fields(), params, pointer));
}

ImplausibleRateStep::ImplausibleRateStep(const Params& p)
    : TransectStep("implausible_rate", params_json(Params::fields(), p)), p_(p) {}

void ImplausibleRateStep::process(SiteTable& table, std::size_t transect, const RunInputs& inputs,
                                  StepLog& log) const {
  const TransectInfo& t = table.transects[transect];
  const auto mask = usable_mask(table, transect);
  const auto noise = class_noise_m(table, transect, inputs, mask);
  std::int64_t flagged = 0, released = 0;
  std::ptrdiff_t ref = -1;
  std::vector<std::size_t> pending;  // failing points since the reference
  auto commit = [&] {
    for (std::size_t i : pending) table.add_flag(i, Flag::implausible_rate);
    flagged += static_cast<std::int64_t>(pending.size());
    pending.clear();
  };
  for (std::size_t i = t.begin; i < t.end; ++i) {
    if (!mask[i - t.begin]) continue;
    if (ref < 0 || has_flag(table.flags[i], Flag::storm_response)) {
      commit();
      ref = static_cast<std::ptrdiff_t>(i);
      continue;
    }
    const std::size_t r = static_cast<std::size_t>(ref);
    const double dt_days = (table.time_s[i] - table.time_s[r]) / kSecondsPerDay;
    const double allowed = p_.max_rate_m_per_day * dt_days + p_.k * std::hypot(noise[i - t.begin], noise[r - t.begin]);
    if (std::abs(table.chainage_m[i] - table.chainage_m[r]) <= allowed) {
      commit();
      ref = static_cast<std::ptrdiff_t>(i);
      continue;
    }
    pending.push_back(i);
    if (static_cast<long long>(pending.size()) > p_.max_consecutive) {
      released += static_cast<std::int64_t>(pending.size());
      ref = static_cast<std::ptrdiff_t>(pending.back());
      pending.clear();
    }
  }
  commit();
  log.count("implausible_rate", flagged);
  log.count("released_after_odd_reference", released);
}

}  // namespace strandline
