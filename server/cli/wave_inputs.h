// The wave options of batch commands:
//   --waves FILE                       waves.csv (time,hs_m,tp_s,dir_deg[,depth_m])
//   --wave-correction none|setup|runup the term entering the correction (default
//                                      setup when waves are given)
#pragma once

#include <string>

#include "server/cli/args.h"
#include "server/cli/batch_inputs.h"

namespace strandline::cli {

// Reads the options from `args` (marking them used), loads the wave record into
// `batch.wave_sources` and sets `batch.inputs.waves` / `wave_correction`.
void load_wave_inputs(Args& args, BatchInputs& batch);

// The option lines, for --help.
std::string wave_options_help();

}  // namespace strandline::cli
