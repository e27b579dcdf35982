// Probe for check_sensor_offsets.py: the `sensor_offsets` step (mode `none`: it
// estimates, applies nothing) and the per-sensor noise report on hand-made points,
// the built-in sensor table.
// stdin:  {"transect": [...], "sensor": [...], "day": [...], "chainage_m": [...],
//          "bin_days": b, "min_bins": m, "reference_family": name}
// stdout: {"site": [OFFSET...], "transects": {"ID": [OFFSET...]},
//          "noise": [{"sensor", "measured_sigma_m", "n"}]}
//         OFFSET = {"family", "reference_family", "offset_m", "se_m", "dof", "ci95_m", "n_bins"}
#include <iostream>

#include <nlohmann/json.hpp>

#include "qc/sensor_offset_step.h"
#include "qc/summary.h"
#include "tests/unit/qc_series.h"

namespace {

nlohmann::json offset_json(const strandline::FamilyOffset& f) {
  const auto num = [](double v) { return std::isnan(v) ? nlohmann::json() : nlohmann::json(v); };
  return {{"family", f.family},
          {"reference_family", f.reference_family},
          {"offset_m", num(f.offset_m)},
          {"se_m", num(f.se_m)},
          {"dof", num(f.dof)},
          {"ci95_m", std::isnan(f.ci95_low_m) ? nlohmann::json() : nlohmann::json::array({f.ci95_low_m, f.ci95_high_m})},
          {"n_bins", f.n_bins}};
}

}  // namespace

int main() {
  using namespace strandline;
  try {
    const nlohmann::json in = nlohmann::json::parse(std::cin);
    std::vector<qc_test::Obs> obs;
    for (std::size_t k = 0; k < in.at("day").size(); ++k)
      obs.push_back({in.at("transect")[k].get<std::string>(), "img" + std::to_string(k),
                     in.at("sensor")[k].get<std::string>(), in.at("day")[k].get<double>(),
                     in.at("chainage_m")[k].get<double>()});
    SiteTable table = qc_test::make_table(obs);
    const SensorTable sensors = SensorTable::defaults();
    RunInputs inputs;
    inputs.sensors = &sensors;
    inputs.sensor_offset_mode = SensorOffsetMode::none;
    const nlohmann::json params = {{"bin_days", in.at("bin_days")},
                                   {"min_bins", in.at("min_bins")},
                                   {"reference_family", in.at("reference_family")}};
    qc_test::run_site_step(*SensorOffsetStep::make(params, "/steps/sensor_offsets"), table, inputs);
    nlohmann::json out = {{"site", nlohmann::json::array()}, {"transects", nlohmann::json::object()},
                          {"noise", nlohmann::json::array()}};
    for (const auto& f : table.sensor_offsets.estimates) out["site"].push_back(offset_json(f));
    for (const auto& t : table.transects) {
      out["transects"][t.id] = nlohmann::json::array();
      for (const auto& f : t.sensor_offsets) out["transects"][t.id].push_back(offset_json(f));
    }
    for (const auto& n : sensor_noise_report(table, inputs))
      out["noise"].push_back({{"sensor", n.sensor},
                              {"measured_sigma_m", std::isnan(n.measured_sigma_m) ? nlohmann::json()
                                                                                  : nlohmann::json(n.measured_sigma_m)},
                              {"n", n.n}});
    std::cout << out.dump() << "\n";
    return 0;
  } catch (const std::exception& e) {
    std::cerr << "sensor_offset_probe: " << e.what() << "\n";
    return 2;
  }
}
