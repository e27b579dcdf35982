#include "demo_data/synthetic/synthetic_site.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <numbers>
#include <random>
#include <stdexcept>

namespace strandline::synthetic {

namespace {

constexpr double kEpoch2000_s = 946684800.0;  // 2000-01-01T00:00:00Z
constexpr double kGravity = 9.80665;
constexpr double kDegToRad = std::numbers::pi / 180.0;


std::vector<SensorPlan> default_sensors() {
  return {
      {"landsat5", 1999.0, 2011.8, 16, 10.2, 9.0, 0},
      {"landsat7", 1999.3, 2021.5, 16, 10.4, 9.0, 8},
      {"landsat8", 2013.3, 2025.9, 16, 10.5, 8.0, 0},
      {"landsat9", 2021.9, 2025.9, 16, 10.5, 8.0, 8},
      {"sentinel2a", 2015.5, 2025.9, 10, 10.9, 7.0, 0},
      {"sentinel2b", 2017.3, 2025.9, 10, 10.9, 7.0, 5},
      {"smallsat", 2017.0, 2025.9, 3, 9.6, 4.0, 0},
  };
}

// Linear interpolation on a regular grid.
double regular_interp(const std::vector<double>& y, double t0, double dt, double t) {
  const double u = (t - t0) / dt;
  if (u <= 0) return y.front();
  const std::size_t i = static_cast<std::size_t>(u);
  if (i + 1 >= y.size()) return y.back();
  const double w = u - static_cast<double>(i);
  return y[i] * (1 - w) + y[i + 1] * w;
}

std::string fixed(double v, int decimals) {
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.*f", decimals, v);
  return buf;
}

std::string image_date(TimeS t) {
  const std::string iso = format_time_utc(t);  // YYYY-MM-DDTHH:MM:SSZ
  return iso.substr(0, 4) + iso.substr(5, 2) + iso.substr(8, 2);
}

}  // namespace

// Standard constituent speeds (deg/h) of the default tide; the default
// amplitudes make a mixed, mainly semidiurnal tide of ~2 m spring range.
const std::vector<ToneConstituent>& default_tide() {
  static const std::vector<ToneConstituent> tide = {
      {"M2", 28.9841042, 0.62, 40.0}, {"S2", 30.0000000, 0.22, 75.0}, {"N2", 28.4397295, 0.12, 20.0},
      {"K2", 30.0821373, 0.06, 72.0}, {"K1", 15.0410686, 0.18, 200.0}, {"O1", 13.9430356, 0.13, 180.0},
      {"P1", 14.9589314, 0.06, 198.0}, {"Sa", 0.0410686, 0.05, 250.0}};
  return tide;
}

std::string_view outlier_kind_name(OutlierKind k) {
  switch (k) {
    case OutlierKind::none: return "none";
    case OutlierKind::spike: return "spike";
    case OutlierKind::cloud_run: return "cloud_run";
    case OutlierKind::misregistration: return "misregistration";
  }
  return "none";
}

TimeS time_from_year(double year) { return kEpoch2000_s + (year - 2000.0) * kSecondsPerJulianYear; }
double year_from_time(TimeS t) { return 2000.0 + (t - kEpoch2000_s) / kSecondsPerJulianYear; }

SiteParams SiteParams::defaults() { return SiteParams{}; }

double Site::tide_at(TimeS t) const {
  if (params.tide_function) return params.tide_function(t);
  const auto& tones = params.tide.empty() ? default_tide() : params.tide;
  const double hours = (t - kEpoch2000_s) / 3600.0;
  double h = 0;
  for (const auto& c : tones) h += c.amplitude_m * std::cos((c.speed_deg_per_h * hours - c.phase_deg) * kDegToRad);
  return h;
}

Site generate_site(const SiteParams& params) {
  if (params.n_transects < 1) throw std::invalid_argument("n_transects must be at least 1");
  if (!(params.last_year > params.first_year)) throw std::invalid_argument("last_year must follow first_year");
  Site site;
  site.params = params;
  std::mt19937_64 rng(params.seed);
  std::uniform_real_distribution<double> uniform(0.0, 1.0);
  std::normal_distribution<double> normal(0.0, 1.0);
  const TimeS t_first = time_from_year(params.first_year);
  const TimeS t_last = time_from_year(params.last_year);

  // ---- transects along a gently curved bay: an arc whose seaward normals point to its centre
  const int n = params.n_transects;
  // A bay of 3 km radius; longer coasts get a larger radius so the arc stays under 0.7 rad
  // (azimuth_span_deg, when set, gives the radius instead).
  double radius_m = std::max(3000.0, n * params.spacing_m / 0.7);
  if (params.azimuth_span_deg && !(*params.azimuth_span_deg >= 0 && *params.azimuth_span_deg <= 180))
    throw std::invalid_argument("azimuth_span_deg must be within [0, 180]");
  const bool straight = params.azimuth_span_deg && (*params.azimuth_span_deg == 0 || n == 1);
  if (params.azimuth_span_deg && !straight) radius_m = (n - 1) * params.spacing_m / (*params.azimuth_span_deg * kDegToRad);
  const double centre_x = 431000.0, centre_y = 5902000.0;  // work CRS metres (demo: EPSG:32631)
  std::vector<double> slopes = params.slopes;
  if (slopes.empty()) {
    const int estimable = std::max(1, n - params.unidentifiable_transects);
    for (int i = 0; i < estimable; ++i)
      slopes.push_back(estimable == 1 ? 0.5 * (params.slope_min + params.slope_max)
                                      : params.slope_min + (params.slope_max - params.slope_min) * i / (estimable - 1));
    std::shuffle(slopes.begin(), slopes.end(), rng);
    // Planted steep (reflective) transects: the tidal excursion is a few metres,
    // below what the spectral method can resolve, and outside the search range.
    for (int i = estimable; i < n; ++i) slopes.push_back(0.25);
  }
  if (static_cast<int>(slopes.size()) != n) throw std::invalid_argument("slopes must list one slope per transect");
  for (int i = 0; i < n; ++i) {
    TransectTruth tr;
    char id[16];
    std::snprintf(id, sizeof id, "T%03d", i + 1);
    tr.id = id;
    tr.slope = slopes[i];
    tr.base_chainage_m = 180.0 + 40.0 * uniform(rng);
    tr.trend_m_per_yr = params.trend_sigma_m_per_yr * normal(rng);
    tr.seasonal_amplitude_m = params.seasonal_amplitude_m * (0.7 + 0.6 * uniform(rng));
    tr.seasonal_phase_deg = 30.0 + 20.0 * normal(rng);  // most seaward about February
    const double along_m = (-0.5 * (n - 1) + i) * params.spacing_m;
    const double angle = straight ? 0.0 : along_m / radius_m;  // radians along the arc
    // Baseline 450 m landward of the arc; transects point toward the bay centre
    // (a straight coast: the baseline north of the centre, transects due south).
    const double azimuth = std::fmod(180.0 + angle / kDegToRad + 360.0, 360.0);
    tr.azimuth_deg = azimuth;
    tr.origin_x_m = straight ? centre_x + along_m : centre_x - (radius_m + 450.0) * std::sin(azimuth * kDegToRad);
    tr.origin_y_m = straight ? centre_y + radius_m + 450.0 : centre_y - (radius_m + 450.0) * std::cos(azimuth * kDegToRad);
    tr.length_m = 500.0;
    site.transects.push_back(tr);
  }

  // ---- surge: AR(1) on an hourly grid (the same residual the gauge sees)
  const double surge_dt = 3600.0;
  const std::size_t n_surge = static_cast<std::size_t>((t_last - t_first) / surge_dt) + 2;
  std::vector<double> surge(n_surge);
  {
    const double phi = std::exp(-surge_dt / (params.surge_corr_days * kSecondsPerDay));
    double s = 0;
    for (auto& v : surge) {
      s = phi * s + params.surge_sigma_m * std::sqrt(1 - phi * phi) * normal(rng);
      v = s;
    }
  }

  // ---- storms and the wave record (deep-water values, 3-hourly)
  if (params.storms) {
    for (double year = std::floor(params.first_year); year < params.last_year; year += 1.0) {
      const int count = 1 + static_cast<int>(uniform(rng) * 2.0);  // 1-2 per year
      for (int k = 0; k < count; ++k) {
        StormEvent e;
        // Winter-biased: within +-60 days of mid-January (northern hemisphere demo).
        e.peak_s = time_from_year(year + 0.04 + (uniform(rng) - 0.5) * 0.33);
        if (e.peak_s < t_first || e.peak_s > t_last) continue;
        e.hs_peak_m = 4.0 + 3.0 * uniform(rng);
        e.erosion_m = 12.0 + 8.0 * (e.hs_peak_m - 4.0);
        e.duration_days = 1.5 + 1.5 * uniform(rng);
        e.recovery_days = 60.0 + 60.0 * uniform(rng);
        site.storms.push_back(e);
      }
    }
    std::sort(site.storms.begin(), site.storms.end(), [](auto& a, auto& b) { return a.peak_s < b.peak_s; });
  }
  std::vector<double> hs_grid, tp_grid;
  const double wave_dt = 3 * 3600.0;
  if (params.waves) {
    const std::size_t nw = static_cast<std::size_t>((t_last - t_first) / wave_dt) + 2;
    double ar = 0;
    const double phi = std::exp(-wave_dt / (1.5 * kSecondsPerDay));
    for (std::size_t k = 0; k < nw; ++k) {
      const TimeS t = t_first + k * wave_dt;
      ar = phi * ar + std::sqrt(1 - phi * phi) * normal(rng);
      const double season = std::cos(2 * std::numbers::pi * (year_from_time(t) - std::floor(year_from_time(t)) - 0.04));
      double hs = std::exp(std::log(1.1) + 0.25 * season + 0.35 * ar);
      double tp = 8.0 + 1.5 * season + 1.0 * ar;
      for (const auto& e : site.storms) {
        const double dt_days = (t - e.peak_s) / kSecondsPerDay;
        if (std::abs(dt_days) > 3 * e.duration_days) continue;
        const double bump = std::exp(-0.5 * std::pow(dt_days / (0.5 * e.duration_days), 2));
        hs = std::max(hs, e.hs_peak_m * bump);
        tp = std::max(tp, (11.0 + 0.6 * e.hs_peak_m) * std::sqrt(bump));
      }
      tp = std::clamp(tp, 4.0, 20.0);
      hs_grid.push_back(hs);
      tp_grid.push_back(tp);
      site.waves.push_back({t, std::round(hs * 100) / 100, std::round(tp * 10) / 10,
                            std::round(200.0 + 15.0 * ar)});
    }
  }

  // ---- gauge record (tide + surge), rounded to mm, with a few multi-day gaps
  {
    const TimeS g0 = time_from_year(params.gauge_first_year), g1 = time_from_year(params.gauge_last_year);
    std::vector<std::pair<TimeS, TimeS>> gaps;
    for (int k = 0; k < 6; ++k) {
      const TimeS start = g0 + uniform(rng) * (g1 - g0);
      gaps.emplace_back(start, start + (1.0 + 20.0 * uniform(rng)) * kSecondsPerDay);
    }
    for (TimeS t = g0; t <= g1; t += params.gauge_step_s) {
      bool in_gap = false;
      for (const auto& [a, b] : gaps) in_gap = in_gap || (t >= a && t < b);
      if (in_gap) continue;
      site.gauge_times_s.push_back(t);
      site.gauge_levels_m.push_back(std::round((site.tide_at(t) + regular_interp(surge, t_first, surge_dt, t)) * 1000) / 1000);
    }
  }

  // ---- images: fixed time of day per sensor, cloud losses
  const auto sensors = params.sensors.empty() ? default_sensors() : params.sensors;
  for (const auto& s : sensors) {
    const TimeS first_day = std::floor(time_from_year(s.first_year) / kSecondsPerDay) * kSecondsPerDay;
    const TimeS last = time_from_year(s.last_year);
    for (TimeS day = first_day + s.offset_days * kSecondsPerDay; day <= last; day += s.revisit_days * kSecondsPerDay) {
      // Overpass within a few minutes of the nominal time (an hour for small satellites).
      const double jitter_h = (s.name == "smallsat" ? 1.0 : 0.05) * (uniform(rng) - 0.5);
      const TimeS t = std::round(day + (s.hour_utc + jitter_h) * 3600.0);  // whole seconds
      if (t < t_first || t > t_last) continue;
      if (uniform(rng) < params.cloud_loss_fraction) continue;
      Image img;
      img.id = s.name + "_" + image_date(t);
      img.sensor = s.name;
      img.time_s = t;
      site.images.push_back(img);
    }
  }
  std::sort(site.images.begin(), site.images.end(), [](auto& a, auto& b) { return a.time_s < b.time_s; });

  // ---- points
  auto noise_of = [&](const std::string& sensor) {
    for (const auto& s : sensors)
      if (s.name == sensor) return s.noise_sigma_m;
    return 8.0;
  };
  for (std::size_t im = 0; im < site.images.size(); ++im) {
    Image& img = site.images[im];
    const TimeS t = img.time_s;
    const double years = year_from_time(t) - params.first_year;
    const double frac_year = year_from_time(t) - std::floor(year_from_time(t));
    const double eta = site.tide_at(t) + regular_interp(surge, t_first, surge_dt, t);
    double hs = 0, tp = 0;
    if (params.waves) {
      hs = regular_interp(hs_grid, t_first, wave_dt, t);
      tp = regular_interp(tp_grid, t_first, wave_dt, t);
    }
    const double l0 = kGravity * tp * tp / (2 * std::numbers::pi);
    // Image-level defects
    double cloud = std::min(0.95, std::pow(uniform(rng), 3.0) * 0.6);
    double georef = 3.0 + 4.0 * uniform(rng);
    const bool misregistered = uniform(rng) < params.misregistered_fraction;
    if (misregistered) {
      const double dir = 2 * std::numbers::pi * uniform(rng);
      img.shift_x_m = params.misregistration_m * std::sin(dir);
      img.shift_y_m = params.misregistration_m * std::cos(dir);
      georef = 8.0 + 10.0 * uniform(rng);
    }
    int run_begin = -1, run_end = -1;
    double run_offset = 0;
    if (uniform(rng) < params.cloud_run_fraction) {
      const int len = 3 + static_cast<int>(uniform(rng) * 6);
      run_begin = static_cast<int>(uniform(rng) * std::max(1, n - len));
      run_end = std::min(n, run_begin + len);
      run_offset = (uniform(rng) < 0.5 ? -1 : 1) * (50.0 + 50.0 * uniform(rng));
      cloud = 0.2 + 0.4 * uniform(rng);
    }
    for (int tr_i = 0; tr_i < n; ++tr_i) {
      const TransectTruth& tr = site.transects[tr_i];
      Point p;
      p.transect = tr_i;
      p.image = im;
      p.time_s = t;
      double storm = 0;
      for (const auto& e : site.storms) {
        const double since_days = (t - e.peak_s) / kSecondsPerDay;
        if (since_days < 0 || since_days > 6 * e.recovery_days) continue;
        const double build = std::min(1.0, since_days / e.duration_days);
        storm -= e.erosion_m * build * std::exp(-std::max(0.0, since_days - e.duration_days) / e.recovery_days);
      }
      p.storm_response = storm < -5.0;
      p.true_chainage_m = tr.base_chainage_m + tr.trend_m_per_yr * years +
                          tr.seasonal_amplitude_m * std::cos(2 * std::numbers::pi * frac_year - tr.seasonal_phase_deg * kDegToRad) +
                          storm;
      p.water_level_m = eta;
      // Stockdon et al. (2006): 0.35 tan(beta) sqrt(H0 L0) (eq. 10), or 0.016 sqrt(H0 L0) on a
      // dissipative beach, tan(beta) / sqrt(H0 / L0) < 0.3 (eq. 16; recalled from memory).
      const bool dissipative = hs > 0 && tr.slope / std::sqrt(hs / l0) < 0.3;
      const double setup_m = dissipative ? 0.016 * std::sqrt(hs * l0) : 0.35 * tr.slope * std::sqrt(hs * l0);
      p.setup_m = (params.waves && params.waves_in_data) ? setup_m : 0.0;
      const double eta_seen = tr.tide_scale * (eta - params.z_ref_m) + params.z_ref_m + p.setup_m;
      const double waterline = p.true_chainage_m - (eta_seen - params.z_ref_m) / tr.slope;
      double offset = 0;
      if (misregistered) {
        offset = img.shift_x_m * std::sin(tr.azimuth_deg * kDegToRad) + img.shift_y_m * std::cos(tr.azimuth_deg * kDegToRad);
        p.outlier = OutlierKind::misregistration;
      } else if (tr_i >= run_begin && tr_i < run_end) {
        offset = run_offset + 5.0 * normal(rng);
        p.outlier = OutlierKind::cloud_run;
      } else if (uniform(rng) < params.spike_fraction) {
        offset = (uniform(rng) < 0.5 ? -1 : 1) * (params.spike_min_m + (params.spike_max_m - params.spike_min_m) * uniform(rng));
        p.outlier = OutlierKind::spike;
      }
      p.outlier_offset_m = offset;
      p.chainage_raw_m = std::round((waterline + noise_of(img.sensor) * normal(rng) + offset) * 100) / 100;
      p.cloud_fraction = std::round(cloud * 1000) / 1000;
      p.georef_rmse_m = std::round(georef * 10) / 10;
      site.points.push_back(p);
    }
  }
  return site;
}

void write_site(const Site& site, const std::string& dir) {
  namespace fs = std::filesystem;
  fs::create_directories(dir);
  auto open = [&](const std::string& name) {
    std::ofstream out(fs::path(dir) / name);
    if (!out) throw std::runtime_error("cannot write " + (fs::path(dir) / name).string());
    return out;
  };
  {
    auto out = open("observations.csv");
    out << "transect_id,time,chainage_m,sensor,image_id,cloud_fraction,georef_rmse_m\n";
    for (const auto& p : site.points) {
      const Image& img = site.images[p.image];
      out << site.transects[p.transect].id << ',' << format_time_utc(p.time_s) << ',' << fixed(p.chainage_raw_m, 2) << ','
          << img.sensor << ',' << img.id << ',' << fixed(p.cloud_fraction, 3) << ',' << fixed(p.georef_rmse_m, 1) << '\n';
    }
  }
  {
    auto out = open("truth_points.csv");
    out << "transect_id,image_id,time,true_chainage_m,water_level_m,setup_m,outlier_kind,outlier_offset_m,storm_response\n";
    for (const auto& p : site.points)
      out << site.transects[p.transect].id << ',' << site.images[p.image].id << ',' << format_time_utc(p.time_s) << ','
          << fixed(p.true_chainage_m, 3) << ',' << fixed(p.water_level_m, 4) << ',' << fixed(p.setup_m, 4) << ','
          << outlier_kind_name(p.outlier) << ',' << fixed(p.outlier_offset_m, 2) << ',' << (p.storm_response ? 1 : 0) << '\n';
  }
  {
    auto out = open("water_levels.csv");
    out << "time,level_m\n";
    for (std::size_t i = 0; i < site.gauge_times_s.size(); ++i)
      out << format_time_utc(site.gauge_times_s[i]) << ',' << fixed(site.gauge_levels_m[i], 3) << '\n';
  }
  if (!site.waves.empty()) {
    auto out = open("waves.csv");
    out << "time,hs_m,tp_s,dir_deg\n";
    for (const auto& w : site.waves)
      out << format_time_utc(w.time_s) << ',' << fixed(w.hs_m, 2) << ',' << fixed(w.tp_s, 1) << ',' << fixed(w.dir_deg, 0) << '\n';
  }
  {
    auto out = open("truth_transects.csv");
    out << "transect_id,slope,base_chainage_m,trend_m_per_yr,seasonal_amplitude_m,seasonal_phase_deg\n";
    for (const auto& t : site.transects)
      out << t.id << ',' << fixed(t.slope, 5) << ',' << fixed(t.base_chainage_m, 3) << ',' << fixed(t.trend_m_per_yr, 4) << ','
          << fixed(t.seasonal_amplitude_m, 3) << ',' << fixed(t.seasonal_phase_deg, 2) << '\n';
  }
  {
    auto out = open("transect_params.csv");
    out << "transect_id,slope,slope_sigma,z_ref_m\n";
    for (const auto& t : site.transects)
      out << t.id << ',' << fixed(t.slope, 5) << ",0.005," << fixed(site.params.z_ref_m, 3) << '\n';
  }
  {
    auto out = open("transects.geojson");
    out << "{\"type\":\"FeatureCollection\",\"name\":\"transects\",\n"
           "\"crs\":{\"type\":\"name\",\"properties\":{\"name\":\"urn:ogc:def:crs:EPSG::32631\"}},\n\"features\":[\n";
    for (std::size_t i = 0; i < site.transects.size(); ++i) {
      const auto& t = site.transects[i];
      const double ex = t.origin_x_m + t.length_m * std::sin(t.azimuth_deg * kDegToRad);
      const double ey = t.origin_y_m + t.length_m * std::cos(t.azimuth_deg * kDegToRad);
      out << "{\"type\":\"Feature\",\"properties\":{\"transect_id\":\"" << t.id << "\",\"azimuth_deg\":" << fixed(t.azimuth_deg, 4)
          << ",\"length_m\":" << fixed(t.length_m, 1) << "},\"geometry\":{\"type\":\"LineString\",\"coordinates\":[["
          << fixed(t.origin_x_m, 3) << ',' << fixed(t.origin_y_m, 3) << "],[" << fixed(ex, 3) << ',' << fixed(ey, 3) << "]]}}"
          << (i + 1 < site.transects.size() ? ",\n" : "\n");
    }
    out << "]}\n";
  }
}

}  // namespace strandline::synthetic
