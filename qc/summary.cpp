#include "qc/summary.h"

#include <algorithm>
#include <cmath>
#include <cstdio>

#include "qc/cautions.h"
#include "qc/robust_stats.h"
#include "qc/sensor_offset_estimate.h"

namespace strandline {

namespace {

// What the slope step's record says the user should know about the slope.
std::vector<std::string> slope_cautions(const TransectInfo& t) {
  std::vector<std::string> out;
  const nlohmann::json& d = t.slope_details;
  if (!d.is_object()) return out;
  auto has_reason = [&](const char* reason) {
    if (!d.contains("reasons") || !d["reasons"].is_array()) return false;
    for (const auto& r : d["reasons"])
      if (r == reason) return true;
    return false;
  };
  if (has_reason("minimum_at_range_edge") && d.contains("search_range")) {
    out.push_back("the slope's energy minimum lies at an end of the search range [" +
                  d["search_range"][0].dump() + ", " + d["search_range"][1].dump() +
                  "]: widen the search range (the run configuration's slope.search_range) rather than rely on the default");
  }
  if (t.slope_source == SlopeSource::estimated && d.value("ci_touches_search_range", false))
    out.push_back("the slope's 95% interval is cut by the search range: the slope may lie outside it");
  if (t.slope_source == SlopeSource::estimated && d.value("ci_wider_than_value", false))
    out.push_back("the slope's 95% interval is wider than the slope itself: positions depend strongly on it");
  return out;
}

// Families whose positions the run shifted.
bool family_corrected(const SiteTable& table, const std::vector<std::string>& families, const std::string& family) {
  for (const auto& [sensor, v] : table.sensor_offsets.applied_m)
    for (std::size_t s = 0; s < table.sensor_names.size(); ++s)
      if (table.sensor_names[s] == sensor && families[s] == family) return true;
  return false;
}

std::string offset_caution(const FamilyOffset& f, const char* where) {
  char text[256];
  std::snprintf(text, sizeof text,
                "sensor family %s differs from %s by %+.1f m (95%% CI %+.1f to %+.1f m) %s and was not corrected: "
                "the trend may be biased",
                f.family.c_str(), f.reference_family.c_str(), f.offset_m, f.ci95_low_m, f.ci95_high_m, where);
  return text;
}

void add_offset_parts(const SiteTable& table, std::size_t transect, const RunInputs& inputs, TransectSummary& s) {
  if (!table.sensor_offsets.ran) return;
  const auto families = sensor_families(table, inputs);
  const TransectInfo& t = table.transects[transect];
  for (const FamilyOffset& f : t.sensor_offsets) {
    const bool corrected = family_corrected(table, families, f.family);
    s.sensor_offsets.push_back({f, corrected});
    if (f.significant() && !corrected) s.cautions.push_back(offset_caution(f, "on this transect"));
  }
  // A site offset not corrected concerns every transect holding that family.
  for (const FamilyOffset& f : table.sensor_offsets.estimates) {
    if (!f.significant() || family_corrected(table, families, f.family)) continue;
    bool present = false, own_caution = false;
    for (std::size_t i = t.begin; i < t.end && !present; ++i) present = families[table.sensor[i]] == f.family;
    for (const FamilyOffset& own : t.sensor_offsets) own_caution |= own.family == f.family && own.significant();
    if (present && !own_caution) s.cautions.push_back(offset_caution(f, "across the site"));
  }
}

// The report over transects [first, last): differences of consecutive accepted
// points of one sensor on one transect, pooled; sensors without a point left out.
std::vector<SensorNoise> noise_over(const SiteTable& table, std::size_t first, std::size_t last_transect,
                                    const RunInputs& inputs) {
  std::vector<std::vector<double>> by_sensor(table.sensor_names.size());
  std::vector<char> present(table.sensor_names.size(), 0);
  for (std::size_t k = first; k < last_transect; ++k) {
    const TransectInfo& t = table.transects[k];
    for (std::size_t i = t.begin; i < t.end; ++i) present[table.sensor[i]] = 1;
    std::vector<double> last(table.sensor_names.size(), kUnknown);
    for (std::size_t i = t.begin; i < t.end; ++i) {
      if (!table.accepted(i) || !known(table.chainage_m[i])) continue;
      double& previous = last[table.sensor[i]];
      if (known(previous)) by_sensor[table.sensor[i]].push_back(table.chainage_m[i] - previous);
      previous = table.chainage_m[i];
    }
  }
  std::vector<SensorNoise> out;
  for (std::size_t s = 0; s < table.sensor_names.size(); ++s) {
    if (!present[s]) continue;
    SensorNoise n;
    n.sensor = table.sensor_names[s];
    if (inputs.sensors)
      if (auto c = inputs.sensors->lookup(n.sensor)) {
        n.class_name = c->name;
        n.family = c->family;
        n.stated_sigma_m = c->sigma_m;
      }
    n.n = by_sensor[s].size();
    if (n.n >= 2) {
      std::vector<double> v = by_sensor[s];
      const double centre = median_in_place(v);
      n.measured_sigma_m = kMadToSigma * mad_about(by_sensor[s], centre) / std::sqrt(2.0);
    }
    out.push_back(std::move(n));
  }
  std::sort(out.begin(), out.end(), [](const SensorNoise& a, const SensorNoise& b) { return a.sensor < b.sensor; });
  return out;
}

}  // namespace

std::vector<SensorNoise> sensor_noise_report(const SiteTable& table, const RunInputs& inputs) {
  return noise_over(table, 0, table.transects.size(), inputs);
}

std::vector<SensorNoise> sensor_noise_report(const SiteTable& table, std::size_t transect, const RunInputs& inputs) {
  return noise_over(table, transect, transect + 1, inputs);
}

TransectSummary transect_summary(const SiteTable& table, std::size_t transect, const RunInputs& inputs,
                                 const SummaryOptions& options) {
  const TransectInfo& t = table.transects[transect];
  TransectSummary s;
  s.transect_id = t.id;
  s.slope = t.slope;
  s.slope_sigma = t.slope_sigma;
  s.slope_ci95_low = t.slope_ci95_low;
  s.slope_ci95_high = t.slope_ci95_high;
  s.slope_source = t.slope_source;
  s.slope_identifiable = t.slope_identifiable;
  s.z_ref_m = t.z_ref_m;
  s.n_observations = t.size();
  for (std::size_t i = t.begin; i < t.end; ++i) {
    if (known(table.chainage_m[i])) ++s.n_corrected;
    for (auto name : flag_names(table.flags[i])) ++s.counts_by_flag[std::string(name)];
    if (!table.accepted(i)) continue;
    ++s.n_accepted;
    if (!known(s.first_accepted_s)) s.first_accepted_s = table.time_s[i];
    s.last_accepted_s = table.time_s[i];
  }
  if (s.n_accepted > 1)
    s.mean_interval_days = (s.last_accepted_s - s.first_accepted_s) / kSecondsPerDay / double(s.n_accepted - 1);

  if (t.slope_source == SlopeSource::default_value)
    s.cautions.push_back("default slope: positions depend on an assumed slope");
  if (!t.slope_identifiable) s.cautions.push_back("slope not identifiable from the data");
  for (std::string& caution : slope_cautions(t)) s.cautions.push_back(std::move(caution));
  if (s.counts_by_flag.contains(std::string(flag_info(Flag::coarse_gauge).name)))
    s.cautions.push_back(
        "water levels interpolated from a gauge sampled more coarsely than ~1 h: the tide between samples is "
        "reconstructed (see the provenance's harmonic_guide) and its sigma widened; a finer record is better");
  if (t.size() > 0 && s.n_accepted < 0.8 * double(s.n_corrected))
    s.cautions.push_back("more than 20% of the corrected points were rejected");
  TrendPart trend = summarise_trend(table, transect, inputs, options.trend_from_s, options.trend_to_s, s.cautions);
  s.trend_window = trend.window;
  s.trend = std::move(trend.trend);
  s.seasonal = std::move(trend.seasonal);
  add_offset_parts(table, transect, inputs, s);
  s.sensor_noise = sensor_noise_report(table, transect, inputs);
  s.slope_details = t.slope_details;
  return s;
}

TransectSummary transect_summary(const SiteTable& table, std::size_t transect, const SummaryOptions& options) {
  return transect_summary(table, transect, RunInputs{}, options);
}

SiteSummary site_summary(const SiteTable& table, const RunInputs& inputs, const SummaryOptions& options) {
  SiteSummary s;
  s.reference_elevation_m = inputs.reference_elevation_m;
  if (inputs.waves != nullptr) s.wave_correction = inputs.wave_correction;
  s.transects.reserve(table.transects.size());
  for (std::size_t t = 0; t < table.transects.size(); ++t) s.transects.push_back(transect_summary(table, t, inputs, options));
  add_site_level_parts(table, inputs, s);
  return s;
}

SiteSummary site_level_summary(const SiteTable& table, const RunInputs& inputs) {
  SiteSummary s;
  s.reference_elevation_m = inputs.reference_elevation_m;
  if (inputs.waves != nullptr) s.wave_correction = inputs.wave_correction;
  add_site_level_parts(table, inputs, s);
  return s;
}

void add_site_level_parts(const SiteTable& table, const RunInputs& inputs, SiteSummary& s) {
  if (table.sensor_offsets.ran) {
    s.sensor_offsets = table.sensor_offsets;
    const auto families = sensor_families(table, inputs);
    for (const FamilyOffset& f : table.sensor_offsets.estimates)
      s.site_sensor_offsets.push_back({f, family_corrected(table, families, f.family)});
  }
  s.sensor_noise = sensor_noise_report(table, inputs);
  s.cautions = standard_cautions();
}

}  // namespace strandline
