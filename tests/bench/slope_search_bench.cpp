// Benchmark of the spectral slope search against the published method's
// reference loop (tests/bench/slope_reference.py, run by run_slope_benchmark.sh).
//   slope_search_bench OUT_DIR [--transects N] [--seed S] [--repeats R]
// Makes N demo-generator transects (~800 images each: two 16-day satellites
// offset by 8 days, 1999-2025, tide only), writes OUT_DIR/transects.csv
// (transect_id,time_days,x_m,w_m) for the reference, and OUT_DIR/ours.json with,
// per transect, the true slope and our slope and CPU time per transect (median
// of R repeats) for:
//   published: the reference's settings (line-only detrending, no screen, no
//              bootstrap): the closed form replacing the slope loop;
//   default:   our defaults without the bootstrap (seasonal detrending, screen);
//   default_ci: our defaults with the 200-resample bootstrap.
#include <algorithm>
#include <cstdio>
#include <ctime>
#include <fstream>
#include <iostream>
#include <string>

#include <nlohmann/json.hpp>

#include "corrections/core/time_utc.h"
#include "corrections/spectral/slope_search.h"
#include "demo_data/synthetic/synthetic_site.h"

using namespace strandline;

namespace {

double cpu_seconds() {
  timespec ts;
  clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &ts);
  return static_cast<double>(ts.tv_sec) + 1e-9 * static_cast<double>(ts.tv_nsec);
}

}  // namespace

int main(int argc, char** argv) {
  if (argc < 2) {
    std::cerr << "usage: slope_search_bench OUT_DIR [--transects N] [--seed S] [--repeats R]\n";
    return 2;
  }
  const std::string out_dir = argv[1];
  int n_transects = 6, repeats = 15;
  std::uint64_t seed = 20261202;
  for (int i = 2; i + 1 < argc; i += 2) {
    const std::string a = argv[i];
    if (a == "--transects") n_transects = std::stoi(argv[i + 1]);
    else if (a == "--seed") seed = std::stoull(argv[i + 1]);
    else if (a == "--repeats") repeats = std::stoi(argv[i + 1]);
    else {
      std::cerr << "slope_search_bench: unknown option " << a << "\n";
      return 2;
    }
  }
  synthetic::SiteParams p = synthetic::SiteParams::defaults();
  p.seed = seed;
  p.n_transects = n_transects;
  p.unidentifiable_transects = 0;
  p.slope_min = 0.03;
  p.slope_max = 0.12;
  p.waves = p.waves_in_data = p.storms = false;
  p.first_year = 1999;
  p.last_year = 2025;
  p.sensors = {{"landsat8", 1999, 2025, 16, 10.4, 8.0, 0}, {"landsat7", 1999, 2025, 16, 10.4, 9.0, 8}};
  const synthetic::Site site = synthetic::generate_site(p);

  std::ofstream csv(out_dir + "/transects.csv");
  csv << "transect_id,time_days,x_m,w_m\n";
  const spectral::SlopeSearcher searcher;
  nlohmann::json rows = nlohmann::json::array();
  for (std::size_t tr = 0; tr < site.transects.size(); ++tr) {
    std::vector<double> t, x, w;
    for (const auto& pt : site.points) {
      if (pt.transect != tr) continue;
      t.push_back(pt.time_s);
      x.push_back(pt.chainage_raw_m);
      w.push_back(pt.water_level_m - p.z_ref_m);
    }
    std::vector<std::size_t> order(t.size());
    for (std::size_t i = 0; i < order.size(); ++i) order[i] = i;
    std::sort(order.begin(), order.end(), [&](auto a, auto b) { return t[a] < t[b]; });
    char line[160];
    for (std::size_t i : order) {
      std::snprintf(line, sizeof line, "%s,%.9f,%.6f,%.6f\n", site.transects[tr].id.c_str(),
                    (t[i] - t[order[0]]) / kSecondsPerDay, x[i], w[i]);
      csv << line;
    }
    auto timed = [&](const spectral::SlopeSearchOptions& o) {
      std::vector<double> seconds;
      spectral::SlopeEstimate est;
      for (int r = 0; r < repeats; ++r) {
        const double start = cpu_seconds();
        est = searcher.estimate({t, x, w, {}}, o);
        seconds.push_back(cpu_seconds() - start);
      }
      std::nth_element(seconds.begin(), seconds.begin() + repeats / 2, seconds.end());
      return std::pair{est, seconds[static_cast<std::size_t>(repeats / 2)]};
    };
    spectral::SlopeSearchOptions published;
    published.remove_seasonal = false;
    published.screen_passes = 0;
    published.bootstrap_count = 0;
    spectral::SlopeSearchOptions defaults_no_ci;
    defaults_no_ci.bootstrap_count = 0;
    const auto [pub, pub_s] = timed(published);
    const auto [def, def_s] = timed(defaults_no_ci);
    const auto [ci, ci_s] = timed(spectral::SlopeSearchOptions{});
    rows.push_back({{"transect_id", site.transects[tr].id},
                    {"images", t.size()},
                    {"true_slope", site.transects[tr].slope},
                    {"published", {{"slope", pub.tan_beta}, {"seconds", pub_s}, {"band_period_days", 1 / pub.band.peak_cpd}}},
                    {"default", {{"slope", def.tan_beta}, {"seconds", def_s}}},
                    {"default_ci", {{"slope", ci.tan_beta}, {"seconds", ci_s}, {"ci95", {ci.ci95_low, ci.ci95_high}}}}});
  }
  std::ofstream(out_dir + "/ours.json") << nlohmann::json{{"transects", rows}}.dump(2) << "\n";
  std::cerr << "slope_search_bench: " << rows.size() << " transects written to " << out_dir << "\n";
  return 0;
}
