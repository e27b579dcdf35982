#include "qc/storm_response_step.h"

#include <algorithm>
#include <cmath>

#include "corrections/core/param_reader.h"
#include "qc/robust_stats.h"
#include "qc/transect_series.h"

namespace strandline {

void StormResponseStep::Params::validate(const std::string& pointer) const {
  auto positive = [&](double v, const char* key) {
    if (!(v > 0)) throw ConfigError(pointer + "/" + key, "expected a positive number");
  };
  if (!(hs_threshold_m >= 0)) throw ConfigError(pointer + "/hs_threshold_m", "expected 0 (automatic) or a height in metres");
  if (!(hs_quantile > 0 && hs_quantile < 1)) throw ConfigError(pointer + "/hs_quantile", "expected a fraction in (0, 1)");
  if (!(hs_min_m >= 0)) throw ConfigError(pointer + "/hs_min_m", "expected a non-negative height");
  positive(scan_step_s, "scan_step_s");
  positive(max_gap_s, "max_gap_s");
  if (!(merge_gap_days >= 0)) throw ConfigError(pointer + "/merge_gap_days", "expected a non-negative number");
  positive(pre_window_days, "pre_window_days");
  positive(jump_min_m, "jump_min_m");
  positive(jump_noise_k, "jump_noise_k");
  if (persist_points < 1 || persist_points > 50) throw ConfigError(pointer + "/persist_points", "expected 1 to 50");
  positive(persist_days, "persist_days");
  positive(consistency_k, "consistency_k");
  positive(max_response_days, "max_response_days");
  if (min_pre_points < 1) throw ConfigError(pointer + "/min_pre_points", "expected at least 1");
}

std::unique_ptr<Step> StormResponseStep::make(const nlohmann::json& params, const std::string& pointer) {
  Params p;
  ParamReader r(params, pointer);
  r.number("hs_threshold_m", p.hs_threshold_m);
  r.number("hs_quantile", p.hs_quantile);
  r.number("hs_min_m", p.hs_min_m);
  r.number("scan_step_s", p.scan_step_s);
  r.number("max_gap_s", p.max_gap_s);
  r.number("merge_gap_days", p.merge_gap_days);
  r.number("pre_window_days", p.pre_window_days);
  long long min_pre = static_cast<long long>(p.min_pre_points);
  r.integer("min_pre_points", min_pre);
  if (min_pre < 1) r.fail("min_pre_points", "expected at least 1");
  p.min_pre_points = static_cast<std::size_t>(min_pre);
  r.number("jump_min_m", p.jump_min_m);
  r.number("jump_noise_k", p.jump_noise_k);
  r.integer("persist_points", p.persist_points);
  r.number("persist_days", p.persist_days);
  r.number("consistency_k", p.consistency_k);
  r.number("max_response_days", p.max_response_days);
  r.finish();
  p.validate(pointer);
  return std::make_unique<StormResponseStep>(p);
}

StormResponseStep::StormResponseStep(const Params& p)
    : SiteStep("storm_response", {{"hs_threshold_m", p.hs_threshold_m},
                                  {"hs_quantile", p.hs_quantile},
                                  {"hs_min_m", p.hs_min_m},
                                  {"scan_step_s", p.scan_step_s},
                                  {"max_gap_s", p.max_gap_s},
                                  {"merge_gap_days", p.merge_gap_days},
                                  {"pre_window_days", p.pre_window_days},
                                  {"min_pre_points", p.min_pre_points},
                                  {"jump_min_m", p.jump_min_m},
                                  {"jump_noise_k", p.jump_noise_k},
                                  {"persist_points", p.persist_points},
                                  {"persist_days", p.persist_days},
                                  {"consistency_k", p.consistency_k},
                                  {"max_response_days", p.max_response_days}}),
      p_(p) {}

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
      if (pre.size() < p_.min_pre_points) {
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
