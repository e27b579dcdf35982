#include "qc/storm_response_step.h"

#include <algorithm>
#include <cmath>

#include "qc/robust_stats.h"
#include "qc/transect_series.h"

namespace strandline {

const ParamList<StormResponseStep::Params>& StormResponseStep::Params::fields() {
  static const ParamList<Params> list = {
      {.name = "hs_threshold_m", .member = member_of<&Params::hs_threshold_m>, .unit = "m", .lower = at_least(0),
       .meaning = "Hs above which a storm is on; 0 = automatic: max(`hs_min_m`, the `hs_quantile` of the record)"},
      {.name = "hs_quantile", .member = member_of<&Params::hs_quantile>, .lower = greater_than(0),
       .upper = less_than(1),
       .meaning = "quantile of the record's Hs over the observed span for the automatic threshold"},
      {.name = "hs_min_m", .member = member_of<&Params::hs_min_m>, .unit = "m", .lower = at_least(0),
       .meaning = "least automatic threshold"},
      {.name = "scan_step_s", .member = member_of<&Params::scan_step_s>, .unit = "s", .lower = greater_than(0),
       .meaning = "time step of the scan of the wave record"},
      {.name = "max_gap_s", .member = member_of<&Params::max_gap_s>, .unit = "s", .lower = greater_than(0),
       .meaning = "wave records around a scan time at most this far apart"},
      {.name = "merge_gap_days", .member = member_of<&Params::merge_gap_days>, .unit = "days", .lower = at_least(0),
       .meaning = "events closer than this are one event"},
      {.name = "pre_window_days", .member = member_of<&Params::pre_window_days>, .unit = "days",
       .lower = greater_than(0), .meaning = "window before a storm for the pre-storm level (median)"},
      {.name = "min_pre_points", .member = member_of<&Params::min_pre_points>, .lower = at_least(1),
       .meaning = "usable points needed in that window"},
      {.name = "jump_min_m", .member = member_of<&Params::jump_min_m>, .unit = "m", .lower = greater_than(0),
       .meaning = "least landward jump from the pre-storm level"},
      {.name = "jump_noise_k", .member = member_of<&Params::jump_noise_k>, .lower = greater_than(0),
       .meaning = "the jump is at least jump_noise_k noise"},
      {.name = "persist_points", .member = member_of<&Params::persist_points>, .lower = at_least(1),
       .upper = at_most(50), .meaning = "following usable points whose median must stay landward by half the jump"},
      {.name = "persist_days", .member = member_of<&Params::persist_days>, .unit = "days", .lower = greater_than(0),
       .meaning = "how far ahead those points may lie"},
      {.name = "consistency_k", .member = member_of<&Params::consistency_k>, .lower = greater_than(0),
       .meaning = "the point agrees with that median within consistency_k noise"},
      {.name = "max_response_days", .member = member_of<&Params::max_response_days>, .unit = "days",
       .lower = greater_than(0), .meaning = "scanning of an event stops this long after it"},
  };
  return list;
}

std::unique_ptr<Step> StormResponseStep::make(const nlohmann::json& params, const std::string& pointer) {
  return std::make_unique<StormResponseStep>(read_params(Params::fields(), params, pointer));
}

StormResponseStep::StormResponseStep(const Params& p)
    : SiteStep("storm_response", params_json(Params::fields(), p)), p_(p) {}

std::vector<StormEventSpan> StormResponseStep::find_events(const WaveSource& waves, TimeS from_s, TimeS to_s,
                                                           double& threshold_m) const {
  std::vector<std::pair<TimeS, double>> samples;
  for (TimeS t = from_s; t <= to_s; t += p_.scan_step_s)
    if (auto w = waves.at(t, p_.max_gap_s); w && known(w->hs_m)) samples.emplace_back(t, w->hs_m);
  threshold_m = p_.hs_threshold_m;
  if (!(threshold_m > 0)) {
    std::vector<double> hs;
    for (const auto& s : samples) hs.push_back(s.second);
    double q = p_.hs_min_m;
    if (!hs.empty()) {
      const std::size_t k = std::min(hs.size() - 1, static_cast<std::size_t>(p_.hs_quantile * hs.size()));
      std::nth_element(hs.begin(), hs.begin() + k, hs.end());
      q = std::max(q, hs[k]);
    }
    threshold_m = q;
  }
  std::vector<StormEventSpan> events;
  const double merge_s = p_.merge_gap_days * kSecondsPerDay;
  for (const auto& [t, hs] : samples) {
    if (hs <= threshold_m) continue;
    if (!events.empty() && t - events.back().end_s <= merge_s) {
      events.back().end_s = t;
      events.back().hs_peak_m = std::max(events.back().hs_peak_m, hs);
    } else {
      events.push_back({t, t, hs});
    }
  }
  return events;
}

void StormResponseStep::process(SiteTable& table, const RunInputs& inputs, StepLog& log) const {
  if (inputs.waves == nullptr || table.size() == 0) {
    log.note("skipped", "no wave record");
    return;
  }
  TimeS first = table.time_s[0], last = table.time_s[0];
  for (TimeS t : table.time_s) {
    first = std::min(first, t);
    last = std::max(last, t);
  }
  double threshold_m = 0;
  const auto events = find_events(*inputs.waves, first - p_.pre_window_days * kSecondsPerDay, last, threshold_m);
  log.note("hs_threshold_m", threshold_m);
  log.count("storm_events", static_cast<std::int64_t>(events.size()));

  const double day = kSecondsPerDay;
  for (std::size_t tr = 0; tr < table.transects.size(); ++tr) {
    const TransectInfo& t = table.transects[tr];
    const auto mask = usable_mask(table, tr);
    const auto noise = class_noise_m(table, tr, inputs, mask);
    std::vector<std::size_t> rows;  // usable rows (absolute)
    for (std::size_t i = t.begin; i < t.end; ++i)
      if (mask[i - t.begin]) rows.push_back(i);
    auto first_at_or_after = [&](TimeS time) {
      return std::lower_bound(rows.begin(), rows.end(), time,
                              [&](std::size_t r, TimeS v) { return table.time_s[r] < v; }) - rows.begin();
    };
    for (std::size_t e = 0; e < events.size(); ++e) {
      const auto& ev = events[e];
      std::vector<double> pre;
      for (auto k = first_at_or_after(ev.start_s - p_.pre_window_days * day);
           k < static_cast<std::ptrdiff_t>(rows.size()) && table.time_s[rows[k]] < ev.start_s; ++k)
        pre.push_back(table.chainage_m[rows[k]]);
      if (static_cast<long long>(pre.size()) < p_.min_pre_points) {
        log.count("events_without_pre_storm_level");
        continue;
      }
      const double pre_level = median_in_place(pre);
      const TimeS stop_s = std::min(ev.end_s + p_.max_response_days * day,
                                    e + 1 < events.size() ? events[e + 1].start_s : HUGE_VAL);
      std::vector<double> ahead;
      for (auto k = first_at_or_after(ev.start_s); k < static_cast<std::ptrdiff_t>(rows.size()); ++k) {
        const std::size_t row = rows[k];
        const TimeS tk = table.time_s[row];
        if (tk >= stop_s) break;
        ahead.clear();
        for (auto j = k + 1; j < static_cast<std::ptrdiff_t>(rows.size()) &&
                             ahead.size() < static_cast<std::size_t>(p_.persist_points) &&
                             table.time_s[rows[j]] - tk <= p_.persist_days * day;
             ++j)
          ahead.push_back(table.chainage_m[rows[j]]);
        if (ahead.empty()) break;  // persistence cannot be judged
        const double forward = median_in_place(ahead);
        const double sigma = noise[row - t.begin];
        const double jump = std::max(p_.jump_min_m, p_.jump_noise_k * sigma);
        if (pre_level - forward < 0.5 * jump) break;  // recovered (or never eroded)
        if (pre_level - table.chainage_m[row] > jump && std::abs(table.chainage_m[row] - forward) <= p_.consistency_k * sigma) {
          table.add_flag(row, Flag::storm_response);
          log.count("storm_response");
        }
      }
    }
  }
}

}  // namespace strandline
