// An invented coastal site with known truths, for the demo and for tests.
//
// Physics of the generated data (positions in metres along each transect,
// positive seaward):
//   true_chainage(t)  = base + trend*(t - t0) + seasonal + storm response
//                       (position of the z_ref contour: what the engine must recover)
//   waterline(t)      = true_chainage(t) - (eta(t) - z_ref) / tan(beta)
//   eta(t)            = tide(t) + surge(t) [+ wave setup when waves_in_data]
//   chainage_raw      = waterline(t) + sensor noise + planted outliers
// Every image has one time for all transects (fixed time of day per sensor),
// some images are lost to cloud, some carry planted gross errors. Everything is
// drawn from one seeded generator: the same parameters give the same site.
#pragma once

#include <cstdint>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "corrections/core/time_utc.h"

namespace strandline::synthetic {

struct SensorPlan {
  std::string name;          // a name of the default sensor table, e.g. "landsat8"
  double first_year = 2000;  // decimal years (UTC)
  double last_year = 2025;
  double revisit_days = 16;
  double hour_utc = 10.5;        // fixed overpass time of day
  double noise_sigma_m = 8.0;    // 1-sigma of the mapped waterline
  double offset_days = 0;        // phase of the revisit cycle
};

struct ToneConstituent {
  std::string name;  // for the record only
  double speed_deg_per_h;
  double amplitude_m;
  double phase_deg;  // phase at the epoch 2000-01-01T00:00Z
};

enum class OutlierKind : std::uint8_t { none, spike, cloud_run, misregistration };
std::string_view outlier_kind_name(OutlierKind k);

// The default tide: standard speeds, a mixed, mainly semidiurnal tide of ~2 m spring range.
const std::vector<ToneConstituent>& default_tide();

struct TransectTruth {
  std::string id;
  double slope = 0.08;           // true tan(beta)
  double base_chainage_m = 150;  // z_ref contour at t0
  double trend_m_per_yr = 0;
  double seasonal_amplitude_m = 0;
  double seasonal_phase_deg = 0;  // of cos(2 pi (t - Jan 1)/yr - phase)
  double tide_scale = 1.0;        // local multiplier of the tide (e.g. near-zero: micro-tidal)
  // Geometry in the projected demo CRS
  double origin_x_m = 0, origin_y_m = 0, azimuth_deg = 0, length_m = 500;
};

struct StormEvent {
  TimeS peak_s;
  double hs_peak_m;           // offshore significant wave height at the peak
  double erosion_m;           // landward retreat at the storm's end
  double duration_days = 2;   // high-wave period
  double recovery_days = 90;  // e-folding time of the recovery
};

struct SiteParams {
  std::uint64_t seed = 20261202;
  std::string site_name = "Gullwing Bay";  // invented
  int n_transects = 20;
  double spacing_m = 100;
  // Total azimuth span of the transects along the coast: empty = the default bay
  // (3 km radius, or an arc under 0.7 rad), 0 = a straight coast (parallel transects).
  std::optional<double> azimuth_span_deg;
  double first_year = 1999, last_year = 2025;
  double z_ref_m = 0.0;
  std::vector<SensorPlan> sensors;  // empty = a default mix (see defaults())
  std::vector<ToneConstituent> tide;  // empty = default_tide()
  // Replaces the tone sum when set (e.g. the harmonic predictor with nodal corrections).
  std::function<double(TimeS)> tide_function;
  double surge_sigma_m = 0.05;    // AR(1) residual in the water level
  double surge_corr_days = 2.0;
  double slope_min = 0.03, slope_max = 0.12;  // true slopes spread over this range
  std::vector<double> slopes;                 // explicit per-transect slopes (overrides the range)
  double trend_sigma_m_per_yr = 0.8;
  double seasonal_amplitude_m = 8;
  double cloud_loss_fraction = 0.35;  // images lost entirely
  double spike_fraction = 0.02;       // points with a gross single error
  double spike_min_m = 45, spike_max_m = 120;
  double cloud_run_fraction = 0.01;   // images whose cloud shadow corrupts a run of transects
  double misregistered_fraction = 0.01;  // images shifted as a whole
  double misregistration_m = 60;
  bool waves = true;            // generate a wave record (with storms)
  bool waves_in_data = true;    // Stockdon setup contained in the waterline
  bool storms = true;
  int unidentifiable_transects = 1;  // last transects made micro-tidal (tide_scale ~0.05)
  double gauge_first_year = 2006;    // gauge record span (prediction before it)
  double gauge_last_year = 2025;
  double gauge_step_s = 1800;
  static SiteParams defaults();
};

struct Point {
  std::size_t transect;
  std::size_t image;
  TimeS time_s;
  double chainage_raw_m;
  double true_chainage_m;  // z_ref contour at the image time
  double water_level_m;    // tide + surge at image time (what a gauge would read)
  double setup_m;          // wave setup at image time (0 without waves)
  double cloud_fraction;
  double georef_rmse_m;
  OutlierKind outlier = OutlierKind::none;
  double outlier_offset_m = 0;
  bool storm_response = false;  // within a storm's erosion/recovery window
};

struct Image {
  std::string id;
  std::string sensor;
  TimeS time_s;
  double shift_x_m = 0, shift_y_m = 0;  // misregistration of the whole image
};

struct WaveSample {
  TimeS time_s;
  double hs_m, tp_s, dir_deg;
};

struct Site {
  SiteParams params;
  std::vector<TransectTruth> transects;
  std::vector<Image> images;
  std::vector<Point> points;  // by image, then transect
  std::vector<TimeS> gauge_times_s;
  std::vector<double> gauge_levels_m;
  std::vector<WaveSample> waves;
  std::vector<StormEvent> storms;
  double tide_at(TimeS t) const;  // the tide used (without surge)
};

Site generate_site(const SiteParams& params);

// Decimal year <-> seconds since 1970 (UTC, Julian years from 2000-01-01).
TimeS time_from_year(double year);
double year_from_time(TimeS t);

// Writes the site as files in `dir`: observations.csv, water_levels.csv,
// waves.csv, transects.geojson, truth_points.csv, truth_transects.csv,
// transect_params.csv (true slopes). The observation rows are in image order.
void write_site(const Site& site, const std::string& dir);

}  // namespace strandline::synthetic
