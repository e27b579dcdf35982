#include "corrections/tide/harmonic_tide_source.h"

namespace strandline::tide {

HarmonicTideSource::HarmonicTideSource(const ConstituentSet& set, std::string origin)
    : predictor_(set), origin_(std::move(origin)) {}

std::optional<WaterLevelAt> HarmonicTideSource::at(TimeS time_s, double /*max_gap_s: no record gaps*/) const {
  return WaterLevelAt{predictor_.level_m(time_s), predictor_.constants().residual_std_m, true};
}

nlohmann::json HarmonicTideSource::describe() const {
  const ConstituentSet& set = predictor_.constants();
  nlohmann::json names = nlohmann::json::array();
  for (const auto& c : set.constituents) names.push_back(c.name);
  nlohmann::json j = {{"kind", "harmonic_prediction"},
                      {"file", origin_},
                      {"datum", set.datum},
                      {"z0_m", set.z0_m},
                      {"z0_rate_m_per_yr", set.z0_rate_m_per_yr},
                      {"z0_epoch", format_time_utc(set.z0_epoch_s)},
                      {"constituents", names},
                      {"nodal_corrections", "Schureman (1958), evaluated at each time"}};
  j["sigma_m"] = known(set.residual_std_m) ? nlohmann::json(set.residual_std_m) : nlohmann::json(nullptr);
  return j;
}

}  // namespace strandline::tide
