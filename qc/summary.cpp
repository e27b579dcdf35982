#include "qc/summary.h"

#include "qc/cautions.h"

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

}  // namespace

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
  s.cautions = standard_cautions();
  return s;
}

}  // namespace strandline
