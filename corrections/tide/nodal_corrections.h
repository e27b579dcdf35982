// Nodal modulation of the lunar constituents after Schureman (1958, SP 98):
// the node-dependent angles I, xi, nu, nu', 2nu'' (his eqs. 191-197, 224, 232)
// and the factors f and phase corrections u of the fundamental lunar terms
// (eqs. 73-78, 149, 215, 227, 235). Compound tides take theirs from their
// parents (see constituent_table.h).
#pragma once

#include <array>
#include <cstddef>

#include "corrections/tide/astronomy.h"

namespace strandline::tide {

// How a constituent's f and u are obtained (Schureman's formula families).
enum class NodalRule {
  none,  // solar or with negligible nodal modulation: f = 1, u = 0
  mm,    // Mm: f eq. 73, u = 0
  mf,    // Mf: f eq. 74, u = -2 xi
  o1,    // O1, Q1, 2Q1, rho1, sigma1: f eq. 75, u = 2 xi - nu
  j1,    // J1, chi1, theta1: f eq. 76, u = -nu
  oo1,   // OO1: f eq. 77, u = -2 xi - nu
  m2,    // M2, N2, 2N2, mu2, nu2, lambda2: f eq. 78, u = 2 xi - 2 nu
  k1,    // K1: f eq. 227, u = -nu'
  k2,    // K2: f eq. 235, u = -2 nu''
  l2,    // L2: f eq. 215 (f_M2 / Ra), u = 2 xi - 2 nu - R
  m3,    // M3: f = f_M2^(3/2) (eq. 149), u = 3 xi - 3 nu
};
inline constexpr std::size_t kNodalRuleCount = 11;

struct NodeAngles {
  double i_deg;      // I: inclination of the lunar orbit to the equator
  double xi_deg;     // xi
  double nu_deg;     // nu
  double nu1_deg;    // nu'
  double two_nu2_deg;  // 2 nu''
  double p_minus_xi_deg;  // Schureman's P = p - xi (for L2)
  double obliquity_deg;
};

// From N, p and the obliquity of the given arguments.
NodeAngles node_angles(const AstronomicalArguments& a);

struct NodalFactor {
  double f = 1.0;
  double u_deg = 0.0;
};

NodalFactor nodal_factor(NodalRule rule, const NodeAngles& angles);

// Every rule at once (indexed by the enum value): one evaluation per time
// serves all constituents.
std::array<NodalFactor, kNodalRuleCount> nodal_factors(const NodeAngles& angles);

}  // namespace strandline::tide
