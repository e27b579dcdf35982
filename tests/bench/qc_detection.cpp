// Detection figures of the QC filters on generated sites (see qc_detection_eval.h):
// recall of gross outliers, false positives on good points, share of storm
// response kept, recall by offset size, RMSE to the truth of accepted points
// before and after correction by sensor class. Usage:
//   qc_detection [--seed N] [--seeds K] [--config pipeline.json]
// Prints one JSON object per seed and the pooled figures.
#include <chrono>
#include <cstdlib>
#include <fstream>
#include <iostream>
#include <string>

#include "tests/bench/qc_detection_eval.h"

using namespace strandline;

int main(int argc, char** argv) {
  std::uint64_t seed = synthetic::SiteParams::defaults().seed;
  int seeds = 1;
  nlohmann::json config = nlohmann::json::object();
  for (int a = 1; a + 1 < argc; a += 2) {
    const std::string key = argv[a];
    if (key == "--seed") seed = std::strtoull(argv[a + 1], nullptr, 10);
    else if (key == "--seeds") seeds = std::atoi(argv[a + 1]);
    else if (key == "--config") {
      std::ifstream in(argv[a + 1]);
      config = nlohmann::json::parse(in);
    } else {
      std::cerr << "unknown option " << key << "\n";
      return 2;
    }
  }
  std::size_t good = 0, good_rej = 0, gross = 0, gross_rej = 0, storm = 0, storm_kept = 0;
  for (int s = 0; s < seeds; ++s) {
    auto params = synthetic::SiteParams::defaults();
    params.seed = seed + s;
    const auto start = std::chrono::steady_clock::now();
    auto run = bench::run_generated_site(params, config);
    const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    const auto f = bench::score_detection(*run);
    nlohmann::json j = f.to_json();
    j["seed"] = params.seed;
    j["seconds_generate_and_run"] = seconds;
    std::cout << j.dump(2) << "\n";
    good += f.good, good_rej += f.good_rejected, gross += f.gross, gross_rej += f.gross_rejected;
    storm += f.storm, storm_kept += f.storm_kept;
  }
  std::cout << nlohmann::json{{"pooled_seeds", seeds},
                              {"recall", double(gross_rej) / gross},
                              {"false_positive_rate", double(good_rej) / good},
                              {"storm_response_kept_share", double(storm_kept) / storm}}
                   .dump(2)
            << "\n";
  return 0;
}
