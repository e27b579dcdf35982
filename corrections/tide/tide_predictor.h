// h(t) = Z0 + rate (t - epoch) + sum_j f_j(t) H_j cos(V_j(t) + u_j(t) - g_j),
// with V, f and u evaluated at each time (never frozen for a whole record).
#pragma once

#include <vector>

#include "corrections/tide/constituent_set.h"
#include "corrections/tide/constituent_table.h"

namespace strandline::tide {

class TidePredictor {
 public:
  // Throws std::invalid_argument for a name missing from the constituent table
  // (the file reader reports it with file and entry first).
  explicit TidePredictor(const ConstituentSet& set);

  double level_m(TimeS time_s) const;
  std::vector<double> levels_m(const std::vector<TimeS>& times_s) const;
  const ConstituentSet& constants() const { return set_; }

 private:
  struct Term {
    const ConstituentDefinition* definition;
    double amplitude_m;
    double phase_deg;
  };
  ConstituentSet set_;
  std::vector<Term> terms_;
};

// The astronomical tide of `set` at one time: the entry point for callers that
// need a handful of values (e.g. the demo generator). For many times build a
// TidePredictor once.
double predict_tide_level_m(const ConstituentSet& set, TimeS time_s);

}  // namespace strandline::tide
