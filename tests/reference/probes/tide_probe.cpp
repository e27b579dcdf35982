// Probe for the tide reference checks: reads {"names": [...], "times": [ISO...]}
// on stdin and writes, per time, {name: {"name" (ours), "f", "v_plus_u_deg",
// "speed_deg_per_h"}} (null for a name we do not know)
// from our astronomical arguments and Schureman nodal corrections.
#include <iostream>

#include <nlohmann/json.hpp>

#include "corrections/core/time_utc.h"
#include "corrections/tide/constituent_table.h"

int main() {
  using namespace strandline;
  using namespace strandline::tide;
  try {
    const nlohmann::json in = nlohmann::json::parse(std::cin);
    nlohmann::json out = nlohmann::json::array();
    for (const auto& t : in.at("times")) {
      const AstronomicalArguments a = astronomical_arguments(parse_time_utc(t.get<std::string>()));
      const NodeAngles nodes = node_angles(a);
      nlohmann::json row = nlohmann::json::object();
      for (const auto& n : in.at("names")) {
        const std::string name = n.get<std::string>();
        const ConstituentDefinition* d = find_constituent(name);
        if (!d) {
          row[name] = nullptr;
          continue;
        }
        const NodalFactor nf = constituent_nodal_factor(*d, nodes);
        row[name] = {{"name", std::string(d->name)},
                     {"f", nf.f},
                     {"v_plus_u_deg", equilibrium_argument_deg(*d, a) + nf.u_deg},
                     {"speed_deg_per_h", speed_deg_per_h(*d)}};
      }
      out.push_back(row);
    }
    std::cout << out.dump() << "\n";
  } catch (const std::exception& e) {
    std::cerr << "tide_probe: " << e.what() << "\n";
    return 2;
  }
  return 0;
}
