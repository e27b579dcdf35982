// `strandline correct`: the batch correction. Reads the inputs, runs the
// pipeline over the compact table, writes the cleaned rows (re-streaming the
// input so extra columns are carried through), the rejected rows when asked,
// and the summary JSON with provenance. Every output is written atomically.
#include <unistd.h>

#include <algorithm>
#include <cstdio>
#include <filesystem>
#include <iostream>

#include "corrections/core/errors.h"
#include "corrections/core/time_utc.h"
#include "server/cli/batch_inputs.h"
#include "server/app/exports.h"
#include "server/cli/commands.h"
#include "server/io/atomic_file.h"
#include "server/io/cleaned_rows.h"
#include "server/store/store.h"
#include "server/geo/result_writer.h"

namespace strandline::cli {

namespace {

std::string default_rejected_path(const std::string& out) {
  std::filesystem::path p(out);
  return (p.parent_path() / (p.stem().string() + ".rejected.csv")).string();
}

const char* kUsage =
    "strandline correct --observations FILE --water-levels FILE (--slope VALUE | --slopes FILE | ...)\n"
    "                          --out cleaned.csv [--summary summary.json] [options]\n"
    "       strandline correct --check --observations FILE ... (validate only)";
const char* kDescription =
    "Corrects raw shoreline positions to the reference contour, runs the QC filters and writes one\n"
    "row per valid input row with flags and sigma_m.";

// --check: what was read, for a person to compare with what they meant to give.
void report_check(const SiteTable& table, std::size_t rejected_rows) {
  std::cout << "inputs valid: " << table.size() << " rows on " << table.transects.size() << " transects";
  if (rejected_rows) std::cout << " (" << rejected_rows << " invalid rows would be rejected)";
  if (table.size()) {
    const auto [first, last] = std::minmax_element(table.time_s.begin(), table.time_s.end());
    std::cout << "; times " << format_time_utc(*first) << " to " << format_time_utc(*last);
  }
  std::cout << "\nnothing run, nothing written (--check)\n";
}

}  // namespace

int run_correct(const CommandArgs& argv) {
  Args args(kUsage, kDescription);
  add_batch_options(args, {false, false, true});
  args.add_value("out", "FILE", "cleaned rows: CSV, or .gpkg/.geojson layers (needs --transects)")
      .add_value("transects", "FILE", "transect geometry (lines or points; see `strandline intersect --help`)")
      .add_value("summary", "FILE", "per-transect summary JSON with provenance")
      .add_value("rejected", "FILE", "with --skip-invalid: rejected rows with reasons (default: OUT stem + .rejected.csv)")
      .add_switch("check", "validate options, configuration and input files, report what was read\n"
                           "(rows, transects, time span) and stop: nothing is run or written")
      .add_switch("quiet", "no progress on the terminal");
  if (!args.parse(argv)) return kExitOk;
  const bool check_only = args.flag("check");
  const std::string started = store::now_utc_text();
  const bool skip_invalid = args.flag("skip-invalid");
  const bool quiet = args.flag("quiet");
  const std::string out_path = check_only ? args.get("out").value_or("") : args.require("out");
  const auto summary_path = args.get("summary");
  auto rejected_path = args.get("rejected");
  const auto transects_path = args.get("transects");
  const bool geodata_out = geo::geo_format_for(out_path).has_value();
  if (geodata_out && !transects_path) throw UsageError("--out " + out_path + ": GeoPackage/GeoJSON output needs --transects");
  if (rejected_path && !skip_invalid) throw UsageError("option --rejected goes with --skip-invalid");
  if (skip_invalid && !rejected_path) rejected_path = default_rejected_path(out_path);

  BatchInputs batch = load_batch_inputs(args, {skip_invalid, false, true});
  check_slope_coverage(batch);
  const app::PreparedRun& run = *batch.run;

  SiteTable& table = batch.observations.table;
  std::optional<geo::TransectSet> transects;
  if (transects_path) transects = app::attach_transect_geometry(*transects_path, table);
  if (check_only) {
    report_check(table, batch.observations.rejected.size());
    return kExitOk;
  }
  const bool show_progress = !quiet && ::isatty(STDERR_FILENO);
  const ProgressFn progress = [&](std::size_t done, std::size_t total) {
    if (show_progress && (done == total || done % 50 == 0))
      std::fprintf(stderr, "\rprocessing transects %zu/%zu", done, total);
  };
  const RunRecord record = run.run(table, progress);
  if (show_progress) std::fprintf(stderr, "\n");

  const nlohmann::json summary = run.summary(table);
  CleanedRowStream rows(batch.observations_path, batch.observations, table);
  if (geodata_out)
    app::write_cleaned_geodata(rows, *transects, summary, out_path, rejected_path ? *rejected_path : "");
  else
    write_cleaned_csv(rows, out_path, rejected_path ? *rejected_path : "");

  nlohmann::json provenance =
      run.provenance(record, table, {batch.observations.data_rows, batch.observations.rejected.size()}, started,
                     store::now_utc_text());
  if (summary_path) {
    nlohmann::json document = summary;
    document["provenance"] = provenance;
    document["provenance"]["command"] = "correct";
    write_file_atomically(*summary_path, document.dump(2) + "\n");
  }
  const app::CorrectionCounts counts = app::correction_counts(table);
  std::string uncorrected;
  for (const auto& [n, why] : {std::pair{counts.no_water_level, "no water level"}, std::pair{counts.no_slope, "no slope"},
                               std::pair{counts.other, "other"}})
    if (n > 0) uncorrected += (uncorrected.empty() ? "" : ", ") + std::to_string(n) + " " + why;
  if (!quiet) {
    std::cerr << "corrected " << counts.corrected << " of " << counts.rows << " rows on " << table.transects.size()
              << " transects (" << counts.accepted << " accepted";
    if (!uncorrected.empty()) std::cerr << "; uncorrected: " << uncorrected;
    if (skip_invalid) std::cerr << "; " << batch.observations.rejected.size() << " rejected input rows in " << *rejected_path;
    std::cerr << ")\ncleaned rows: " << out_path << "\n";
    if (summary_path) std::cerr << "summary: " << *summary_path << "\n";
    if (counts.coarse_gauge > 0)
      std::cerr << "warning: " << counts.coarse_gauge
                << " rows lie between gauge samples more than 1 h apart: their level sigma carries the interpolation "
                   "error (flag coarse_gauge; the provenance's water_levels.harmonic_guide says whether the record's "
                   "own tide guided the interpolation); a finer record is better\n";
    if (counts.slope_minimum_at_range_edge > 0)
      std::cerr << "hint: " << counts.slope_minimum_at_range_edge
                << " transect(s) have their slope minimum at an end of the search range: widen it with --slope-range "
                   "MIN:MAX rather than rely on the default slope\n";
  }
  // The outputs are written (every row with its flags), but a run that corrected nothing is not a success.
  if (counts.corrected == 0) {
    std::cerr << "strandline correct: no row was corrected (" << (uncorrected.empty() ? "no rows" : uncorrected)
              << "): check the water levels' time range and units and the slopes (exit " << kExitNothingCorrected
              << ")\n";
    return kExitNothingCorrected;
  }
  return kExitOk;
}

}  // namespace strandline::cli
