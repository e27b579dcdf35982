#include "server/http/run_executor.h"

#include <chrono>
#include <memory>

#include "corrections/core/errors.h"
#include "corrections/core/sensor_table.h"
#include "corrections/steps/water_level_step.h"
#include "corrections/tide/constituent_file.h"
#include "corrections/tide/harmonic_tide_source.h"
#include "corrections/water_level/blended_water_level_source.h"
#include "corrections/water_level/gauge_series.h"
#include "corrections/waves/wave_record.h"
#include "qc/summary.h"
#include "server/http/gzip_document.h"
#include "server/io/cleaned_rows.h"
#include "server/store/api_keys.h"

namespace strandline::http {

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

Pipeline pipeline_for(const store::Site& site, const nlohmann::json& options) {
  const bool empty = options.is_null() || (options.is_object() && options.empty());
  return Pipeline::from_config(empty ? site.processing_defaults : options);
}

namespace {

std::string rows_csv(const SiteTable& table, const TransectInfo& t) {
  const auto& columns = cleaned_columns();
  std::string out;
  for (std::size_t c = 0; c < columns.size(); ++c) out += (c ? "," : "") + columns[c].name;
  out += "\n";
  std::vector<CellValue> values;
  for (std::size_t i = t.begin; i < t.end; ++i) {
    cleaned_values(table, i, values);
    for (std::size_t c = 0; c < columns.size(); ++c) {
      if (c) out += ',';
      out += csv_escape(format_cell(values[c], columns[c]));
    }
    out += "\n";
  }
  return out;
}

}  // namespace

RunOutput execute_run(store::Store& store, const store::RunInfo& run, const std::set<std::string>& transects,
                      const ProgressFn& progress) {
  const auto started = std::chrono::steady_clock::now();
  const auto site = store.site(run.site_id);
  if (!site) throw InputError("site \"" + run.site_id + "\" no longer exists");
  const Pipeline pipeline = pipeline_for(*site, run.options);

  RunOutput output;
  if (transects.empty()) {
    output.provenance = {{"version", STRANDLINE_VERSION}, {"transects", nlohmann::json::array()},
                         {"note", "no transect had new inputs since the last finished run"}};
    return output;
  }

  // ---- points
  SiteTableBuilder builder;
  for (const auto& row : store.live_observations(run.site_id, transects)) {
    const auto t = builder.transect_index(row.transect_id);
    const auto img = builder.image_index(row.image_id);
    const auto s = builder.sensor_index(row.sensor);
    builder.add(t, img, s,
                {static_cast<std::uint32_t>(row.line), row.time_s, row.chainage_m, row.cloud_fraction,
                 row.georef_rmse_m});
  }
  SiteTable table = std::move(builder).build();
  const auto geometry = store.transects(run.site_id);
  for (auto& t : table.transects)
    for (const auto& g : geometry)
      if (g.id == t.id) t.geometry = g.geometry;

  // ---- inputs
  RunInputs inputs;
  inputs.reference_elevation_m = site->reference_elevation_m;
  const SensorTable sensors = SensorTable::defaults();
  inputs.sensors = &sensors;
  for (const auto& s : store.live_slopes(run.site_id)) inputs.slopes.per_transect[s.transect_id] = {s.slope, s.slope_sigma};
  if (known(site->default_slope)) inputs.slopes.default_value = SlopeValue{site->default_slope, kUnknown};
  // As `--slope auto` with `--slopes` in the batch: stored slopes are kept, every other transect
  // gets the spectral estimate; where it is not identifiable, the site's default (flagged) or none.
  inputs.slopes.estimate = true;

  const auto* wl_step = dynamic_cast<const WaterLevelStep*>(pipeline.find("water_level"));
  const double gauge_sigma_m = wl_step ? wl_step->params().sigma_m : WaterLevelStep::Params{}.sigma_m;
  std::unique_ptr<GaugeSeries> gauge;
  std::unique_ptr<WaterLevelSource> tide_source, blended;
  if (auto levels = store.live_water_levels(run.site_id); !levels.empty()) {
    std::vector<TimeS> times;
    std::vector<double> values;
    for (const auto& l : levels) {
      times.push_back(l.time_s);
      values.push_back(l.level_m);
    }
    gauge = std::make_unique<GaugeSeries>(std::move(times), std::move(values), gauge_sigma_m);
    inputs.water_levels = gauge.get();
  }
  if (auto doc = store.live_document(run.site_id, "tide_constituents")) {
    const auto set = tide::parse_constituent_json(nlohmann::json::parse(*doc), "stored tide constituents");
    tide_source = std::make_unique<tide::HarmonicTideSource>(set, "stored tide constituents");
    if (gauge) {
      blended = std::make_unique<BlendedWaterLevelSource>(*gauge, *tide_source);
      inputs.water_levels = blended.get();
    } else {
      inputs.water_levels = tide_source.get();
    }
  }
  std::unique_ptr<WaveRecord> waves;
  if (auto rows = store.live_waves(run.site_id); !rows.empty()) {
    std::vector<WaveSample> samples;
    for (const auto& w : rows) samples.push_back({w.time_s, w.hs_m, w.tp_s, w.dir_deg, w.depth_m});
    waves = std::make_unique<WaveRecord>(std::move(samples));
    inputs.waves = waves.get();
  }

  // ---- the run
  const RunRecord record = pipeline.run(table, inputs, progress);

  nlohmann::json transect_ids = nlohmann::json::array();
  for (const auto& t : table.transects) {
    store::TransectResult r;
    r.run_id = run.id;
    r.transect_id = t.id;
    nlohmann::json rows = nlohmann::json::array();
    for (std::size_t i = t.begin; i < t.end; ++i) rows.push_back(cleaned_row_json(table, i));
    const std::string rows_text = rows.dump();
    r.sha256 = store::sha256_hex(rows_text);
    // Stored as the reply document, so a series read sends it without rebuilding it.
    r.rows_json = "{\"site\":" + nlohmann::json(run.site_id).dump() + ",\"transect_id\":" + nlohmann::json(t.id).dump() +
                  ",\"run_id\":" + std::to_string(run.id) + ",\"rows\":" + rows_text + "}";
    r.rows_csv = rows_csv(table, t);
    r.rows_json_gzip = gzip_compress(r.rows_json);
    r.rows_csv_gzip = gzip_compress(r.rows_csv);
    r.summary = transect_summary(table, static_cast<std::size_t>(&t - table.transects.data()), SummaryOptions{});
    output.results.push_back(std::move(r));
    transect_ids.push_back(t.id);
  }
  output.provenance = {
      {"version", STRANDLINE_VERSION},
      {"config", pipeline.config()},
      {"steps", record.to_json()},
      {"scope", run.scope},
      {"input_seq", run.input_seq},
      {"transects", transect_ids},
      {"points", table.size()},
      {"inputs",
       {{"water_levels", inputs.water_levels ? inputs.water_levels->describe() : nlohmann::json()},
        {"waves", inputs.waves ? inputs.waves->describe() : nlohmann::json()},
        {"reference_elevation_m", inputs.reference_elevation_m},
        {"slopes_stored", inputs.slopes.per_transect.size()}}},
      {"seconds", std::chrono::duration<double>(std::chrono::steady_clock::now() - started).count()},
  };
  return output;
}

}  // namespace strandline::http
