#include "qc/summary.h"

#include <map>

#include "qc/cautions.h"
#include "qc/trend_summary.h"

namespace strandline {

namespace {
nlohmann::json number_or_null(double v) { return known(v) ? nlohmann::json(v) : nlohmann::json(nullptr); }
}  // namespace

nlohmann::json transect_summary(const SiteTable& table, std::size_t transect, const RunInputs& inputs,
                                const SummaryOptions& options) {
  const TransectInfo& t = table.transects[transect];
  std::size_t accepted = 0, corrected = 0;
  std::map<std::string, std::size_t> by_flag;
  TimeS first = kUnknown, last = kUnknown;
  for (std::size_t i = t.begin; i < t.end; ++i) {
    if (known(table.chainage_m[i])) ++corrected;
    for (auto name : flag_names(table.flags[i])) ++by_flag[std::string(name)];
    if (!table.accepted(i)) continue;
    ++accepted;
    if (!known(first)) first = table.time_s[i];
    last = table.time_s[i];
  }
  nlohmann::json j = {
      {"transect_id", t.id},
      {"slope", number_or_null(t.slope)},
      {"slope_sigma", number_or_null(t.slope_sigma)},
      {"slope_ci95", known(t.slope_ci95_low) ? nlohmann::json::array({t.slope_ci95_low, t.slope_ci95_high})
                                             : nlohmann::json(nullptr)},
      {"slope_source", std::string(slope_source_name(t.slope_source))},
      {"slope_identifiable", t.slope_identifiable},
      {"z_ref_m", number_or_null(t.z_ref_m)},
      {"n_observations", t.size()},
      {"n_corrected", corrected},
      {"n_accepted", accepted},
      {"counts_by_flag", by_flag},
      {"first_accepted", known(first) ? nlohmann::json(format_time_utc(first)) : nlohmann::json(nullptr)},
      {"last_accepted", known(last) ? nlohmann::json(format_time_utc(last)) : nlohmann::json(nullptr)},
      {"mean_interval_days",
       accepted > 1 ? nlohmann::json((last - first) / kSecondsPerDay / double(accepted - 1)) : nlohmann::json(nullptr)},
  };
  std::vector<std::string> cautions;
  if (t.slope_source == SlopeSource::default_value) cautions.push_back("default slope: positions depend on an assumed slope");
  if (!t.slope_identifiable) cautions.push_back("slope not identifiable from the data");
  if (t.size() > 0 && accepted < 0.8 * double(corrected))
    cautions.push_back("more than 20% of the corrected points were rejected");
  add_trend_summary(table, transect, inputs, options.trend_from_s, options.trend_to_s, j, cautions);
  j["cautions"] = cautions;
  if (!t.slope_details.is_null()) j["slope_details"] = t.slope_details;
  return j;
}

nlohmann::json transect_summary(const SiteTable& table, std::size_t transect, const SummaryOptions& options) {
  return transect_summary(table, transect, RunInputs{}, options);
}

nlohmann::json site_summary(const SiteTable& table, const RunInputs& inputs, const SummaryOptions& options) {
  nlohmann::json transects = nlohmann::json::array();
  for (std::size_t t = 0; t < table.transects.size(); ++t) transects.push_back(transect_summary(table, t, inputs, options));
  const char* wave_correction = inputs.waves == nullptr ? "none (no wave record)"
                                : inputs.wave_correction == WaveCorrection::none  ? "none"
                                : inputs.wave_correction == WaveCorrection::setup ? "setup"
                                                                                  : "runup";
  return {{"schema_version", kSummarySchemaVersion},
          {"reference_elevation_m", inputs.reference_elevation_m},
          {"wave_correction", wave_correction},
          {"transects", transects},
          {"cautions", standard_cautions()}};
}

}  // namespace strandline
