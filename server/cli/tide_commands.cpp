// `strandline tide-predict` and `strandline tide-fit`: the harmonic tide on its
// own. Prediction writes `time,level_m` CSV from a constituent file; the fit
// reads a gauge record (`time,level_m`) and writes a constituent file with
// standard errors, the Rayleigh selection and the residual standard deviation.
#include <cmath>
#include <cstdio>
#include <fstream>
#include <iostream>
#include <sstream>

#include "corrections/core/errors.h"
#include "corrections/tide/constituent_file.h"
#include "corrections/tide/harmonic_fit.h"
#include "corrections/tide/tide_predictor.h"
#include "server/cli/args.h"
#include "server/cli/commands.h"
#include "server/io/water_level_csv.h"

namespace strandline::cli {

namespace {

// A date alone is accepted here (midnight UTC); the engine's parser stays strict.
TimeS time_option(const Args& args, const std::string& name) {
  const std::string text = args.require(name);
  try {
    return parse_time_utc(expand_date_only(text));
  } catch (const FieldError& e) {
    throw UsageError("option --" + name + " \"" + text + "\": " + e.what());
  }
}

std::vector<std::string> split_names(const std::string& list) {
  std::vector<std::string> names;
  std::stringstream in(list);
  std::string item;
  while (std::getline(in, item, ',')) {
    const auto b = item.find_first_not_of(" \t");
    const auto e = item.find_last_not_of(" \t");
    if (b == std::string::npos) throw UsageError("option --constituents: empty name in \"" + list + "\"");
    names.push_back(item.substr(b, e - b + 1));
  }
  if (names.empty()) throw UsageError("option --constituents: no names given");
  return names;
}

void write_levels(std::ostream& out, const tide::TidePredictor& predictor, TimeS from, TimeS to, double step_s) {
  out << "time,level_m\n";
  char buffer[32];
  // Times from an integer count keep the spacing exact over long spans.
  for (long long k = 0;; ++k) {
    const TimeS t = from + static_cast<double>(k) * step_s;
    if (t > to + 1e-6) break;
    std::snprintf(buffer, sizeof buffer, "%.4f", predictor.level_m(t));
    out << format_time_utc(t) << ',' << buffer << '\n';
  }
}

}  // namespace

int run_tide_predict(const CommandArgs& argv) {
  Args args("strandline tide-predict --constituents FILE --from TIME --to TIME [--step-s SECONDS] [--out FILE]", "");
  args.add_value("constituents", "FILE", "constituent file (JSON; see FORMATS.md, \"Tide constituents\")")
      .add_value("from", "TIME",
                 "UTC time with zone, e.g. 2020-01-01T00:00Z, or a date (2020-01-01 =\n"
                 "midnight UTC); --from and --to are both included when on the step")
      .add_value("to", "TIME", "end, as --from")
      .add_value("step-s", "SECONDS", "spacing in seconds (default 600)")
      .add_value("out", "FILE", "output CSV (default: standard output)")
      .add_epilogue(
          "Writes `time,level_m`: the astronomical tide on the file's datum, with nodal\n"
          "corrections (Schureman 1958) evaluated at every time. Surge, river flow and\n"
          "datum offsets are not included.\n");
  if (!args.parse(argv)) return kExitOk;
  const std::string path = args.require("constituents");
  const TimeS from = time_option(args, "from");
  const TimeS to = time_option(args, "to");
  const double step_s = args.number_or("step-s", 600.0);
  const auto out_path = args.get("out");
  if (!(step_s > 0) || !std::isfinite(step_s)) throw UsageError("option --step-s: must be a positive number of seconds");
  if (to < from) throw UsageError("option --to is earlier than --from");
  if ((to - from) / step_s > 5e7) throw UsageError("more than 50 million output rows: use a larger --step-s");

  const tide::TidePredictor predictor(tide::read_constituent_file(path));
  if (!out_path) {
    write_levels(std::cout, predictor, from, to, step_s);
    std::cout.flush();
    return std::cout ? kExitOk : kExitInternal;
  }
  std::ofstream out(*out_path);
  if (!out) throw InputError(*out_path + ": cannot open for writing");
  write_levels(out, predictor, from, to, step_s);
  out.close();
  if (!out) throw InputError(*out_path + ": write failed");
  return kExitOk;
}

int run_tide_fit(const CommandArgs& argv) {
  Args args("strandline tide-fit --water-levels FILE --out FILE [--constituents M2,S2,...]\n"
            "                           [--rayleigh R] [--fit-rate] [--datum NAME]", "");
  args.add_value("water-levels", "FILE", "gauge record CSV `time,level_m` (gaps and irregular spacing allowed)")
      .add_value("out", "FILE", "constituent file to write (JSON)")
      .add_value("constituents", "M2,S2,...", "candidates in priority order (default: 48 constituents, M2 first)")
      .add_value("rayleigh", "R",
                 "Rayleigh factor R (default 1): a candidate is fitted only when its\n"
                 "speed differs from every constituent already admitted (and from\n"
                 "the mean) by at least R cycles over the record span")
      .add_switch("fit-rate", "also fit a linear rate of the mean level (needs years of record)")
      .add_value("datum", "NAME", "datum name written to the file (default MSL)")
      .add_epilogue(
          "Least squares with the same nodal corrections as tide-predict. Writes per\n"
          "constituent amplitude and phase with standard errors (white-noise residuals\n"
          "assumed: optimistic when residuals are correlated), the constituents the\n"
          "record cannot resolve, and the residual standard deviation, which becomes the\n"
          "1-sigma of predicted water levels in `correct`. A summary goes to stderr.\n");
  if (!args.parse(argv)) return kExitOk;
  const std::string gauge_path = args.require("water-levels");
  const std::string out_path = args.require("out");
  tide::HarmonicFitOptions options;
  if (auto list = args.get("constituents")) options.constituents = split_names(*list);
  options.rayleigh_factor = args.number_or("rayleigh", 1.0);
  options.fit_rate = args.flag("fit-rate");
  if (auto datum = args.get("datum")) options.datum = *datum;
  if (!(options.rayleigh_factor > 0) || options.rayleigh_factor > 10)
    throw UsageError("option --rayleigh: expected a factor in (0, 10]");

  const GaugeSeries gauge = read_water_levels_file(gauge_path, kUnknown);
  const tide::HarmonicFitResult fit = tide::fit_harmonics(gauge.times(), gauge.levels(), options, gauge_path);
  tide::write_constituent_file(fit.constants, out_path);

  std::fprintf(stderr, "%s: %zu samples over %.1f days; %zu constituents fitted, %zu not resolvable; residual std %.2f mm\n",
               gauge_path.c_str(), fit.samples, fit.span_days, fit.constants.constituents.size(), fit.unresolved.size(),
               fit.constants.residual_std_m * 1000.0);
  for (const auto& u : fit.unresolved) {
    if (std::isfinite(u.needed_days))
      std::fprintf(stderr, "  %s not resolvable from %s (needs %.1f days)\n", u.name.c_str(), u.conflicts_with.c_str(),
                   u.needed_days);
    else
      std::fprintf(stderr, "  %s has the speed of %s: never separable\n", u.name.c_str(), u.conflicts_with.c_str());
  }
  return kExitOk;
}

}  // namespace strandline::cli
