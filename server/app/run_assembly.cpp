#include "server/app/run_assembly.h"

#include "corrections/core/errors.h"
#include "corrections/steps/slope_step.h"
#include "corrections/tide/harmonic_tide_source.h"
#include "corrections/water_level/blended_water_level_source.h"
#include "corrections/water_level/gauge_series.h"
#include "qc/summary.h"
#include "server/io/summary_json.h"

namespace strandline::app {

PreparedRun::PreparedRun(RunConfig config, RunMaterial material)
    : config_(std::move(config)), material_(std::move(material)) {
  const RunSettings& s = config_.settings;
  // The gauge states no sigma of its own: the water_level step applies its
  // configured sigma to gauge values (a fitted tide brings its residual).
  if (!material_.gauge_times_s.empty()) {
    gauge_ = std::make_unique<GaugeSeries>(std::move(material_.gauge_times_s), std::move(material_.gauge_levels_m),
                                           kUnknown);
    inputs_.water_levels = gauge_.get();
  }
  if (material_.tide) {
    tide_ = std::make_unique<tide::HarmonicTideSource>(*material_.tide, material_.tide_label);
    if (gauge_) {
      blended_ = std::make_unique<BlendedWaterLevelSource>(static_cast<const GaugeSeries&>(*gauge_), *tide_);
      inputs_.water_levels = blended_.get();
    } else {
      inputs_.water_levels = tide_.get();
    }
  }
  if (!inputs_.water_levels)
    throw InputError("no water levels: the run needs a water-level record and/or tide constituents");
  if (!material_.waves.empty()) {
    waves_ = std::make_unique<WaveRecord>(std::move(material_.waves));
    inputs_.waves = waves_.get();
  }
  inputs_.wave_correction = s.wave_correction;
  inputs_.reference_elevation_m = s.reference_elevation_m;
  inputs_.z_ref_by_transect = material_.z_ref_by_transect;
  inputs_.sensors = &material_.sensors;
  inputs_.sensor_offset_mode = s.sensor_offsets;
  if (s.sensor_offsets == SensorOffsetMode::given && !material_.sensors.has_offsets())
    throw InputError("sensor offsets \"given\", but the sensor table lists no offset_m");
  inputs_.slopes.per_transect = material_.listed_slopes;
  inputs_.slopes.all = s.fixed_slope;
  inputs_.slopes.default_value = s.default_slope;
  inputs_.slopes.estimate = s.estimate_slopes;
  inputs_.slopes.search_min = s.search_min;
  inputs_.slopes.search_max = s.search_max;
  if (s.fixed_slope && !material_.listed_slopes.empty())
    throw InputError(
        "both one slope for every transect and a list of per-transect slopes were given: give one or the other");
}

std::vector<std::string> PreparedRun::transects_without_slope(const SiteTable& table, std::size_t limit) const {
  std::vector<std::string> missing;
  const SlopePlan& plan = inputs_.slopes;
  if (plan.all || plan.default_value || plan.estimate) return missing;
  for (const auto& t : table.transects)
    if (!planned_slope(plan, t.id) && missing.size() < limit) missing.push_back(t.id);
  return missing;
}

RunRecord PreparedRun::run(SiteTable& table, const ProgressFn& progress) const {
  return config_.pipeline.run(table, inputs_, progress);
}

nlohmann::json PreparedRun::summary(const SiteTable& table) const {
  return site_summary_json(site_summary(table, inputs_, config_.settings.summary));
}

nlohmann::json PreparedRun::transect_summary(const SiteTable& table, std::size_t transect) const {
  return transect_summary_json(strandline::transect_summary(table, transect, inputs_, config_.settings.summary));
}

nlohmann::json PreparedRun::provenance(const RunRecord& record, const SiteTable& table, const RowCounts& rows,
                                       const std::string& started, const std::string& finished) const {
  std::size_t accepted = 0;
  for (std::size_t i = 0; i < table.size(); ++i) accepted += table.accepted(i) ? 1 : 0;
  return {{"version", STRANDLINE_VERSION},
          {"configuration", config_.effective},
          {"inputs", material_.inputs},
          {"water_levels", inputs_.water_levels->describe()},
          {"waves", inputs_.waves ? inputs_.waves->describe() : nlohmann::json()},
          {"steps", record.to_json()},
          {"site_summary", site_level_summary_json(site_level_summary(table, inputs_))},
          {"rows", {{"input", rows.input}, {"rejected", rows.rejected}, {"cleaned", table.size()}, {"accepted", accepted}}},
          {"started", started},
          {"finished", finished}};
}

CorrectionCounts correction_counts(const SiteTable& table) {
  CorrectionCounts c;
  c.rows = table.size();
  for (std::size_t i = 0; i < table.size(); ++i) {
    if (table.accepted(i)) ++c.accepted;
    if (known(table.correction_m[i])) ++c.corrected;
    else if (has_flag(table.flags[i], Flag::no_water_level)) ++c.no_water_level;
    else if (has_flag(table.flags[i], Flag::no_slope)) ++c.no_slope;
    else ++c.other;
    if (has_flag(table.flags[i], Flag::coarse_gauge)) ++c.coarse_gauge;
  }
  for (const TransectInfo& t : table.transects) {
    if (!t.slope_details.is_object() || !t.slope_details.contains("reasons")) continue;
    for (const auto& reason : t.slope_details["reasons"])
      if (reason == "minimum_at_range_edge") ++c.slope_minimum_at_range_edge;
  }
  return c;
}

}  // namespace strandline::app
