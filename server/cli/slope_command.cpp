// `strandline slope`: the spectral beach-slope estimate of every transect
// (corrections/spectral/slope_search.h) written as slopes.json: slope, 95%
// interval, tidal band, energy curve, images used, verdict with reasons. The
// same engine as `correct --slope auto`: the pipeline runs with estimation on
// and the slope step's results are written; `correct --slopes slopes.json`
// reads them back.
#include <unistd.h>

#include <cstdio>
#include <iostream>

#include "corrections/core/errors.h"
#include "server/cli/batch_inputs.h"
#include "server/cli/commands.h"
#include "server/io/atomic_file.h"
#include "server/io/slopes_json.h"
#include "server/store/store.h"

namespace strandline::cli {

namespace {

const char* kUsage =
    "strandline slope --observations FILE --water-levels FILE --out slopes.json\n"
    "                        [--slope-range 0.01:0.2] [--config FILE] [options]";
const char* kDescription =
    "Estimates the beach-face slope of every transect from the data (the tide correction that leaves\n"
    "the least energy in the aliased tidal band; Vos et al. 2020) with a bootstrap 95% interval and a\n"
    "verdict. Transects listed in --slopes keep their listed slope. Slope-step parameters (band width,\n"
    "bootstrap count, seed, minimum images, ...) go in --config under /steps/slope.";

}  // namespace

int run_slope(const CommandArgs& argv) {
  Args args(kUsage, kDescription);
  add_batch_options(args, {false, true, false});
  args.add_value("out", "FILE", "slopes JSON (see the formats reference, \"Slopes JSON\")")
      .add_switch("quiet", "no progress on the terminal");
  if (!args.parse(argv)) return kExitOk;
  const std::string started = store::now_utc_text();
  const bool quiet = args.flag("quiet");
  const bool skip_invalid = args.flag("skip-invalid");
  const std::string out_path = args.require("out");
  if (auto slope = args.get("slope"); slope && *slope != "auto")
    throw UsageError("strandline slope estimates slopes: --slope VALUE belongs to `strandline correct`");
  // Estimation is what this command does: --slope auto is implied.
  BatchInputs batch = load_batch_inputs(args, {skip_invalid, true, false});
  const app::PreparedRun& run = *batch.run;

  SiteTable& table = batch.observations.table;
  const bool show_progress = !quiet && ::isatty(STDERR_FILENO);
  const ProgressFn progress = [&](std::size_t done, std::size_t total) {
    if (show_progress && (done == total || done % 50 == 0))
      std::fprintf(stderr, "\restimating slopes %zu/%zu", done, total);
  };
  const RunRecord record = run.run(table, progress);
  if (show_progress) std::fprintf(stderr, "\n");

  nlohmann::json doc = slopes_json(table, run.inputs().slopes);
  doc["provenance"] = run.provenance(record, table, {batch.observations.data_rows, batch.observations.rejected.size()},
                                     started, store::now_utc_text());
  doc["provenance"]["command"] = "slope";
  write_file_atomically(out_path, doc.dump(2) + "\n");
  if (!quiet) {
    std::size_t estimated = 0, not_identifiable = 0;
    for (const auto& t : table.transects) {
      estimated += t.slope_source == SlopeSource::estimated ? 1 : 0;
      not_identifiable += t.slope_identifiable ? 0 : 1;
    }
    std::cerr << "slopes of " << table.transects.size() << " transects: " << estimated << " estimated, "
              << not_identifiable << " not identifiable\nslopes: " << out_path << "\n";
  }
  return kExitOk;
}

}  // namespace strandline::cli
