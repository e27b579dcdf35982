#include "corrections/tide/constituent_table.h"

#include <cctype>
#include <cmath>
#include <cstdlib>
#include <stdexcept>

namespace strandline::tide {

namespace {

using R = NodalRule;

ConstituentDefinition fundamental(std::string_view name, std::array<int, 6> doodson, int quarter_cycles, R rule) {
  ConstituentDefinition c;
  c.name = name;
  c.doodson = doodson;
  c.phase_quarter_cycles = quarter_cycles;
  c.rule = rule;
  return c;
}

ConstituentDefinition compound(std::string_view name, std::vector<CompoundPart> parts) {
  ConstituentDefinition c;
  c.name = name;
  c.parts = std::move(parts);
  return c;
}

// Arguments as in Schureman (1958) Table 2 rewritten with tau = T + h - s; the
// names follow the usual upper-case spelling of the Greek letters.
std::vector<ConstituentDefinition> build_table() {
  return {
      // Long period
      fundamental("Sa", {0, 0, 1, 0, 0, 0}, 0, R::none),
      fundamental("Ssa", {0, 0, 2, 0, 0, 0}, 0, R::none),
      fundamental("Mm", {0, 1, 0, -1, 0, 0}, 0, R::mm),
      fundamental("MSf", {0, 2, -2, 0, 0, 0}, 0, R::none),  // Schureman's MSf: f, u of -M2 (set below)
      fundamental("Mf", {0, 2, 0, 0, 0, 0}, 0, R::mf),
      // Diurnal
      fundamental("2Q1", {1, -3, 0, 2, 0, 0}, 1, R::o1),
      fundamental("SIGMA1", {1, -3, 2, 0, 0, 0}, 1, R::o1),
      fundamental("Q1", {1, -2, 0, 1, 0, 0}, 1, R::o1),
      fundamental("RHO1", {1, -2, 2, -1, 0, 0}, 1, R::o1),
      fundamental("O1", {1, -1, 0, 0, 0, 0}, 1, R::o1),
      fundamental("CHI1", {1, 0, 2, -1, 0, 0}, -1, R::j1),
      fundamental("PI1", {1, 1, -3, 0, 0, 1}, 1, R::none),
      fundamental("P1", {1, 1, -2, 0, 0, 0}, 1, R::none),
      fundamental("S1", {1, 1, -1, 0, 0, 0}, 0, R::none),
      fundamental("K1", {1, 1, 0, 0, 0, 0}, -1, R::k1),
      fundamental("PSI1", {1, 1, 1, 0, 0, -1}, -1, R::none),
      fundamental("PHI1", {1, 1, 2, 0, 0, 0}, -1, R::none),
      fundamental("THETA1", {1, 2, -2, 1, 0, 0}, -1, R::j1),
      fundamental("J1", {1, 2, 0, -1, 0, 0}, -1, R::j1),
      fundamental("OO1", {1, 3, 0, 0, 0, 0}, -1, R::oo1),
      // Semidiurnal
      fundamental("2N2", {2, -2, 0, 2, 0, 0}, 0, R::m2),
      fundamental("MU2", {2, -2, 2, 0, 0, 0}, 0, R::m2),
      fundamental("N2", {2, -1, 0, 1, 0, 0}, 0, R::m2),
      fundamental("NU2", {2, -1, 2, -1, 0, 0}, 0, R::m2),
      fundamental("M2", {2, 0, 0, 0, 0, 0}, 0, R::m2),
      fundamental("LAMBDA2", {2, 1, -2, 1, 0, 0}, 2, R::m2),
      fundamental("L2", {2, 1, 0, -1, 0, 0}, 2, R::l2),
      fundamental("T2", {2, 2, -3, 0, 0, 1}, 0, R::none),
      fundamental("S2", {2, 2, -2, 0, 0, 0}, 0, R::none),
      fundamental("R2", {2, 2, -1, 0, 0, -1}, 2, R::none),
      fundamental("K2", {2, 2, 0, 0, 0, 0}, 0, R::k2),
      compound("2SM2", {{"S2", 2}, {"M2", -1}}),
      // Terdiurnal
      compound("MO3", {{"M2", 1}, {"O1", 1}}),
      compound("2MK3", {{"M2", 2}, {"K1", -1}}),
      fundamental("M3", {3, 0, 0, 0, 0, 0}, 0, R::m3),
      compound("SO3", {{"S2", 1}, {"O1", 1}}),
      compound("MK3", {{"M2", 1}, {"K1", 1}}),
      compound("SK3", {{"S2", 1}, {"K1", 1}}),
      // Quarter-diurnal and higher
      compound("MN4", {{"M2", 1}, {"N2", 1}}),
      compound("M4", {{"M2", 2}}),
      compound("SN4", {{"S2", 1}, {"N2", 1}}),
      compound("MS4", {{"M2", 1}, {"S2", 1}}),
      compound("MK4", {{"M2", 1}, {"K2", 1}}),
      compound("S4", {{"S2", 2}}),
      compound("2MN6", {{"M2", 2}, {"N2", 1}}),
      compound("M6", {{"M2", 3}}),
      compound("2MS6", {{"M2", 2}, {"S2", 1}}),
      compound("2SM6", {{"S2", 2}, {"M2", 1}}),
      compound("S6", {{"S2", 3}}),
      compound("M8", {{"M2", 4}}),
  };
}

}  // namespace

const std::vector<ConstituentDefinition>& constituent_table() {
  static const std::vector<ConstituentDefinition> table = [] {
    auto t = build_table();
    auto parent_of = [&t](const ConstituentDefinition& c, const CompoundPart& part) -> const ConstituentDefinition& {
      for (const auto& p : t)
        if (p.name == part.parent && !p.compound()) return p;
      throw std::logic_error("constituent table: bad parent of " + std::string(c.name));
    };
    for (auto& c : t) {
      if (!c.compound()) {
        c.argument_doodson = c.doodson;
        c.argument_quarter_cycles = c.phase_quarter_cycles;
        // MSf (= S2 - M2 in its nodal behaviour, Schureman): f of M2, u = -u(M2).
        if (c.name == "MSf") c.nodal_terms = {{NodalRule::m2, -1}};
        else if (c.rule != NodalRule::none) c.nodal_terms = {{c.rule, 1}};
        continue;
      }
      for (const auto& part : c.parts) {
        const ConstituentDefinition& parent = parent_of(c, part);
        for (std::size_t k = 0; k < 6; ++k) c.argument_doodson[k] += part.multiple * parent.doodson[k];
        c.argument_quarter_cycles += part.multiple * parent.phase_quarter_cycles;
        if (parent.rule != NodalRule::none) c.nodal_terms.push_back({parent.rule, part.multiple});
      }
    }
    return t;
  }();
  return table;
}

const ConstituentDefinition* find_constituent(std::string_view name) {
  // Case-insensitive: gauge agencies write "SA", "Sa" or "sa" alike, and no two
  // of our names differ only in case.
  auto same = [](std::string_view x, std::string_view y) {
    if (x.size() != y.size()) return false;
    for (std::size_t i = 0; i < x.size(); ++i)
      if (std::tolower(static_cast<unsigned char>(x[i])) != std::tolower(static_cast<unsigned char>(y[i])))
        return false;
    return true;
  };
  for (const auto& c : constituent_table())
    if (same(c.name, name)) return &c;
  return nullptr;
}

ResolvedArgument resolved_argument(const ConstituentDefinition& c) {
  return {c.argument_doodson, c.argument_quarter_cycles};
}

double speed_deg_per_h(const ConstituentDefinition& c) {
  const auto& d = c.argument_doodson;
  const AstronomicalRates& w = astronomical_rates();
  return d[0] * w.tau_deg_per_h + d[1] * w.s_deg_per_h + d[2] * w.h_deg_per_h + d[3] * w.p_deg_per_h -
         d[4] * w.n_deg_per_h + d[5] * w.p1_deg_per_h;
}

double equilibrium_argument_deg(const ConstituentDefinition& c, const AstronomicalArguments& a) {
  const auto& d = c.argument_doodson;
  const double v = d[0] * a.tau_deg + d[1] * a.s_deg + d[2] * a.h_deg + d[3] * a.p_deg - d[4] * a.n_deg +
                   d[5] * a.p1_deg + 90.0 * c.argument_quarter_cycles;
  return wrap_deg_360(v);
}

NodalFactor constituent_nodal_factor(const ConstituentDefinition& c,
                                     const std::array<NodalFactor, kNodalRuleCount>& by_rule) {
  NodalFactor out;
  for (const auto& [rule, multiple] : c.nodal_terms) {
    const NodalFactor& p = by_rule[static_cast<std::size_t>(rule)];
    for (int k = std::abs(multiple); k > 0; --k) out.f *= p.f;
    out.u_deg += multiple * p.u_deg;
  }
  return out;
}

NodalFactor constituent_nodal_factor(const ConstituentDefinition& c, const NodeAngles& angles) {
  return constituent_nodal_factor(c, nodal_factors(angles));
}

std::string known_constituent_names() {
  std::string names;
  for (const auto& c : constituent_table()) {
    if (!names.empty()) names += ", ";
    names += c.name;
  }
  return names;
}

}  // namespace strandline::tide
