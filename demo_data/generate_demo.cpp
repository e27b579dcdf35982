// Writes the invented demo site (see the README):
//   strandline-demo-gen OUTDIR [--seed N] [--transects N] [--no-waves] [--no-storms] [--no-setup]
// The demo's tide is the harmonic prediction (with nodal corrections and 3 mm/yr
// of mean-level rise) from tide_constituents.json, which the demo ships: the
// gauge record starts in 2006, and earlier images are corrected from the
// constituents.
#include <cstdlib>
#include <filesystem>
#include <iostream>
#include <string>

#include "corrections/tide/constituent_file.h"
#include "demo_data/synthetic/demo_tide.h"

int main(int argc, char** argv) {
  using namespace strandline::synthetic;
  if (argc < 2) {
    std::cerr << "usage: strandline-demo-gen OUTDIR [--seed N] [--transects N] [--no-waves] [--no-storms] [--no-setup]\n";
    return 2;
  }
  SiteParams params = demo_site_params();
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
  try {
    const Site site = generate_site(params);
    write_site(site, out);
    strandline::tide::write_constituent_file(demo_tide_constituents(), (std::filesystem::path(out) / "tide_constituents.json").string());
    std::cout << "wrote " << site.transects.size() << " transects, " << site.images.size() << " images, "
              << site.points.size() << " observations, " << site.gauge_times_s.size() << " gauge samples to " << out
              << "\n";
  } catch (const std::exception& e) {
    std::cerr << "strandline-demo-gen: " << e.what() << "\n";
    return 1;
  }
  return 0;
}
