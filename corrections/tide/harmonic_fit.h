// Harmonic analysis by least squares: levels at arbitrary (gappy, irregular)
// times are fitted with a mean (optionally a linear rate) and, per
// constituent, f(t) [a cos(V(t)+u(t)) + b sin(V(t)+u(t))] using the same
// astronomical arguments and nodal corrections as the prediction, so the
// result predicts unchanged. Constituents are admitted by the Rayleigh
// criterion in priority order: |speed_i - speed_j| * span >= R * 360 deg
// against every constituent already admitted, the mean (speed 0) included.
#pragma once

#include <string>
#include <vector>

#include "corrections/tide/constituent_set.h"

namespace strandline::tide {

struct HarmonicFitOptions {
  // Candidates in priority order (most important first); empty = the default list.
  std::vector<std::string> constituents;
  double rayleigh_factor = 1.0;  // R; 1 is the classical criterion
  bool fit_rate = false;         // also fit a linear rate of the mean level
  std::string datum = "MSL";
};

struct UnresolvedConstituent {
  std::string name;
  std::string conflicts_with;  // the admitted constituent (or "Z0") too close in speed
  double needed_days;          // record span that would separate them (infinite: same speed)
};

struct HarmonicFitResult {
  ConstituentSet constants;  // resolvable constituents with standard errors
  std::vector<UnresolvedConstituent> unresolved;
  std::size_t samples = 0;
  double span_days = 0.0;
};

// The default candidate list in priority order (roughly by equilibrium amplitude).
const std::vector<std::string>& default_fit_constituents();

// Throws InputError (with `source` as the file name) for fewer samples than
// unknowns, a record that resolves no constituent, an unknown name, or a design
// whose columns (scaled to unit norm) have a condition number of 100 or more
// (sampling or gaps alias constituents; a well-sampled record gives ~1.1);
// std::invalid_argument for unequal lengths.
HarmonicFitResult fit_harmonics(const std::vector<TimeS>& times_s, const std::vector<double>& levels_m,
                                const HarmonicFitOptions& options, const std::string& source);

}  // namespace strandline::tide
