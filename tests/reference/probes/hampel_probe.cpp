// Probe for check_hampel.py: the `hampel` QC step on one transect of one sensor.
// stdin:  {"day": [...], "chainage_m": [...], "half_window_days": h, "min_points": n,
//          "k": k, "min_threshold_m": m}
// stdout: {"flagged": [true|false, ...]}   (input order)
#include <iostream>

#include <nlohmann/json.hpp>

#include "qc/hampel_step.h"
#include "tests/unit/qc_series.h"

int main() {
  using namespace strandline;
  try {
    const nlohmann::json in = nlohmann::json::parse(std::cin);
    std::vector<qc_test::Obs> obs;
    const auto& day = in.at("day");
    const auto& value = in.at("chainage_m");
    for (std::size_t k = 0; k < day.size(); ++k)
      obs.push_back({"T1", "img" + std::to_string(k), "landsat8", day[k].get<double>(), value[k].get<double>()});
    SiteTable table = qc_test::make_table(obs);
    const nlohmann::json params = {{"half_window_days", in.at("half_window_days")},
                                   {"min_points", in.at("min_points")},
                                   {"k", in.at("k")},
                                   {"min_threshold_m", in.at("min_threshold_m")}};
    qc_test::run_transect_step(*HampelStep::make(params, "/steps/hampel"), table, RunInputs{});
    nlohmann::json flagged = nlohmann::json::array();
    for (std::size_t k = 0; k < obs.size(); ++k)
      flagged.push_back(has_flag(table.flags[qc_test::row_of(table, k)], Flag::hampel_outlier));
    std::cout << nlohmann::json{{"flagged", flagged}}.dump() << "\n";
    return 0;
  } catch (const std::exception& e) {
    std::cerr << "hampel_probe: " << e.what() << "\n";
    return 2;
  }
}
