// Probe for check_trend.py: reads {"t_years": [...], "values_m": [...],
// "sigmas_m": [...], "weighted": bool, "t_quantile_dofs": [...]} on stdin and
// writes the engine's linear trend, the t quantiles asked for and the MAD
// constant as JSON on stdout.
#include <iostream>

#include <nlohmann/json.hpp>

#include "qc/linear_trend.h"
#include "qc/robust_stats.h"
#include "qc/seasonal_fit.h"
#include "qc/student_t.h"

using namespace strandline;

int main() {
  const nlohmann::json in = nlohmann::json::parse(std::cin);
  const auto t = in.at("t_years").get<std::vector<double>>();
  const auto x = in.at("values_m").get<std::vector<double>>();
  const auto s = in.at("sigmas_m").get<std::vector<double>>();
  std::vector<TrendSample> samples;
  for (std::size_t i = 0; i < t.size(); ++i) samples.push_back({t[i], x[i], s[i]});
  const bool weighted = in.at("weighted").get<bool>();
  const LinearTrend r = fit_linear_trend(samples, weighted);
  const SeasonalFit f = fit_annual_harmonic(samples, weighted);
  nlohmann::json quantiles = nlohmann::json::array();
  for (double dof : in.value("t_quantile_dofs", std::vector<double>{})) quantiles.push_back(student_t_quantile(0.975, dof));
  std::cout << nlohmann::json{{"rate_m_per_yr", r.rate_m_per_yr},
                              {"intercept_m", r.intercept_m},
                              {"t_mean_years", r.t_mean_years},
                              {"se_naive_m_per_yr", r.se_naive_m_per_yr},
                              {"lag1_autocorrelation", r.lag1_autocorrelation},
                              {"n_effective", r.n_effective},
                              {"se_m_per_yr", r.se_m_per_yr},
                              {"ci95_low", r.ci95_low},
                              {"ci95_high", r.ci95_high},
                              {"seasonal_amplitude_m", f.amplitude_m},
                              {"seasonal_phase_deg", f.phase_deg},
                              {"t_quantiles_975", quantiles},
                              {"mad_to_sigma", kMadToSigma}}
                   .dump()
            << "\n";
  return 0;
}
