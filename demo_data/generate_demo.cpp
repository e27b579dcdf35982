// Writes the invented demo site (see the README):
//   strandline-demo-gen OUTDIR [--seed N] [--transects N] [--no-waves] [--no-storms] [--no-setup]
// The demo's tide is the harmonic prediction (with nodal corrections and 3 mm/yr
// of mean-level rise) from tide_constituents.json, which the demo ships: the
// gauge record starts in 2006, and earlier images are corrected from the
// constituents.
#include <CLI/CLI.hpp>

#include <cstdlib>
#include <filesystem>
#include <iostream>
#include <string>

#include "corrections/tide/constituent_file.h"
#include "demo_data/synthetic/demo_tide.h"

int main(int argc, char** argv) {
  using namespace strandline::synthetic;
  SiteParams params = demo_site_params();
  std::string out;
  bool no_waves = false, no_setup = false, no_storms = false;
  CLI::App app("Writes the invented demo site (observations, water levels, waves, transects,\n"
               "tide constituents) into OUTDIR.",
               "strandline-demo-gen");
  app.set_help_flag("-h,--help", "this help");
  // An option-looking OUTDIR (e.g. a misplaced --help) must never become a folder name.
  app.add_option("OUTDIR", out, "folder to write the site into")->required()->check([](const std::string& dir) {
    return !dir.empty() && dir[0] == '-' ? std::string("OUTDIR must not start with '-'") : std::string();
  });
  app.add_option("--seed", params.seed, "random seed (a whole number)");
  app.add_option("--transects", params.n_transects, "number of transects (a whole number)");
  app.add_flag("--no-waves", no_waves, "no wave record and no wave setup in the data");
  app.add_flag("--no-setup", no_setup, "a wave record, but no wave setup in the positions");
  app.add_flag("--no-storms", no_storms, "no storm erosion events");
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    return app.exit(e) == 0 ? 0 : 2;  // help to stdout (0); usage errors to stderr (2)
  }
  if (no_waves) params.waves = params.waves_in_data = false;
  if (no_setup) params.waves_in_data = false;
  if (no_storms) params.storms = false;
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
