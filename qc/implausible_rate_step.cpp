#include "qc/implausible_rate_step.h"

#include <cmath>

#include "corrections/core/param_reader.h"
#include "qc/transect_series.h"

namespace strandline {

void ImplausibleRateStep::Params::validate(const std::string& pointer) const {
  if (!(max_rate_m_per_day > 0)) throw ConfigError(pointer + "/max_rate_m_per_day", "expected a positive rate");
  if (!(k > 0)) throw ConfigError(pointer + "/k", "expected a positive number");
  if (max_consecutive < 1 || max_consecutive > 100) throw ConfigError(pointer + "/max_consecutive", "expected 1 to 100");
}

std::unique_ptr<Step> ImplausibleRateStep::make(const nlohmann::json& params, const std::string& pointer) {
  Params p;
  ParamReader r(params, pointer);
  r.number("max_rate_m_per_day", p.max_rate_m_per_day);
  r.number("k", p.k);
  r.integer("max_consecutive", p.max_consecutive);
  r.finish();
  p.validate(pointer);
  return std::make_unique<ImplausibleRateStep>(p);
}

ImplausibleRateStep::ImplausibleRateStep(const Params& p)
    : TransectStep("implausible_rate",
                   {{"max_rate_m_per_day", p.max_rate_m_per_day}, {"k", p.k}, {"max_consecutive", p.max_consecutive}}),
      p_(p) {}

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
