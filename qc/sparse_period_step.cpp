#include "qc/sparse_period_step.h"

#include "qc/transect_series.h"

namespace strandline {

const ParamList<SparsePeriodStep::Params>& SparsePeriodStep::Params::fields() {
  static const ParamList<Params> list = {
      {.name = "half_window_days", .member = member_of<&Params::half_window_days>, .unit = "days",
       .lower = greater_than(0), .meaning = "half-width of the window around each accepted point"},
      {.name = "min_points", .member = member_of<&Params::min_points>, .lower = at_least(1), .upper = at_most(1000),
       .meaning = "fewer accepted points (the point included) in the window warn"},
  };
  return list;
}

std::unique_ptr<Step> SparsePeriodStep::make(const nlohmann::json& params, const std::string& pointer) {
  return std::make_unique<SparsePeriodStep>(read_params(Params::fields(), params, pointer));
}

SparsePeriodStep::SparsePeriodStep(const Params& p)
    : TransectStep("sparse_period", params_json(Params::fields(), p)), p_(p) {}

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
