#include "qc/trend_summary.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <string>

#include "corrections/waves/stockdon.h"
#include "qc/linear_trend.h"
#include "qc/sensor_offset_estimate.h"
#include "qc/seasonal_fit.h"

namespace strandline {

namespace {
constexpr double kEpoch2000_s = 946684800.0;
double years_since_2000(TimeS t) { return 2000.0 + (t - kEpoch2000_s) / kSecondsPerJulianYear; }

// 95% half-width of the offset applied to a family: the site estimate's interval
// in estimate mode, 1.96 sigma of a given offset (NaN when unknown).
double offset_half_width_m(const SiteTable& table, const std::string& family, double sigma_m) {
  if (table.sensor_offsets.mode == SensorOffsetMode::estimate)
    for (const FamilyOffset& f : table.sensor_offsets.estimates)
      if (f.family == family && f.significant()) return f.ci95_high_m - f.offset_m;
  return 1.959963984540054 * sigma_m;  // Phi^-1(0.975)
}

void add_offset_term(const SiteTable& table, const RunInputs& inputs, const std::vector<std::size_t>& rows,
                     const std::vector<TrendSample>& samples, const LinearTrend& trend, TrendSummary& s,
                     std::vector<std::string>& cautions) {
  const auto families = sensor_families(table, inputs);
  // Each shifted point moves by its own offset's half-width, a family at a time.
  std::vector<double> half(rows.size(), 0.0);
  std::map<std::string, bool> shifted;  // family -> every half-width known
  for (std::size_t k = 0; k < rows.size(); ++k) {
    const std::size_t i = rows[k];
    if (!known(table.sensor_offset_m[i])) continue;
    const std::string& family = families[table.sensor[i]];
    half[k] = offset_half_width_m(table, family, table.sigma_sensor_offset_m[i]);
    auto [it, inserted] = shifted.emplace(family, true);
    it->second = it->second && known(half[k]);
  }
  if (shifted.empty()) return;
  TrendOffsetTerm& term = s.sensor_offset_term.emplace();
  double sum2 = 0;
  for (const auto& [family, all_known] : shifted) {
    if (!all_known) {
      cautions.push_back("a sensor offset was applied without its uncertainty: the trend interval omits it");
      return;
    }
    std::vector<TrendSample> moved = samples;
    for (std::size_t k = 0; k < rows.size(); ++k)
      if (known(table.sensor_offset_m[rows[k]]) && families[table.sensor[rows[k]]] == family) moved[k].value_m += half[k];
    const double d = fit_linear_trend(moved, true).rate_m_per_yr - trend.rate_m_per_yr;
    sum2 += d * d;
  }
  term.offset_term_m_per_yr = std::sqrt(sum2);
  if (trend.ci_valid) {
    const double slope_term =
        s.slope_term && known(s.slope_term->slope_term_m_per_yr) ? s.slope_term->slope_term_m_per_yr : 0.0;
    const double half = std::sqrt(std::pow(trend.ci95_high - trend.rate_m_per_yr, 2) + slope_term * slope_term + sum2);
    term.ci95_with_sensor_offsets_m_per_yr = Interval{trend.rate_m_per_yr - half, trend.rate_m_per_yr + half};
  }
}
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

TrendPart summarise_trend(const SiteTable& table, std::size_t transect, const RunInputs& inputs, TimeS from_s,
                          TimeS to_s, std::vector<std::string>& cautions) {
  const TransectInfo& t = table.transects[transect];
  std::vector<std::size_t> rows;
  std::vector<TrendSample> samples;
  for (std::size_t i = t.begin; i < t.end; ++i) {
    if (!table.accepted(i) || !known(table.chainage_m[i]) || !(table.sigma_m[i] > 0)) continue;
    if (known(from_s) && table.time_s[i] < from_s) continue;
    if (known(to_s) && table.time_s[i] > to_s) continue;
    const double slope_term = known(table.sigma_slope_m[i]) ? table.sigma_slope_m[i] : 0.0;
    const double offset_term = known(table.sigma_sensor_offset_m[i]) ? table.sigma_sensor_offset_m[i] : 0.0;
    const double var = table.sigma_m[i] * table.sigma_m[i] - slope_term * slope_term - offset_term * offset_term;
    const double sigma = std::sqrt(std::max(var, 1e-4 * table.sigma_m[i] * table.sigma_m[i]));
    rows.push_back(i);
    samples.push_back({years_since_2000(table.time_s[i]), table.chainage_m[i], sigma});
  }
  TrendPart part;
  part.window = {from_s, to_s, samples.size()};
  const LinearTrend trend = fit_linear_trend(samples, true);
  if (trend.valid) {
    TrendSummary& s = part.trend.emplace();
    s.rate_m_per_yr = trend.rate_m_per_yr;
    s.intercept_m = trend.intercept_m;
    s.intercept_time_s = kEpoch2000_s + (trend.t_mean_years - 2000.0) * kSecondsPerJulianYear;
    s.se_naive_m_per_yr = trend.se_naive_m_per_yr;
    s.lag1_autocorrelation = trend.lag1_autocorrelation;
    s.n_effective = trend.n_effective;
    s.se_m_per_yr = trend.se_m_per_yr;
    s.dof = trend.dof;
    if (trend.ci_valid) s.ci95_m_per_yr = Interval{trend.ci95_low, trend.ci95_high};
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
      TrendSlopeTerm& term = s.slope_term.emplace();
      term.rate_at_slope_ci95_m_per_yr = {rates[0], rates[1]};
      term.slope_term_m_per_yr =
          std::max(std::abs(rates[0] - trend.rate_m_per_yr), std::abs(rates[1] - trend.rate_m_per_yr));
      if (trend.ci_valid) {
        const double half = std::hypot(trend.ci95_high - trend.rate_m_per_yr, term.slope_term_m_per_yr);
        term.ci95_with_slope_m_per_yr = Interval{trend.rate_m_per_yr - half, trend.rate_m_per_yr + half};
      }
    } else {
      cautions.push_back("slope interval unknown: the trend interval omits the slope term");
    }
    add_offset_term(table, inputs, rows, samples, trend, s, cautions);
  } else {
    cautions.push_back("fewer than 3 accepted points in the trend window: no trend");
  }

  const SeasonalFit season = fit_annual_harmonic(samples, true);
  if (season.valid)
    part.seasonal = SeasonalSummary{season.amplitude_m, season.amplitude_sigma_m, season.phase_deg,
                                    season.peak_day_of_year};
  else
    cautions.push_back("fewer than 8 points or less than a year: no seasonal fit");
  return part;
}

}  // namespace strandline
