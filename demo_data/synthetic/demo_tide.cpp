#include "demo_data/synthetic/demo_tide.h"

#include <memory>
#include <tuple>
#include <vector>

#include "corrections/tide/tide_predictor.h"

namespace strandline::synthetic {

tide::ConstituentSet demo_tide_constituents() {
  tide::ConstituentSet set;
  set.datum = "MSL";
  set.z0_m = 0.0;
  set.z0_rate_m_per_yr = 0.003;
  for (const auto& [name, amplitude_m, phase_deg] :
       std::vector<std::tuple<const char*, double, double>>{{"M2", 0.62, 40.0}, {"S2", 0.22, 75.0}, {"N2", 0.12, 20.0},
                                                            {"K2", 0.06, 72.0}, {"K1", 0.18, 200.0}, {"O1", 0.13, 180.0},
                                                            {"P1", 0.06, 198.0}, {"Q1", 0.025, 165.0}, {"M4", 0.02, 110.0},
                                                            {"Sa", 0.05, 250.0}})
    set.constituents.push_back({name, amplitude_m, phase_deg});
  return set;
}

SiteParams demo_site_params() {
  SiteParams params = SiteParams::defaults();
  auto predictor = std::make_shared<tide::TidePredictor>(demo_tide_constituents());
  params.tide_function = [predictor](TimeS t) { return predictor->level_m(t); };
  return params;
}

}  // namespace strandline::synthetic
