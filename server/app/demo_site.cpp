#include "server/app/demo_site.h"

#include <algorithm>
#include <sstream>

#include "server/app/uploads.h"
#include "corrections/tide/constituent_file.h"
#include "demo_data/synthetic/demo_tide.h"
#include "server/store/api_keys.h"

namespace strandline::app {

std::int64_t load_demo_site(store::Store& store, RunManager& runs) {
  const synthetic::Site demo = synthetic::generate_site(synthetic::demo_site_params());

  store::Site site;
  site.id = kDemoSiteId;
  site.name = demo.params.site_name + " (invented demo site)";
  site.crs = "EPSG:32631";
  site.reference_elevation_m = demo.params.z_ref_m;
  store.create_site(site);

  std::vector<store::Transect> transects;
  for (const auto& t : demo.transects) {
    TransectGeometry g{t.origin_x_m, t.origin_y_m, t.azimuth_deg, t.length_m};
    transects.push_back({t.id, g, {{"type", "Feature"}, {"id", t.id}, {"properties", {{"transect_id", t.id}}}}});
  }
  store.replace_transects(site.id, transects);

  auto meta = [](const std::string& what, std::size_t n) {
    store::UploadMeta m;
    m.content_type = "application/json";
    m.sha256 = store::sha256_hex("demo " + what);
    m.uploaded_by = "demo";
    m.received = static_cast<std::int64_t>(n);
    return m;
  };
  std::vector<store::ObservationRow> points;
  std::int64_t line = 1;
  for (const auto& p : demo.points) {
    const auto& img = demo.images[p.image];
    points.push_back({++line, demo.transects[p.transect].id, img.id, img.sensor, p.time_s, p.chainage_raw_m,
                      p.cloud_fraction, p.georef_rmse_m});
  }
  store.add_observations(site.id, meta("observations", points.size()), points);

  std::vector<store::WaterLevelRow> levels;
  for (std::size_t i = 0; i < demo.gauge_times_s.size(); ++i)
    levels.push_back({static_cast<std::int64_t>(i + 2), demo.gauge_times_s[i], demo.gauge_levels_m[i]});
  store.add_water_levels(site.id, meta("water levels", levels.size()), levels);

  // The site's harmonic constants: the prediction covers the images before the gauge record.
  const std::string tide_document = tide::constituent_json(synthetic::demo_tide_constituents()).dump(2);
  store::UploadMeta tide_meta = meta("tide constituents", 1);
  tide_meta.sha256 = store::sha256_hex(tide_document);
  store.add_document(site.id, "tide_constituents", tide_meta, tide_document);

  std::vector<store::WaveRow> waves;
  for (std::size_t i = 0; i < demo.waves.size(); ++i)
    waves.push_back({static_cast<std::int64_t>(i + 2), demo.waves[i].time_s, demo.waves[i].hs_m, demo.waves[i].tp_s,
                     demo.waves[i].dir_deg, kUnknown});
  if (!waves.empty()) store.add_waves(site.id, meta("waves", waves.size()), waves);

  // A beach-profile survey of the first quarter of the transects (the generator's
  // truths with a survey-like 1-sigma); the other slopes are estimated by the
  // run. The survey sheet also lists a profile the site does not define, which
  // the upload refuses and keeps, with its reason, for the uploads view.
  std::ostringstream survey;
  survey << "transect_id,slope,slope_sigma\n";
  const std::size_t surveyed = std::max<std::size_t>(1, demo.transects.size() / 4);
  for (std::size_t i = 0; i < surveyed && i < demo.transects.size(); ++i)
    survey << demo.transects[i].id << "," << demo.transects[i].slope << ",0.005\n";
  survey << "X900,0.09,0.005\n";
  const std::string survey_csv = survey.str();
  UploadRequest slopes{survey_csv, BodyFormat::csv, OnInvalid::skip, meta("slopes", 0)};
  slopes.meta.content_type = "text/csv";
  slopes.meta.sha256 = store::sha256_hex(survey_csv);
  upload_slopes(store, site.id, std::move(slopes));

  store::RunInfo run;
  run.site_id = site.id;
  run.scope = "all";
  run.input_seq = store.input_seq(site.id);
  run.requested_by = "demo";
  run.id = store.create_run(run);
  runs.enqueue(run.id);
  runs.wait_idle();
  return run.id;
}

}  // namespace strandline::app
