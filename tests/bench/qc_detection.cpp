// Detection figures of the QC filters on generated sites (see qc_detection_eval.h):
// recall of gross outliers, false positives on good points, share of storm
// response kept, recall by offset size, RMSE to the truth of accepted points
// before and after correction by sensor class. Usage:
//   qc_detection [--seed N] [--seeds K] [--config pipeline.json]
//                [--layout parallel|gentle|curved|fanned|all] [--geometry on|off|both] [--table]
//                [--shift-m M]   (size of the planted whole-image shifts, default 60 m)
// Prints one JSON object per seed and the pooled figures; with --table only one
// Markdown row per layout and geometry of the whole-image misregistration figures.
// Layouts (total azimuth span of the 20 transects): parallel 0 deg (a straight
// coast), gentle 6 deg, curved = the default bay (36 deg), fanned 120 deg.
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <iostream>
#include <optional>
#include <string>
#include <vector>

#include "tests/bench/qc_detection_eval.h"

using namespace strandline;

namespace {

struct Layout {
  std::string name;
  std::optional<double> azimuth_span_deg;
};

const std::vector<Layout> kLayouts = {{"parallel", 0.0}, {"gentle", 6.0}, {"curved", std::nullopt}, {"fanned", 120.0}};

std::string percent(std::size_t k, std::size_t n) {
  char text[64];
  std::snprintf(text, sizeof text, "%.1f%% (%zu/%zu)", n ? 100.0 * double(k) / double(n) : 0.0, k, n);
  return text;
}

}  // namespace

int main(int argc, char** argv) {
  std::uint64_t seed = synthetic::SiteParams::defaults().seed;
  int seeds = 1;
  bool table = false;
  std::string layout_arg = "curved", geometry_arg = "on";
  double shift_m = synthetic::SiteParams::defaults().misregistration_m;
  double tide_scale = 1.0;  // e.g. 3.5: a macro-tidal site (spring range ~7 m)
  nlohmann::json config = nlohmann::json::object();
  for (int a = 1; a < argc; ++a) {
    const std::string key = argv[a];
    if (key == "--table") {
      table = true;
      continue;
    }
    if (a + 1 >= argc) {
      std::cerr << "option " << key << " needs a value\n";
      return 2;
    }
    const std::string value = argv[++a];
    if (key == "--seed") seed = std::strtoull(value.c_str(), nullptr, 10);
    else if (key == "--seeds") seeds = std::atoi(value.c_str());
    else if (key == "--layout") layout_arg = value;
    else if (key == "--geometry") geometry_arg = value;
    else if (key == "--shift-m") shift_m = std::strtod(value.c_str(), nullptr);
    else if (key == "--tide-scale") tide_scale = std::strtod(value.c_str(), nullptr);
    else if (key == "--config") {
      std::ifstream in(value);
      config = nlohmann::json::parse(in);
    } else {
      std::cerr << "unknown option " << key << "\n";
      return 2;
    }
  }
  std::vector<Layout> layouts;
  for (const auto& l : kLayouts)
    if (layout_arg == "all" || layout_arg == l.name) layouts.push_back(l);
  std::vector<bool> geometries;
  if (geometry_arg == "on" || geometry_arg == "both") geometries.push_back(true);
  if (geometry_arg == "off" || geometry_arg == "both") geometries.push_back(false);
  if (layouts.empty() || geometries.empty() || seeds < 1) {
    std::cerr << "unknown --layout, --geometry or --seeds\n";
    return 2;
  }
  if (table)
    std::cout << "| layout | geometry | images planted: flagged | gross misregistered points: flagged | "
                 "clean images flagged | good points flagged | images tested 2-D / common offset / not testable | "
                 "gross misregistered points accepted by all filters | all filters: recall, false positives |\n"
                 "| --- | --- | --- | --- | --- | --- | --- | --- | --- |\n";
  for (const auto& layout : layouts)
    for (bool with_geometry : geometries) {
      std::size_t good = 0, good_rej = 0, gross = 0, gross_rej = 0, storm = 0, storm_kept = 0;
      bench::DetectionFigures::Misregistration m;
      std::map<std::string, std::int64_t> counts;
      for (int s = 0; s < seeds; ++s) {
        auto params = synthetic::SiteParams::defaults();
        params.seed = seed + s;
        params.azimuth_span_deg = layout.azimuth_span_deg;
        params.misregistration_m = shift_m;
        params.tide = synthetic::default_tide();
        for (auto& c : params.tide) c.amplitude_m *= tide_scale;
        const auto start = std::chrono::steady_clock::now();
        auto run = bench::run_generated_site(params, config, with_geometry);
        const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
        const auto f = bench::score_detection(*run);
        const auto c = bench::misregistration_counts(*run);
        if (!table) {
          nlohmann::json j = f.to_json();
          j["seed"] = params.seed;
          j["layout"] = layout.name;
          j["geometry"] = with_geometry;
          j["image_misregistration_counts"] = c;
          j["seconds_generate_and_run"] = seconds;
          std::cout << j.dump(2) << "\n";
        }
        good += f.good, good_rej += f.good_rejected, gross += f.gross, gross_rej += f.gross_rejected;
        storm += f.storm, storm_kept += f.storm_kept;
        const auto& fm = f.misregistration;
        m.gross += fm.gross, m.gross_flagged += fm.gross_flagged, m.good += fm.good, m.good_flagged += fm.good_flagged;
        m.gross_all += fm.gross_all, m.gross_all_accepted += fm.gross_all_accepted;
        m.images_planted += fm.images_planted, m.images_planted_flagged += fm.images_planted_flagged;
        m.images_clean += fm.images_clean, m.images_clean_flagged += fm.images_clean_flagged;
        for (const auto& [k, v] : c) counts[k] += v;
      }
      if (table) {
        std::cout << "| " << layout.name << " | " << (with_geometry ? "yes" : "no") << " | "
                  << percent(m.images_planted_flagged, m.images_planted) << " | " << percent(m.gross_flagged, m.gross)
                  << " | " << percent(m.images_clean_flagged, m.images_clean) << " | "
                  << percent(m.good_flagged, m.good) << " | " << counts["images_tested_2d"] << " / "
                  << counts["images_tested_common_offset"] << " / " << counts["images_not_testable"] << " | "
                  << percent(m.gross_all_accepted, m.gross_all) << " | " << percent(gross_rej, gross) << ", "
                  << percent(good_rej, good) << " |" << std::endl;
        continue;
      }
      std::cout << nlohmann::json{{"pooled_seeds", seeds},
                                  {"layout", layout.name},
                                  {"geometry", with_geometry},
                                  {"recall", double(gross_rej) / gross},
                                  {"false_positive_rate", double(good_rej) / good},
                                  {"storm_response_kept_share", double(storm_kept) / storm},
                                  {"image_misregistration",
                                   {{"recall", m.recall()},
                                    {"image_recall", m.image_recall()},
                                    {"image_false_positive_rate", m.image_false_positive_rate()},
                                    {"false_positive_rate", m.false_positive_rate()},
                                    {"gross_accepted_by_all_filters",
                                     m.gross_all ? double(m.gross_all_accepted) / m.gross_all : 0.0},
                                    {"counts", counts}}}}
                       .dump(2)
                << "\n";
    }
  return 0;
}
