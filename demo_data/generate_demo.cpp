// Writes the invented demo site (see the README):
//   strandline-demo-gen OUTDIR [--seed N] [--transects N] [--no-waves] [--no-storms] [--no-setup]
// The demo's tide is the harmonic prediction (with nodal corrections and 3 mm/yr
// of mean-level rise) from tide_constituents.json, which the demo ships: the
// gauge record starts in 2006, and earlier images are corrected from the
// constituents.
#include <cstdlib>
#include <iostream>
#include <string>

#include <filesystem>
#include <tuple>
#include <vector>
#include <memory>

#include "corrections/tide/constituent_file.h"
#include "corrections/tide/tide_predictor.h"
#include "demo_data/synthetic/synthetic_site.h"

int main(int argc, char** argv) {
  using namespace strandline::synthetic;
  if (argc < 2) {
    std::cerr << "usage: strandline-demo-gen OUTDIR [--seed N] [--transects N] [--no-waves] [--no-storms] [--no-setup]\n";
    return 2;
  }
  SiteParams params = SiteParams::defaults();
  const std::string out = argv[1];
  for (int i = 2; i < argc; ++i) {
    const std::string a = argv[i];
    auto value = [&]() -> std::string {
      if (i + 1 >= argc) {
        std::cerr << "strandline-demo-gen: " << a << " needs a value\n";
        std::exit(2);
      }
      return argv[++i];
    };
    try {
      if (a == "--seed") params.seed = std::stoull(value());
      else if (a == "--transects") params.n_transects = std::stoi(value());
      else if (a == "--no-waves") params.waves = params.waves_in_data = false;
      else if (a == "--no-setup") params.waves_in_data = false;
      else if (a == "--no-storms") params.storms = false;
      else {
        std::cerr << "strandline-demo-gen: unknown option " << a << "\n";
        return 2;
      }
    } catch (const std::exception&) {
      std::cerr << "strandline-demo-gen: " << a << ": expected a whole number\n";
      return 2;
    }
  }
  // The demo site's harmonic constants (invented; a mixed, mainly semidiurnal tide).
  strandline::tide::ConstituentSet tide_set;
  tide_set.datum = "MSL";
  tide_set.z0_m = 0.0;
  tide_set.z0_rate_m_per_yr = 0.003;
  for (const auto& [name, amplitude_m, phase_deg] :
       std::vector<std::tuple<const char*, double, double>>{{"M2", 0.62, 40.0}, {"S2", 0.22, 75.0}, {"N2", 0.12, 20.0},
                                                            {"K2", 0.06, 72.0}, {"K1", 0.18, 200.0}, {"O1", 0.13, 180.0},
                                                            {"P1", 0.06, 198.0}, {"Q1", 0.025, 165.0}, {"M4", 0.02, 110.0},
                                                            {"Sa", 0.05, 250.0}})
    tide_set.constituents.push_back({name, amplitude_m, phase_deg});
  auto predictor = std::make_shared<strandline::tide::TidePredictor>(tide_set);
  params.tide_function = [predictor](strandline::TimeS t) { return predictor->level_m(t); };
  try {
    const Site site = generate_site(params);
    write_site(site, out);
    strandline::tide::write_constituent_file(tide_set, (std::filesystem::path(out) / "tide_constituents.json").string());
    std::cout << "wrote " << site.transects.size() << " transects, " << site.images.size() << " images, "
              << site.points.size() << " observations, " << site.gauge_times_s.size() << " gauge samples to " << out
              << "\n";
  } catch (const std::exception& e) {
    std::cerr << "strandline-demo-gen: " << e.what() << "\n";
    return 1;
  }
  return 0;
}
