// The tidal constituents we know: Doodson numbers (coefficients of tau, s, h,
// p, N' = -N, p1) with Schureman's phase offsets (multiples of 90 deg), the
// nodal rule of each fundamental, and compound (shallow-water) tides defined
// from their parents, whose argument, f and u they inherit
// (V = sum k V_k, f = prod f_k^|k|, u = sum k u_k).
#pragma once

#include <array>
#include <optional>
#include <utility>
#include <string>
#include <string_view>
#include <vector>

#include "corrections/tide/astronomy.h"
#include "corrections/tide/nodal_corrections.h"

namespace strandline::tide {

struct CompoundPart {
  std::string_view parent;
  int multiple;  // e.g. 2MK3 = 2 M2 - 1 K1
};

struct ConstituentDefinition {
  std::string_view name;
  // Fundamental: Doodson coefficients and phase offset; compound: empty parts.
  std::array<int, 6> doodson{};  // tau, s, h, p, N', p1
  int phase_quarter_cycles = 0;  // phase offset in units of 90 deg
  NodalRule rule = NodalRule::none;
  std::vector<CompoundPart> parts;  // non-empty for a compound tide

  // Filled once when the table is built: the effective argument (compound tides
  // summed from their parents) and f = prod f_rule^|k|, u = sum k u_rule.
  std::array<int, 6> argument_doodson{};
  int argument_quarter_cycles = 0;
  std::vector<std::pair<NodalRule, int>> nodal_terms;

  bool compound() const { return !parts.empty(); }
};

// All definitions, in order of increasing speed within each species.
const std::vector<ConstituentDefinition>& constituent_table();

// Lookup by name, ignoring case (e.g. "M2", "2MK3", "nu2"); nothing when unknown.
const ConstituentDefinition* find_constituent(std::string_view name);

// Effective Doodson coefficients and phase offset (compound tides summed from parents).
struct ResolvedArgument {
  std::array<int, 6> doodson{};
  int phase_quarter_cycles = 0;
};
ResolvedArgument resolved_argument(const ConstituentDefinition& c);

// Speed in degrees per mean solar hour from the astronomical rates.
double speed_deg_per_h(const ConstituentDefinition& c);

// Equilibrium argument V (degrees, [0, 360)) at the given astronomical arguments.
double equilibrium_argument_deg(const ConstituentDefinition& c, const AstronomicalArguments& a);

// Nodal factor and phase correction (compound tides from their parents).
NodalFactor constituent_nodal_factor(const ConstituentDefinition& c, const NodeAngles& angles);
// The same from the factors of every rule at one time (see nodal_factors()).
NodalFactor constituent_nodal_factor(const ConstituentDefinition& c,
                                     const std::array<NodalFactor, kNodalRuleCount>& by_rule);

// Comma-separated list of all names, for messages.
std::string known_constituent_names();

}  // namespace strandline::tide
