// Wave setup, swash and the 2% exceedance runup on natural beaches after
// Stockdon, Holman, Howd & Sallenger (2006, Coastal Engineering 53, 573-588),
// from the deep-water height H0, deep-water wavelength L0 and foreshore slope
// beta (tan beta). With q = sqrt(H0 L0):
//   setup            0.35 beta q                                (eq. 10)
//   incident swash   S_inc = 0.75 beta q                        (eq. 11)
//   infragravity     S_ig  = 0.06 q                             (eq. 12)
//   R2%              1.1 (0.35 beta q + q sqrt(0.563 beta^2 + 0.004) / 2)
//                                                               (eq. 19 as printed), xi0 >= 0.3
//   setup dissipative 0.016 q                                   (eq. 16), xi0 < 0.3
//   R2% dissipative  0.043 q                                    (eq. 18), xi0 < 0.3
//   Iribarren        xi0 = beta / sqrt(H0 / L0)
// Eq. 19 prints the swash with its squares rounded (0.563, 0.004), so its swash
// q sqrt(0.563 beta^2 + 0.004) is 1-4% above sqrt(S_inc^2 + S_ig^2) (0.5625,
// 0.0036): the printed form is what practitioners compute and check against, so
// it is the one used. Its reported skill for R2% over ten field experiments:
// bias -0.17 m, rms error 0.38 m. Equation numbers and constants recalled from
// memory; the rms and bias match the paper's abstract, which also states that on
// dissipative beaches setup and swash depend on H0 and L0 only. So on a
// dissipative beach (xi0 < 0.3) the setup is eq. 16's 0.016 q, as R2% is eq. 18's:
// `setup_m` is the regime's setup, `setup_general_m` the slope-proportional form
// eq. 19 is built on. (The dissipative swash, 0.046 q, eq. 17, enters nothing.)
// The regime depends on the slope, so the dissipative setup's horizontal term
// 0.016 q / beta is not slope-free: the slope search classifies images at its
// estimate and solves again until the classes stand (corrections/steps/slope_step).
//
// Header-only: the uncertainty step (qc/) needs the slope derivative too.
#pragma once

#include <cmath>
#include <limits>

namespace strandline {

inline constexpr double kStockdonSetupCoefficient = 0.35;
inline constexpr double kStockdonIncidentSwashCoefficient = 0.75;
inline constexpr double kStockdonInfragravitySwashCoefficient = 0.06;
inline constexpr double kStockdonRunupFactor = 1.1;
inline constexpr double kStockdonSwashSlopeSquared = 0.563;  // eq. 19 as printed
inline constexpr double kStockdonSwashConstant = 0.004;      // eq. 19 as printed
inline constexpr double kStockdonDissipativeRunupCoefficient = 0.043;
inline constexpr double kStockdonDissipativeSetupCoefficient = 0.016;
inline constexpr double kStockdonDissipativeIribarren = 0.3;  // below: dissipative form
inline constexpr double kStockdonRunupRmsError_m = 0.38;      // R2% rms error reported by the paper
inline constexpr double kStockdonRunupBias_m = -0.17;         // R2% bias reported by the paper (not removed)

struct StockdonTerms {
  double iribarren;          // xi0
  bool dissipative;          // xi0 < 0.3: R2% from the dissipative form
  double setup_general_m;    // vertical, 0.35 beta q (eq. 10, inside eq. 19)
  double setup_dissipative_m;  // vertical, 0.016 q (eq. 16)
  double setup_m;            // the setup the regime selects
  double incident_swash_m;   // S_inc (significant swash height, incident band)
  double infragravity_swash_m;  // S_ig
  double total_swash_m;      // q sqrt(0.563 beta^2 + 0.004), eq. 19's swash
  double runup_general_m;    // 1.1 (setup + total / 2), eq. 19
  double runup_dissipative_m;  // 0.043 sqrt(H0 L0)
  double runup_m;            // R2%: the form the regime selects
};

inline double iribarren_number(double h0_m, double l0_m, double slope) {
  if (!(h0_m > 0)) return std::numeric_limits<double>::infinity();
  return slope / std::sqrt(h0_m / l0_m);
}

// Every term for one sea state and slope (H0 >= 0, L0 > 0, slope > 0).
inline StockdonTerms stockdon_terms(double h0_m, double l0_m, double slope) {
  StockdonTerms t{};
  const double q = std::sqrt(h0_m * l0_m);
  t.iribarren = iribarren_number(h0_m, l0_m, slope);
  t.dissipative = t.iribarren < kStockdonDissipativeIribarren;
  t.setup_general_m = kStockdonSetupCoefficient * slope * q;
  t.setup_dissipative_m = kStockdonDissipativeSetupCoefficient * q;
  t.setup_m = t.dissipative ? t.setup_dissipative_m : t.setup_general_m;
  t.incident_swash_m = kStockdonIncidentSwashCoefficient * slope * q;
  t.infragravity_swash_m = kStockdonInfragravitySwashCoefficient * q;
  t.total_swash_m = q * std::sqrt(kStockdonSwashSlopeSquared * slope * slope + kStockdonSwashConstant);
  t.runup_general_m = kStockdonRunupFactor * (t.setup_general_m + 0.5 * t.total_swash_m);
  t.runup_dissipative_m = kStockdonDissipativeRunupCoefficient * q;
  t.runup_m = t.dissipative ? t.runup_dissipative_m : t.runup_general_m;
  return t;
}

// The general setup in horizontal terms, setup / tan(beta) = 0.35 sqrt(H0 L0):
// free of the slope, which keeps the slope search's closed form valid with `setup`
// on images that are not dissipative.
inline double setup_horizontal_m(double h0_m, double l0_m) {
  return kStockdonSetupCoefficient * std::sqrt(h0_m * l0_m);
}

// The level c with d(setup/beta)/d(beta) = -c / beta^2 (as for the runup below):
// 0 for the general setup (slope-free horizontally), the setup itself when dissipative.
inline double setup_slope_sensitivity_level_m(double h0_m, double l0_m, double slope) {
  const StockdonTerms t = stockdon_terms(h0_m, l0_m, slope);
  return t.dissipative ? t.setup_m : 0.0;
}

// The level c with d(R2%/beta)/d(beta) = -c / beta^2, so that the slope term of
// a point's uncertainty with `runup` is sigma_beta |eta - z_ref + c| / beta^2.
// General form: the setup part is slope-free in horizontal terms and the swash
// part q sqrt(a beta^2 + b) / 2 gives c = 0.55 b q^2 / (q sqrt(a beta^2 + b));
// dissipative form: c = R2%.
inline double runup_slope_sensitivity_level_m(double h0_m, double l0_m, double slope) {
  const StockdonTerms t = stockdon_terms(h0_m, l0_m, slope);
  if (t.dissipative) return t.runup_m;
  if (!(t.total_swash_m > 0)) return 0.0;
  return kStockdonRunupFactor * 0.5 * kStockdonSwashConstant * h0_m * l0_m / t.total_swash_m;
}

}  // namespace strandline
