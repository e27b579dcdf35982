// `strandline SUBCOMMAND [options]`: the batch entry point and the service
// launcher share this binary and the same engine.
#include <cstdio>
#include <exception>
#include <iostream>

#include "corrections/core/errors.h"
#include "server/cli/args.h"
#include "server/cli/commands.h"

namespace {

using strandline::cli::Command;

const Command kCommands[] = {
    {"correct", "correct raw shoreline positions for water level, waves and slope; QC; summary",
     strandline::cli::run_correct},
    {"slope", "estimate beach-face slopes from the data (spectral method) as slopes.json", strandline::cli::run_slope},
    {"intersect", "intersect shoreline polylines with transects into the batch observation CSV",
     strandline::cli::run_intersect},
    {"transects", "generate shore-normal transects along a baseline polyline", strandline::cli::run_transects},
    {"polylines", "draw per-transect positions of each image as shoreline polylines", strandline::cli::run_polylines},
    {"geoexport", "cleaned CSV + summary as GeoPackage/GeoJSON points and transect layers",
     strandline::cli::run_geoexport},
    {"runup", "wave calculator: H0, L0, Iribarren, Stockdon (2006) setup, swash and R2% as JSON",
     strandline::cli::run_runup},
    {"tide-predict", "astronomical tide from a constituent file as time,level_m CSV", strandline::cli::run_tide_predict},
    {"tide-fit", "harmonic analysis of a gauge record into a constituent file", strandline::cli::run_tide_fit},
    {"serve", "HTTP service: uploads, background runs, series (see --help; --demo for a demo site)",
     strandline::cli::run_serve},
    {"keys", "API keys of the service: add, list, revoke", strandline::cli::run_keys},
    {"backup", "consistent copy of the service's database, also while it serves", strandline::cli::run_backup},
    {"restore", "replace the service's database by a checked backup (server stopped)", strandline::cli::run_restore},
};

void print_usage(std::ostream& out) {
  out << "usage: strandline SUBCOMMAND [options]\n\nsubcommands:\n";
  for (const auto& c : kCommands) {
    out << "  " << c.name;
    for (std::size_t i = c.name.size(); i < 14; ++i) out << ' ';
    out << c.summary << "\n";
  }
  out << "\n`strandline SUBCOMMAND --help` (or -h) lists a subcommand's options; `strandline version` prints the version.\n"
         "Exit codes: 0 success, 1 internal failure, 2 bad input or usage.\n";
}

}  // namespace

int main(int argc, char** argv) {
  using namespace strandline;
  if (argc < 2 || std::string_view(argv[1]) == "--help" || std::string_view(argv[1]) == "-h" ||
      std::string_view(argv[1]) == "help") {
    print_usage(argc < 2 ? std::cerr : std::cout);
    return argc < 2 ? kExitBadInput : kExitOk;
  }
  const std::string_view name = argv[1];
  if (name == "version" || name == "--version") {
    std::cout << "strandline " << STRANDLINE_VERSION << "\n";
    return kExitOk;
  }
  cli::CommandArgs args(argv + 2, argv + argc);
  for (const auto& c : kCommands) {
    if (c.name != name) continue;
    try {
      return c.run(args);
    } catch (const UsageError& e) {
      std::cerr << "strandline " << name << ": " << e.what() << "\n"
                << "(see `strandline " << name << " --help`)\n";
      return kExitBadInput;
    } catch (const InputError& e) {
      std::cerr << "strandline " << name << ": " << e.what() << "\n";
      return kExitBadInput;
    } catch (const ConfigError& e) {
      std::cerr << "strandline " << name << ": configuration " << e.what() << "\n";
      return kExitBadInput;
    } catch (const std::exception& e) {
      std::cerr << "strandline " << name << ": internal error: " << e.what() << "\n";
      return kExitInternal;
    }
  }
  std::vector<std::string> names;
  for (const auto& c : kCommands) names.emplace_back(c.name);
  std::cerr << "strandline: unknown subcommand \"" << name << "\"";
  if (auto near = cli::closest_name(std::string(name), names)) std::cerr << " (did you mean " << *near << "?)";
  std::cerr << "\n";
  print_usage(std::cerr);
  return kExitBadInput;
}
