#include "qc/trend_summary.h"

#include <algorithm>
#include <cmath>

#include "corrections/waves/stockdon.h"
#include "qc/linear_trend.h"
#include "qc/seasonal_fit.h"

namespace strandline {

namespace {
constexpr double kEpoch2000_s = 946684800.0;
double years_since_2000(TimeS t) { return 2000.0 + (t - kEpoch2000_s) / kSecondsPerJulianYear; }
nlohmann::json num(double v) { return known(v) ? nlohmann::json(v) : nlohmann::json(nullptr); }
}  // namespace

double chainage_at_slope(const SiteTable& table, std::size_t i, double z_ref_m, double used_slope, double slope,
                         WaveCorrection wave_correction) {
  const double x = table.chainage_m[i];
  const double wl = table.water_level_m[i];
  if (wave_correction == WaveCorrection::runup && known(table.runup_m[i]) && known(table.hs0_m[i]) &&
      known(table.l0_m[i])) {
    const double r2 = stockdon_terms(table.hs0_m[i], table.l0_m[i], slope).runup_m;
    return table.chainage_raw_m[i] + (wl + r2 - z_ref_m) / slope;
  }
  // The tide part scales with 1/slope; the setup's horizontal term is slope-free.
  return x + (wl - z_ref_m) * (1.0 / slope - 1.0 / used_slope);
}

void add_trend_summary(const SiteTable& table, std::size_t transect, const RunInputs& inputs, TimeS from_s,
                       TimeS to_s, nlohmann::json& out, std::vector<std::string>& cautions) {
  const TransectInfo& t = table.transects[transect];
  std::vector<std::size_t> rows;
  std::vector<TrendSample> samples;
  for (std::size_t i = t.begin; i < t.end; ++i) {
    if (!table.accepted(i) || !known(table.chainage_m[i]) || !(table.sigma_m[i] > 0)) continue;
    if (known(from_s) && table.time_s[i] < from_s) continue;
    if (known(to_s) && table.time_s[i] > to_s) continue;
    const double slope_term = known(table.sigma_slope_m[i]) ? table.sigma_slope_m[i] : 0.0;
    const double var = table.sigma_m[i] * table.sigma_m[i] - slope_term * slope_term;
    const double sigma = std::sqrt(std::max(var, 1e-4 * table.sigma_m[i] * table.sigma_m[i]));
    rows.push_back(i);
    samples.push_back({years_since_2000(table.time_s[i]), table.chainage_m[i], sigma});
  }
  out["trend_window"] = {{"from", known(from_s) ? nlohmann::json(format_time_utc(from_s)) : nlohmann::json(nullptr)},
                         {"to", known(to_s) ? nlohmann::json(format_time_utc(to_s)) : nlohmann::json(nullptr)},
                         {"n_points", samples.size()}};
  const LinearTrend trend = fit_linear_trend(samples, true);
  nlohmann::json tj = nullptr;
  if (trend.valid) {
    tj = {{"rate_m_per_yr", trend.rate_m_per_yr},
          {"intercept_m", trend.intercept_m},
          {"intercept_time", format_time_utc(kEpoch2000_s + (trend.t_mean_years - 2000.0) * kSecondsPerJulianYear)},
          {"se_naive_m_per_yr", trend.se_naive_m_per_yr},
          {"lag1_autocorrelation", trend.lag1_autocorrelation},
          {"n_effective", trend.n_effective},
          {"se_m_per_yr", num(trend.se_m_per_yr)},
          {"dof", num(trend.dof)},
          {"ci95_m_per_yr", trend.ci_valid ? nlohmann::json::array({trend.ci95_low, trend.ci95_high}) : nlohmann::json(nullptr)},
          {"serial_correlation", "AR(1) effective sample size (Santer et al. 2000)"}};
    if (!trend.ci_valid) cautions.push_back("effective sample size of 3 or fewer: no trend confidence interval");
    else if (trend.n_effective < 10) cautions.push_back("effective sample size below 10: wide, fragile trend interval");
    const double span = samples.back().t_years - samples.front().t_years;
    if (span < 3.0) cautions.push_back("trend over less than 3 years: seasonal and storm changes dominate it");

    // The slope term: the trend re-evaluated at the slope's interval bounds.
    if (known(t.slope_ci95_low) && known(t.slope_ci95_high) && t.slope_ci95_low > 0 && known(t.slope)) {
      double rates[2];
      const double bounds[2] = {t.slope_ci95_low, t.slope_ci95_high};
      for (int b = 0; b < 2; ++b) {
        std::vector<TrendSample> moved = samples;
        for (std::size_t k = 0; k < rows.size(); ++k)
          moved[k].value_m = chainage_at_slope(table, rows[k], t.z_ref_m, t.slope, bounds[b], inputs.wave_correction);
        rates[b] = fit_linear_trend(moved, true).rate_m_per_yr;
      }
      const double slope_term = std::max(std::abs(rates[0] - trend.rate_m_per_yr), std::abs(rates[1] - trend.rate_m_per_yr));
      tj["rate_at_slope_ci95_m_per_yr"] = nlohmann::json::array({rates[0], rates[1]});
      tj["slope_term_m_per_yr"] = slope_term;
      if (trend.ci_valid) {
        const double half = std::hypot(trend.ci95_high - trend.rate_m_per_yr, slope_term);
        tj["ci95_with_slope_m_per_yr"] = nlohmann::json::array({trend.rate_m_per_yr - half, trend.rate_m_per_yr + half});
      }
    } else {
      tj["rate_at_slope_ci95_m_per_yr"] = nullptr;
      tj["slope_term_m_per_yr"] = nullptr;
      tj["ci95_with_slope_m_per_yr"] = nullptr;
      cautions.push_back("slope interval unknown: the trend interval omits the slope term");
    }
  } else {
    cautions.push_back("fewer than 3 accepted points in the trend window: no trend");
  }
  out["trend"] = tj;

  const SeasonalFit season = fit_annual_harmonic(samples, true);
  out["seasonal"] = season.valid ? nlohmann::json{{"amplitude_m", season.amplitude_m},
                                                  {"amplitude_sigma_m", season.amplitude_sigma_m},
                                                  {"phase_deg", season.phase_deg},
                                                  {"most_seaward_day_of_year", season.peak_day_of_year}}
                                 : nlohmann::json(nullptr);
  if (!season.valid) cautions.push_back("fewer than 8 points or less than a year: no seasonal fit");
}

}  // namespace strandline
