// Detection figures of the QC filters on a generated site with known truth,
// shared by the benchmark program (qc_detection.cpp) and the unit test that
// asserts the targets (tests/unit/qc_detection_test.cpp).
//   gross outlier   planted offset > 40 m and > 4x the transect's robust noise
//                   (kMadToSigma * MAD of corrected - true over unplanted points)
//   good point      no planted offset
// Only corrected points are scored (an uncorrected point is rejected anyway).
// The whole-image step is also scored alone (its flag, per point and per image).
#pragma once

#include <algorithm>
#include <cmath>
#include <map>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "server/app/steps/step_list.h"
#include "corrections/engine/pipeline.h"
#include "corrections/water_level/gauge_series.h"
#include "corrections/waves/wave_record.h"
#include "demo_data/synthetic/synthetic_site.h"
#include "tests/unit/synthetic_table.h"
#include "qc/robust_stats.h"

namespace strandline::bench {

struct GeneratedRun {
  synthetic::Site site;
  SiteTable table;
  std::unique_ptr<GaugeSeries> gauge;
  std::unique_ptr<WaveRecord> waves;
  SensorTable sensors = SensorTable::defaults();
  RunInputs inputs;
  RunRecord record;
};

// Generates the site, loads it with transect geometry (unless `with_geometry`
// is false), true slopes (sigma 0.005), the gauge record and the wave record
// (setup correction), and runs the pipeline of `config`.
inline std::unique_ptr<GeneratedRun> run_generated_site(const synthetic::SiteParams& params,
                                                        const nlohmann::json& config = nlohmann::json::object(),
                                                        bool with_geometry = true) {
  auto run = std::make_unique<GeneratedRun>();
  run->site = synthetic::generate_site(params);
  const auto& site = run->site;
  run->table = synthetic_test::table_of(site);
  for (auto& t : run->table.transects)
    for (const auto& truth : site.transects)
      if (with_geometry && truth.id == t.id) t.geometry = {truth.origin_x_m, truth.origin_y_m, truth.azimuth_deg, truth.length_m};
  run->gauge = std::make_unique<GaugeSeries>(site.gauge_times_s, site.gauge_levels_m, 0.1);
  std::vector<WaveSample> samples;
  for (const auto& w : site.waves) samples.push_back({w.time_s, w.hs_m, w.tp_s, w.dir_deg, kUnknown});
  if (!samples.empty()) run->waves = std::make_unique<WaveRecord>(samples);
  RunInputs& in = run->inputs;
  in.water_levels = run->gauge.get();
  in.waves = run->waves.get();
  in.wave_correction = params.waves_in_data ? WaveCorrection::setup : WaveCorrection::none;
  in.sensors = &run->sensors;
  in.reference_elevation_m = params.z_ref_m;
  for (const auto& t : site.transects) in.slopes.per_transect[t.id] = {t.slope, 0.005};
  run->record = configured_pipeline(config).run(run->table, in);
  return run;
}

struct DetectionFigures {
  std::size_t corrected = 0, good = 0, good_rejected = 0, gross = 0, gross_rejected = 0;
  std::size_t minor_planted = 0, storm = 0, storm_kept = 0;
  std::map<std::string, std::size_t> good_rejected_by_flag, storm_rejected_by_flag;
  struct Bin { double lo, hi; std::size_t n = 0, rejected = 0; };
  std::vector<Bin> bins{{20, 40}, {40, 50}, {50, 60}, {60, 80}, {80, 100}, {100, 1e9}};
  std::map<std::string, std::size_t> gross_by_kind, gross_rejected_by_kind;
  struct Rmse { double before2 = 0, after2 = 0; std::size_t n = 0; };
  std::map<std::string, Rmse> rmse_by_class;  // accepted points
  // The whole-image step alone, on the points image_quality kept (the step sees
  // no others): gross misregistration points and good points carrying
  // image_misregistered; images with a planted shift and such a gross point,
  // images without a planted shift (with such a point), and how many of each it
  // flagged. Plus the gross misregistration points any filter left accepted.
  struct Misregistration {
    std::size_t gross = 0, gross_flagged = 0, good = 0, good_flagged = 0;
    std::size_t gross_all = 0, gross_all_accepted = 0;
    std::size_t images_planted = 0, images_planted_flagged = 0, images_clean = 0, images_clean_flagged = 0;
    double recall() const { return gross ? double(gross_flagged) / gross : 1.0; }
    double image_recall() const { return images_planted ? double(images_planted_flagged) / images_planted : 1.0; }
    double image_false_positive_rate() const { return images_clean ? double(images_clean_flagged) / images_clean : 0.0; }
    double false_positive_rate() const { return good ? double(good_flagged) / good : 0.0; }
  } misregistration;
  double recall() const { return gross ? double(gross_rejected) / gross : 1.0; }
  double false_positive_rate() const { return good ? double(good_rejected) / good : 0.0; }
  double storm_kept_share() const { return storm ? double(storm_kept) / storm : 1.0; }
  nlohmann::json to_json() const;
};

inline DetectionFigures score_detection(const GeneratedRun& run) {
  const auto& table = run.table;
  const auto& site = run.site;
  DetectionFigures f;
  // Robust noise per transect from the unplanted points.
  std::vector<double> noise(table.transects.size(), kUnknown);
  for (std::size_t tr = 0; tr < table.transects.size(); ++tr) {
    std::vector<double> e;
    for (std::size_t i = table.transects[tr].begin; i < table.transects[tr].end; ++i) {
      const auto& p = site.points[table.input_row[i]];
      if (p.outlier == synthetic::OutlierKind::none && known(table.chainage_m[i]))
        e.push_back(table.chainage_m[i] - p.true_chainage_m);
    }
    std::vector<double> w = e;
    const double med = median_in_place(w);
    noise[tr] = kMadToSigma * mad_about(e, med);
  }
  enum : char { kSeen = 1, kGross = 2, kFlagged = 4 };
  std::vector<char> image_state(site.images.size(), 0);
  const FlagSet image_quality = flag_bit(Flag::cloudy_image) | flag_bit(Flag::poor_georeference);
  auto& m = f.misregistration;
  for (std::size_t i = 0; i < table.size(); ++i) {
    if (!known(table.chainage_m[i])) continue;
    ++f.corrected;
    const auto& p = site.points[table.input_row[i]];
    const bool accepted = table.accepted(i);
    const bool misregistered = has_flag(table.flags[i], Flag::image_misregistered);
    const double size = std::abs(p.outlier_offset_m);
    const bool gross = p.outlier != synthetic::OutlierKind::none && size > 40 && size > 4 * noise[table.transect[i]];
    const bool gross_misregistered = gross && p.outlier == synthetic::OutlierKind::misregistration;
    if (gross_misregistered) ++m.gross_all, m.gross_all_accepted += accepted ? 1 : 0;
    if ((table.flags[i] & image_quality) == 0) {
      image_state[p.image] |= kSeen | (misregistered ? kFlagged : 0) | (gross_misregistered ? kGross : 0);
      if (gross_misregistered) ++m.gross, m.gross_flagged += misregistered ? 1 : 0;
      if (p.outlier == synthetic::OutlierKind::none) ++m.good, m.good_flagged += misregistered ? 1 : 0;
    }
    if (p.outlier == synthetic::OutlierKind::none) {
      ++f.good;
      if (!accepted) {
        ++f.good_rejected;
        for (auto name : flag_names(table.flags[i] & rejecting_flags())) ++f.good_rejected_by_flag[std::string(name)];
      }
      if (p.storm_response) {
        ++f.storm;
        f.storm_kept += accepted ? 1 : 0;
        if (!accepted)
          for (auto name : flag_names(table.flags[i] & rejecting_flags())) ++f.storm_rejected_by_flag[std::string(name)];
      }
    } else {
      const std::string kind(synthetic::outlier_kind_name(p.outlier));
      if (gross) {
        ++f.gross;
        ++f.gross_by_kind[kind];
        if (!accepted) ++f.gross_rejected, ++f.gross_rejected_by_kind[kind];
      } else {
        ++f.minor_planted;
      }
      for (auto& b : f.bins)
        if (size >= b.lo && size < b.hi) ++b.n, b.rejected += accepted ? 0 : 1;
    }
    if (accepted) {
      const auto cls = run.sensors.lookup(table.sensor_names[table.sensor[i]]);
      auto& r = f.rmse_by_class[cls ? cls->name : table.sensor_names[table.sensor[i]]];
      r.before2 += std::pow(p.chainage_raw_m - p.true_chainage_m, 2);
      r.after2 += std::pow(table.chainage_m[i] - p.true_chainage_m, 2);
      ++r.n;
    }
  }
  for (std::size_t im = 0; im < site.images.size(); ++im) {
    const bool planted = site.images[im].shift_x_m != 0 || site.images[im].shift_y_m != 0;
    const bool flagged = image_state[im] & kFlagged;
    if (planted && (image_state[im] & kGross)) ++m.images_planted, m.images_planted_flagged += flagged ? 1 : 0;
    if (!planted && (image_state[im] & kSeen)) ++m.images_clean, m.images_clean_flagged += flagged ? 1 : 0;
  }
  return f;
}

// The image_misregistration step's counts from the run's provenance (images
// tested per model, not testable, explained by storm, rejected).
inline std::map<std::string, std::int64_t> misregistration_counts(const GeneratedRun& run) {
  std::map<std::string, std::int64_t> counts;
  for (const auto& s : run.record.steps)
    if (s.step == "image_misregistration")
      for (const char* key : {"images_tested", "images_tested_2d", "images_tested_common_offset", "images_not_testable",
                              "images_explained_by_storm", "images_rejected"})
        counts[key] = s.log.count_of(key);
  return counts;
}

inline nlohmann::json DetectionFigures::to_json() const {
  nlohmann::json bins_json = nlohmann::json::array();
  for (const auto& b : bins)
    bins_json.push_back({{"offset_from_m", b.lo}, {"offset_to_m", b.hi > 1e8 ? nlohmann::json(nullptr) : nlohmann::json(b.hi)},
                         {"points", b.n}, {"rejected", b.rejected},
                         {"recall", b.n ? nlohmann::json(double(b.rejected) / b.n) : nlohmann::json(nullptr)}});
  nlohmann::json rmse = nlohmann::json::object();
  for (const auto& [c, r] : rmse_by_class)
    rmse[c] = {{"points", r.n}, {"rmse_before_m", std::sqrt(r.before2 / r.n)}, {"rmse_after_m", std::sqrt(r.after2 / r.n)}};
  return {{"corrected_points", corrected},
          {"good_points", good},
          {"good_rejected", good_rejected},
          {"false_positive_rate", false_positive_rate()},
          {"good_rejected_by_flag", good_rejected_by_flag},
          {"gross_outliers", gross},
          {"gross_rejected", gross_rejected},
          {"recall", recall()},
          {"gross_by_kind", gross_by_kind},
          {"gross_rejected_by_kind", gross_rejected_by_kind},
          {"minor_planted_not_scored", minor_planted},
          {"storm_response_points", storm},
          {"storm_response_kept", storm_kept},
          {"storm_response_kept_share", storm_kept_share()},
          {"storm_response_rejected_by_flag", storm_rejected_by_flag},
          {"recall_by_offset_bin", bins_json},
          {"image_misregistration",
           {{"gross_points", misregistration.gross}, {"gross_flagged", misregistration.gross_flagged},
            {"recall", misregistration.recall()}, {"good_points", misregistration.good},
            {"good_flagged", misregistration.good_flagged},
            {"gross_points_all", misregistration.gross_all},
            {"gross_points_all_accepted", misregistration.gross_all_accepted},
            {"images_planted", misregistration.images_planted},
            {"images_planted_flagged", misregistration.images_planted_flagged},
            {"images_clean", misregistration.images_clean},
            {"images_clean_flagged", misregistration.images_clean_flagged}}},
          {"accepted_rmse_by_sensor_class", rmse}};
}

}  // namespace strandline::bench
