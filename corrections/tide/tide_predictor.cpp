#include "corrections/tide/tide_predictor.h"

#include <cmath>
#include <numbers>
#include <stdexcept>

#include "corrections/tide/angle_units.h"

namespace strandline::tide {

TidePredictor::TidePredictor(const ConstituentSet& set) : set_(set) {
  for (const auto& c : set_.constituents) {
    const ConstituentDefinition* d = find_constituent(c.name);
    if (!d) throw std::invalid_argument("unknown tidal constituent \"" + c.name + "\"");
    terms_.push_back({d, c.amplitude_m, c.phase_deg});
  }
}

double TidePredictor::level_m(TimeS time_s) const {
  const AstronomicalArguments a = astronomical_arguments(time_s);
  const auto nodal = nodal_factors(node_angles(a));
  double level = set_.z0_m + set_.z0_rate_m_per_yr * (time_s - set_.z0_epoch_s) / kSecondsPerJulianYear;
  for (const Term& t : terms_) {
    const NodalFactor nf = constituent_nodal_factor(*t.definition, nodal);
    const double v = equilibrium_argument_deg(*t.definition, a);
    level += nf.f * t.amplitude_m * std::cos((v + nf.u_deg - t.phase_deg) * kRad);
  }
  return level;
}

std::vector<double> TidePredictor::levels_m(const std::vector<TimeS>& times_s) const {
  std::vector<double> out;
  out.reserve(times_s.size());
  for (TimeS t : times_s) out.push_back(level_m(t));
  return out;
}

double predict_tide_level_m(const ConstituentSet& set, TimeS time_s) {
  return TidePredictor(set).level_m(time_s);
}

}  // namespace strandline::tide
