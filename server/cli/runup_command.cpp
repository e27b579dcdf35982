// `strandline runup`: the wave calculator on its own. From Hs, Tp, the beach-face
// slope and optionally the depth of the record, prints as JSON the deep-water
// sea state (linear theory), the Iribarren number and regime, and the Stockdon
// et al. (2006) setup, swash and R2%.
#include <cmath>
#include <iostream>

#include <nlohmann/json.hpp>

#include "corrections/core/errors.h"
#include "corrections/core/site_table.h"
#include "corrections/waves/linear_waves.h"
#include "corrections/waves/stockdon.h"
#include "server/cli/args.h"
#include "server/cli/commands.h"

namespace strandline::cli {

namespace {

double checked(const Args& args, const std::string& name, double low, double high, bool low_open) {
  const double v = *args.number(name);
  if ((low_open ? !(v > low) : !(v >= low)) || !(v <= high))
    throw UsageError("option --" + name + " " + std::to_string(v) + ": expected " + (low_open ? "(" : "[") +
                     std::to_string(low) + ", " + std::to_string(high) + "]");
  return v;
}

}  // namespace

int run_runup(const CommandArgs& argv) {
  Args args("strandline runup --hs METRES --tp SECONDS --slope TAN_BETA [--depth METRES]", "");
  args.add_value("hs", "METRES", "significant wave height of the record (0 to 30 m)")
      .add_value("tp", "SECONDS", "peak period (1 to 40 s)")
      .add_value("slope", "TAN_BETA", "beach-face slope tan(beta) (0 < slope <= 1)")
      .add_value("depth", "METRES", "depth of a nearshore record (m); absent: Hs is already a deep-water value")
      .add_epilogue(
          "Prints JSON: H0 (deshoaled with linear theory, no refraction), L0 = g Tp^2 / 2pi,\n"
          "the Iribarren number, the regime (dissipative below 0.3), and the Stockdon et al.\n"
          "(2006) setup, incident and infragravity swash, total swash and R2%, all in metres\n"
          "above the still water level. R2% carries the paper's reported rms error of 0.38 m.\n");
  if (!args.parse(argv)) return kExitOk;
  args.require("hs");
  args.require("tp");
  args.require("slope");
  const double hs = checked(args, "hs", 0.0, 30.0, false);
  const double tp = checked(args, "tp", 1.0, 40.0, false);
  const double slope = checked(args, "slope", 0.0, 1.0, true);
  const bool nearshore = args.has("depth");
  const double depth = nearshore ? checked(args, "depth", 0.0, 11000.0, true) : kUnknown;

  const LinearWave at_record = linear_wave(tp, depth);
  const double h0 = deshoal_to_deep_water(hs, tp, depth);
  const double l0 = deep_water_wavelength_m(tp);
  const StockdonTerms s = stockdon_terms(h0, l0, slope);

  nlohmann::json out = {
      {"inputs", {{"hs_m", hs}, {"tp_s", tp}, {"slope", slope}, {"depth_m", nearshore ? nlohmann::json(depth) : nullptr}}},
      {"h0_m", h0},
      {"l0_m", l0},
      {"shoaling_coefficient", at_record.shoaling_coefficient},
      {"wavelength_at_record_m", at_record.wavelength_m},
      {"group_velocity_at_record_m_s", at_record.group_velocity_m_s},
      {"depth_limited_record", nearshore && hs > 0.78 * depth},
      {"iribarren", std::isinf(s.iribarren) ? nlohmann::json(nullptr) : nlohmann::json(s.iribarren)},
      {"regime", s.dissipative ? "dissipative" : "intermediate_reflective"},
      {"setup_m", s.setup_m},
      {"setup_general_m", s.setup_general_m},
      {"setup_dissipative_m", s.setup_dissipative_m},
      {"incident_swash_m", s.incident_swash_m},
      {"infragravity_swash_m", s.infragravity_swash_m},
      {"total_swash_m", s.total_swash_m},
      {"r2_general_m", s.runup_general_m},
      {"r2_dissipative_m", s.runup_dissipative_m},
      {"r2_m", s.runup_m},
      {"r2_rms_error_m", kStockdonRunupRmsError_m},
      {"r2_bias_m", kStockdonRunupBias_m},
      {"setup_horizontal_m", s.setup_m / slope},
      {"r2_horizontal_m", s.runup_m / slope},
      {"method",
       "linear-theory deshoaling (Fenton & McKee 1990 start, Newton), no refraction; Stockdon et al. 2006"},
  };
  std::cout << out.dump(2) << "\n";
  // Said where a person reads it too, not only inside the JSON.
  if (nearshore && hs > 0.78 * depth)
    std::cerr << "warning: Hs " << hs << " m exceeds 0.78 x depth " << depth
              << " m: the record is in the surf zone, where linear deshoaling does not hold "
                 "(depth_limited_record)\n";
  return kExitOk;
}

}  // namespace strandline::cli
