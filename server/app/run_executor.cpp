#include "server/app/run_executor.h"

#include <unordered_map>

#include "corrections/core/errors.h"
#include "corrections/tide/constituent_file.h"
#include "server/app/run_assembly.h"

namespace strandline::app {

std::set<std::string> transects_in_scope(store::Store& store, const store::RunInfo& run) {
  std::set<std::string> all;
  for (const auto& t : store.transects(run.site_id)) all.insert(t.id);
  if (run.scope == "all") return all;
  const auto baseline = store.latest_done_run(run.site_id);
  const auto changed = store.changed_transects(run.site_id, baseline ? baseline->input_seq : 0);
  if (!changed) return all;
  std::set<std::string> out;
  for (const auto& t : *changed)
    if (all.count(t)) out.insert(t);
  return out;
}

RunConfig run_config_for(const store::Site& site, const nlohmann::json& options) {
  const bool empty = options.is_null() || (options.is_object() && options.empty());
  RunDefaults defaults;
  defaults.reference_elevation_m = site.reference_elevation_m;
  if (known(site.default_slope)) defaults.default_slope = SlopeValue{site.default_slope, kUnknown};
  // Stored slopes are kept; every other transect gets the spectral estimate,
  // and where it is not identifiable the site's default (flagged) or none.
  defaults.estimate_slopes = true;
  return read_run_config(empty ? site.processing_defaults : options, defaults);
}

namespace {

RunMaterial stored_material(store::Store& store, const std::string& site_id) {
  RunMaterial m;
  m.inputs = nlohmann::json::array();
  for (const auto& s : store.live_slopes(site_id)) m.listed_slopes[s.transect_id] = {s.slope, s.slope_sigma};
  for (const auto& l : store.live_water_levels(site_id)) {
    m.gauge_times_s.push_back(l.time_s);
    m.gauge_levels_m.push_back(l.level_m);
  }
  if (auto doc = store.live_document(site_id, "tide_constituents")) {
    m.tide = tide::parse_constituent_json(nlohmann::json::parse(*doc), "stored tide constituents");
    m.tide_label = "stored tide constituents";
  }
  for (const auto& w : store.live_waves(site_id)) m.waves.push_back({w.time_s, w.hs_m, w.tp_s, w.dir_deg, w.depth_m});
  m.inputs.push_back({{"role", "slopes"}, {"stored", m.listed_slopes.size()}});
  m.inputs.push_back({{"role", "water_levels"}, {"stored", m.gauge_times_s.size()}});
  m.inputs.push_back({{"role", "waves"}, {"stored", m.waves.size()}});
  return m;
}

SiteTable stored_points(store::Store& store, const std::string& site_id, const std::set<std::string>& transects,
                        std::size_t& rows_read) {
  SiteTableBuilder builder;
  rows_read = 0;
  for (const auto& row : store.live_observations(site_id, transects)) {
    const auto t = builder.transect_index(row.transect_id);
    const auto img = builder.image_index(row.image_id);
    const auto s = builder.sensor_index(row.sensor);
    builder.add(t, img, s,
                {static_cast<std::uint32_t>(rows_read), row.time_s, row.chainage_m, row.cloud_fraction,
                 row.georef_rmse_m});
    ++rows_read;
  }
  SiteTable table = std::move(builder).build();
  std::unordered_map<std::string, const TransectGeometry*> geometry;
  const auto stored = store.transects(site_id);
  for (const auto& g : stored) geometry[g.id] = &g.geometry;
  for (auto& t : table.transects)
    if (auto it = geometry.find(t.id); it != geometry.end()) t.geometry = *it->second;
  return table;
}

}  // namespace

RunOutput execute_run(store::Store& store, const store::RunInfo& run, const std::set<std::string>& transects,
                      const ProgressFn& progress) {
  const std::string started = store::now_utc_text();
  const auto site = store.site(run.site_id);
  if (!site) throw InputError("site \"" + run.site_id + "\" no longer exists");
  RunConfig config = run_config_for(*site, run.options);

  RunOutput output;
  if (transects.empty()) {
    output.provenance = {{"version", STRANDLINE_VERSION}, {"transects", nlohmann::json::array()},
                         {"note", "no transect had new inputs since the last finished run"}};
    return output;
  }
  std::size_t rows_read = 0;
  SiteTable table = stored_points(store, run.site_id, transects, rows_read);
  const PreparedRun prepared(std::move(config), stored_material(store, run.site_id));
  const RunRecord record = prepared.run(table, progress);

  nlohmann::json transect_ids = nlohmann::json::array();
  for (std::size_t k = 0; k < table.transects.size(); ++k) {
    const TransectInfo& t = table.transects[k];
    store::TransectResult r;
    r.run_id = run.id;
    r.transect_id = t.id;
    r.rows.reserve(t.size());
    for (std::size_t i = t.begin; i < t.end; ++i) r.rows.push_back(cleaned_row(table, i));
    r.summary = prepared.transect_summary(table, k);
    output.results.push_back(std::move(r));
    transect_ids.push_back(t.id);
  }
  output.provenance = prepared.provenance(record, table, {rows_read, 0}, started, store::now_utc_text());
  output.provenance["scope"] = run.scope;
  output.provenance["input_seq"] = run.input_seq;
  output.provenance["transects"] = transect_ids;
  return output;
}

}  // namespace strandline::app
