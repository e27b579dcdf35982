// Probe for check_dispersion.py: linear wave theory for a list of cases.
// stdin:  {"cases": [{"period_s": 10, "depth_m": 5}, {"period_s": 8, "depth_m": null}, ...]}
// stdout: {"results": [{"k_rad_m", "wavelength_m", "celerity_m_s", "group_velocity_m_s",
//                       "shoaling_coefficient", "h0_per_h"}, ...]}   (depth null = deep water)
#include <iostream>

#include <nlohmann/json.hpp>

#include "corrections/waves/linear_waves.h"

int main() {
  using namespace strandline;
  try {
    const nlohmann::json in = nlohmann::json::parse(std::cin);
    nlohmann::json results = nlohmann::json::array();
    for (const auto& c : in.at("cases")) {
      const double period = c.at("period_s").get<double>();
      const double depth = c.at("depth_m").is_null() ? std::numeric_limits<double>::quiet_NaN()
                                                     : c.at("depth_m").get<double>();
      const LinearWave w = linear_wave(period, depth);
      results.push_back({{"k_rad_m", w.k_rad_m},
                         {"wavelength_m", w.wavelength_m},
                         {"celerity_m_s", w.celerity_m_s},
                         {"group_velocity_m_s", w.group_velocity_m_s},
                         {"shoaling_coefficient", w.shoaling_coefficient},
                         {"h0_per_h", deshoal_to_deep_water(1.0, period, depth)}});
    }
    std::cout << nlohmann::json{{"results", results}}.dump() << "\n";
    return 0;
  } catch (const std::exception& e) {
    std::cerr << "linear_wave_probe: " << e.what() << "\n";
    return 2;
  }
}
