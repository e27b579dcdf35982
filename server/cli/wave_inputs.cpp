#include "server/cli/wave_inputs.h"

#include "corrections/core/errors.h"
#include "corrections/steps/wave_terms_step.h"
#include "server/io/wave_csv.h"

namespace strandline::cli {

std::string wave_options_help() {
  return "  --waves FILE               wave record CSV (time,hs_m,tp_s,dir_deg[,depth_m]); Hs deshoaled to deep\n"
         "                             water when depth_m is given\n"
         "  --wave-correction MODE     none | setup | runup (Stockdon et al. 2006; default setup with --waves)\n";
}

void load_wave_inputs(Args& args, BatchInputs& batch) {
  const auto path = args.get("waves");
  const auto mode = args.get("wave-correction");
  if (!path) {
    if (mode) throw UsageError("option --wave-correction needs --waves FILE");
    return;
  }
  WaveCorrection correction = WaveCorrection::setup;
  if (mode) {
    auto parsed = wave_correction_from_name(*mode);
    if (!parsed) throw UsageError("option --wave-correction \"" + *mode + "\": expected none, setup or runup");
    correction = *parsed;
  }
  batch.wave_sources.push_back(std::make_unique<WaveRecord>(read_wave_csv_file(*path)));
  batch.inputs.waves = batch.wave_sources.back().get();
  batch.inputs.wave_correction = correction;
  batch.record_file("waves", *path);
  batch.parameters["wave_correction"] = std::string(wave_correction_name(correction));
}

}  // namespace strandline::cli
