#include "server/io/summary_json.h"

#include "corrections/core/time_utc.h"
#include "server/io/json_numbers.h"

namespace strandline {

namespace {

using nlohmann::json;

json time_or_null(TimeS t) { return known(t) ? json(format_time_utc(t)) : json(nullptr); }
json pair(const Interval& i) { return json::array({i.low, i.high}); }
json pair_or_null(const std::optional<Interval>& i) { return i ? pair(*i) : json(nullptr); }

// The fit's own numbers are finite whenever it is valid, so they are written as
// they are; only the interval-dependent ones can be unknown.
json trend_json(const TrendSummary& t) {
  json j = {{"rate_m_per_yr", t.rate_m_per_yr},
            {"intercept_m", t.intercept_m},
            {"intercept_time", format_time_utc(t.intercept_time_s)},
            {"se_naive_m_per_yr", t.se_naive_m_per_yr},
            {"lag1_autocorrelation", t.lag1_autocorrelation},
            {"n_effective", t.n_effective},
            {"se_m_per_yr", number_or_null(t.se_m_per_yr)},
            {"dof", number_or_null(t.dof)},
            {"ci95_m_per_yr", pair_or_null(t.ci95_m_per_yr)},
            {"serial_correlation", std::string(kTrendSerialCorrelationMethod)}};
  if (const auto& term = t.slope_term) {
    j["rate_at_slope_ci95_m_per_yr"] = pair(term->rate_at_slope_ci95_m_per_yr);
    j["slope_term_m_per_yr"] = term->slope_term_m_per_yr;
    // Left out (not null) when the slope is known but the statistical interval is not.
    if (term->ci95_with_slope_m_per_yr) j["ci95_with_slope_m_per_yr"] = pair(*term->ci95_with_slope_m_per_yr);
  } else {
    j["rate_at_slope_ci95_m_per_yr"] = nullptr;
    j["slope_term_m_per_yr"] = nullptr;
    j["ci95_with_slope_m_per_yr"] = nullptr;
  }
  if (const auto& term = t.sensor_offset_term) {
    j["sensor_offset_term_m_per_yr"] = number_or_null(term->offset_term_m_per_yr);
    j["ci95_with_sensor_offsets_m_per_yr"] = pair_or_null(term->ci95_with_sensor_offsets_m_per_yr);
  } else {
    j["sensor_offset_term_m_per_yr"] = nullptr;
    j["ci95_with_sensor_offsets_m_per_yr"] = nullptr;
  }
  return j;
}

json offset_json(const SensorOffsetReport& r) {
  const FamilyOffset& f = r.estimate;
  return {{"family", f.family},
          {"reference_family", f.reference_family},
          {"offset_m", number_or_null(f.offset_m)},
          {"se_m", number_or_null(f.se_m)},
          {"dof", number_or_null(f.dof)},
          {"ci95_m", known(f.ci95_low_m) ? pair({f.ci95_low_m, f.ci95_high_m}) : json(nullptr)},
          {"significant", f.significant()},
          {"corrected", r.corrected},
          {"n_bins", f.n_bins},
          {"n_points", f.n_points},
          {"n_reference_points", f.n_reference_points}};
}

json offsets_json(const std::vector<SensorOffsetReport>& reports) {
  json out = json::array();
  for (const auto& r : reports) out.push_back(offset_json(r));
  return out;
}

json site_offsets_json(const SiteSummary& s) {
  if (!s.sensor_offsets) return nullptr;
  json applied = json::array();
  for (const auto& [sensor, v] : s.sensor_offsets->applied_m)
    applied.push_back({{"sensor", sensor},
                       {"offset_m", v},
                       {"sigma_m", number_or_null(s.sensor_offsets->applied_sigma_m.at(sensor))}});
  return {{"mode", std::string(sensor_offset_mode_name(s.sensor_offsets->mode))},
          {"reference_family", s.sensor_offsets->reference_family.empty()
                                   ? json(nullptr)
                                   : json(s.sensor_offsets->reference_family)},
          {"estimates", offsets_json(s.site_sensor_offsets)},
          {"applied", std::move(applied)}};
}

json noise_json(const std::vector<SensorNoise>& noise) {
  json out = json::array();
  for (const auto& n : noise)
    out.push_back({{"sensor", n.sensor},
                   {"class", n.class_name.empty() ? json(nullptr) : json(n.class_name)},
                   {"family", n.family.empty() ? json(nullptr) : json(n.family)},
                   {"stated_sigma_m", number_or_null(n.stated_sigma_m)},
                   {"measured_sigma_m", number_or_null(n.measured_sigma_m)},
                   {"n", n.n}});
  return out;
}

json seasonal_json(const SeasonalSummary& s) {
  return {{"amplitude_m", s.amplitude_m},
          {"amplitude_sigma_m", s.amplitude_sigma_m},
          {"phase_deg", s.phase_deg},
          {"most_seaward_day_of_year", s.most_seaward_day_of_year}};
}

const char* wave_correction_name(const std::optional<WaveCorrection>& w) {
  if (!w) return "none (no wave record)";
  switch (*w) {
    case WaveCorrection::none: return "none";
    case WaveCorrection::setup: return "setup";
    case WaveCorrection::runup: return "runup";
  }
  return "runup";
}

}  // namespace

json transect_summary_json(const TransectSummary& s) {
  json j = {
      {"transect_id", s.transect_id},
      {"slope", number_or_null(s.slope)},
      {"slope_sigma", number_or_null(s.slope_sigma)},
      {"slope_ci95", known(s.slope_ci95_low) ? pair({s.slope_ci95_low, s.slope_ci95_high}) : json(nullptr)},
      {"slope_source", std::string(slope_source_name(s.slope_source))},
      {"slope_identifiable", s.slope_identifiable},
      {"z_ref_m", number_or_null(s.z_ref_m)},
      {"n_observations", s.n_observations},
      {"n_corrected", s.n_corrected},
      {"n_accepted", s.n_accepted},
      {"counts_by_flag", s.counts_by_flag},
      {"first_accepted", time_or_null(s.first_accepted_s)},
      {"last_accepted", time_or_null(s.last_accepted_s)},
      {"mean_interval_days", number_or_null(s.mean_interval_days)},
      {"trend_window",
       {{"from", time_or_null(s.trend_window.from_s)},
        {"to", time_or_null(s.trend_window.to_s)},
        {"n_points", s.trend_window.n_points}}},
      {"trend", s.trend ? trend_json(*s.trend) : json(nullptr)},
      {"seasonal", s.seasonal ? seasonal_json(*s.seasonal) : json(nullptr)},
      {"sensor_offsets", offsets_json(s.sensor_offsets)},
      {"sensor_noise", noise_json(s.sensor_noise)},
      {"cautions", s.cautions},
  };
  if (!s.slope_details.is_null()) j["slope_details"] = s.slope_details;
  return j;
}

json site_level_summary_json(const SiteSummary& s) {
  return {{"sensor_offsets", site_offsets_json(s)}, {"sensor_noise", noise_json(s.sensor_noise)}};
}

json site_summary_json(const SiteSummary& s) {
  json transects = json::array();
  for (const auto& t : s.transects) transects.push_back(transect_summary_json(t));
  json j = {{"schema_version", s.schema_version},
            {"reference_elevation_m", s.reference_elevation_m},
            {"wave_correction", wave_correction_name(s.wave_correction)},
            {"transects", std::move(transects)}};
  j.update(site_level_summary_json(s));
  j["cautions"] = s.cautions;
  return j;
}

}  // namespace strandline
