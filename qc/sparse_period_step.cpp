#include "qc/sparse_period_step.h"

#include "corrections/core/param_reader.h"
#include "qc/transect_series.h"

namespace strandline {

void SparsePeriodStep::Params::validate(const std::string& pointer) const {
  if (!(half_window_days > 0)) throw ConfigError(pointer + "/half_window_days", "expected a positive number of days");
  if (min_points < 1 || min_points > 1000) throw ConfigError(pointer + "/min_points", "expected 1 to 1000");
}

std::unique_ptr<Step> SparsePeriodStep::make(const nlohmann::json& params, const std::string& pointer) {
  Params p;
  ParamReader r(params, pointer);
  r.number("half_window_days", p.half_window_days);
  r.integer("min_points", p.min_points);
  r.finish();
  p.validate(pointer);
  return std::make_unique<SparsePeriodStep>(p);
}

SparsePeriodStep::SparsePeriodStep(const Params& p)
    : TransectStep("sparse_period", {{"half_window_days", p.half_window_days}, {"min_points", p.min_points}}), p_(p) {}

void SparsePeriodStep::process(SiteTable& table, std::size_t transect, const RunInputs&, StepLog& log) const {
  const TransectInfo& t = table.transects[transect];
  std::vector<std::size_t> rows;
  for (std::size_t i = t.begin; i < t.end; ++i)
    if (qc_usable(table, i)) rows.push_back(i);
  const double half_s = p_.half_window_days * kSecondsPerDay;
  std::size_t lo = 0, hi = 0;
  std::int64_t flagged = 0;
  for (std::size_t k = 0; k < rows.size(); ++k) {
    const TimeS tk = table.time_s[rows[k]];
    while (table.time_s[rows[lo]] < tk - half_s) ++lo;
    while (hi < rows.size() && table.time_s[rows[hi]] <= tk + half_s) ++hi;
    if (static_cast<long long>(hi - lo) < p_.min_points) {
      table.add_flag(rows[k], Flag::sparse_period);
      ++flagged;
    }
  }
  log.count("sparse_period", flagged);
}

}  // namespace strandline
