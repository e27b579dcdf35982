// The cautions every summary output, the README and the dashboard carry.
#pragma once

#include <string>
#include <vector>

namespace strandline {

inline const std::vector<std::string>& standard_cautions() {
  static const std::vector<std::string> cautions = {
      "Satellite-derived shoreline positions must be validated against field surveys before use.",
      "Corrected positions assume a planar beach face, alongshore-uniform conditions and empirical wave "
      "parameterisations; their stated uncertainty is a model estimate, not a guarantee.",
      "These results are not a substitute for site investigation and are not for design decisions on their own.",
      "Defer to local coastal-management codes and to licensed professional practice.",
  };
  return cautions;
}

}  // namespace strandline
