// Probe for check_lomb_scargle.py: our periodograms and the band-energy quadratic
// on series given by the caller.
// stdin:  {"times": [...], "x": [...], "w": [...],                 (days, any units)
//          "grid": {"omega0": w0, "d_omega": dw, "count": n},      (rad/day, uniform)
//          "band": {"omegas": [...], "weights": [...]}}
// stdout: {"direct_x", "fast_x", "direct_w", "fast_w", "direct_cross", "fast_cross": [...],
//          "quadratic": {"a", "b", "c"}}      (E(s) of x + s w, linear detrending)
#include <iostream>

#include <nlohmann/json.hpp>

#include "corrections/spectral/band_energy.h"
#include "corrections/spectral/fast_lomb_scargle.h"
#include "corrections/spectral/lomb_scargle.h"

int main() {
  using namespace strandline::spectral;
  try {
    const nlohmann::json in = nlohmann::json::parse(std::cin);
    const auto t = in.at("times").get<std::vector<double>>();
    const auto x = in.at("x").get<std::vector<double>>();
    const auto w = in.at("w").get<std::vector<double>>();
    const UniformAngularGrid grid{in.at("grid").at("omega0").get<double>(), in.at("grid").at("d_omega").get<double>(),
                                  in.at("grid").at("count").get<std::size_t>()};
    const LombScargleSpectra direct = lomb_scargle_direct(t, grid.omegas(), {x, w});
    const FastLombScargle fast_plan(grid);
    const LombScargleSpectra fast = fast_plan.compute(t, {x, w});
    const auto omegas = in.at("band").at("omegas").get<std::vector<double>>();
    const auto weights = in.at("band").at("weights").get<std::vector<double>>();
    const Quadratic q = BandBasis(t, omegas, weights, false).quadratic(x, w);
    nlohmann::json out = {{"direct_x", direct.power(0)},       {"fast_x", fast.power(0)},
                          {"direct_w", direct.power(1)},       {"fast_w", fast.power(1)},
                          {"direct_cross", direct.cross_power(0, 1)}, {"fast_cross", fast.cross_power(0, 1)},
                          {"quadratic", {{"a", q.a}, {"b", q.b}, {"c", q.c}}}};
    std::cout << out.dump() << "\n";
    return 0;
  } catch (const std::exception& e) {
    std::cerr << "lomb_scargle_probe: " << e.what() << "\n";
    return 2;
  }
}
