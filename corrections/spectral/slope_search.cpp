#include "corrections/spectral/slope_search.h"

#include <algorithm>
#include <cmath>
#include <numbers>
#include <numeric>
#include <random>
#include <stdexcept>

#include "corrections/core/time_utc.h"
#include "corrections/spectral/detrend.h"

namespace strandline::spectral {

namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

UniformAngularGrid angular_grid(const SpectrumGrid& g) {
  if (!(g.f_min_cpd > 0) || !(g.f_max_cpd > g.f_min_cpd) || g.count < 3)
    throw std::invalid_argument("SpectrumGrid: need 0 < f_min < f_max and at least 3 frequencies");
  const double df = (g.f_max_cpd - g.f_min_cpd) / static_cast<double>(g.count - 1);
  return {2 * std::numbers::pi * g.f_min_cpd, 2 * std::numbers::pi * df, g.count};
}

std::vector<double> tan_beta_grid(double lo, double hi, double step) {
  std::vector<double> grid;
  const auto n = static_cast<std::size_t>(std::floor((hi - lo) / step + 1e-9));
  for (std::size_t i = 0; i <= n; ++i) grid.push_back(lo + static_cast<double>(i) * step);
  if (hi - grid.back() > 1e-12) grid.push_back(hi);
  return grid;
}

void check_options(const SlopeSearchOptions& o) {
  if (!(o.tan_beta_min > 0) || !(o.tan_beta_max > o.tan_beta_min))
    throw std::invalid_argument("slope search: need 0 < tan_beta_min < tan_beta_max");
  if (!(o.curve_step > 0)) throw std::invalid_argument("slope search: curve_step must be positive");
}

}  // namespace

std::vector<double> SpectrumGrid::frequencies_cpd() const {
  std::vector<double> f(count);
  const double df = (f_max_cpd - f_min_cpd) / static_cast<double>(count - 1);
  for (std::size_t k = 0; k < count; ++k) f[k] = f_min_cpd + static_cast<double>(k) * df;
  return f;
}

SlopeSearcher::SlopeSearcher(const SpectrumGrid& grid)
    : grid_(grid), frequencies_cpd_(grid.frequencies_cpd()), fast_(angular_grid(grid), grid.fast) {}

std::vector<double> SlopeSearcher::water_spectrum(std::span<const double> times_days,
                                                  std::span<const double> water_m, bool remove_seasonal) const {
  const std::vector<double> detrended = detrend_days(times_days, water_m, remove_seasonal);
  return fast_.power(times_days, detrended);
}

GridSearchResult grid_refine_search(const BandBasis& basis, const CorrectedSeriesFn& corrected, double tan_min,
                                    double tan_max, double step, std::span<const double> multiplicity,
                                    double tolerance) {
  std::vector<double> y(basis.images());
  auto energy_at = [&](double tan_beta) {
    corrected(tan_beta, y);
    return multiplicity.empty() ? basis.energy(y) : basis.energy(y, multiplicity);
  };
  GridSearchResult result;
  const std::vector<double> grid = tan_beta_grid(tan_min, tan_max, step);
  std::size_t best = 0;
  for (std::size_t i = 0; i < grid.size(); ++i) {
    result.curve.push_back({grid[i], energy_at(grid[i])});
    if (result.curve[i].energy < result.curve[best].energy) best = i;
  }
  // Golden-section search in the two cells around the best grid point.
  double a = grid[best > 0 ? best - 1 : 0], b = grid[std::min(best + 1, grid.size() - 1)];
  const double ratio = (std::sqrt(5.0) - 1) / 2;
  double c = b - ratio * (b - a), d = a + ratio * (b - a);
  double fc = energy_at(c), fd = energy_at(d);
  while (b - a > tolerance) {
    if (fc < fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - ratio * (b - a);
      fc = energy_at(c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + ratio * (b - a);
      fd = energy_at(d);
    }
  }
  result.tan_beta = 0.5 * (a + b);
  result.energy = energy_at(result.tan_beta);
  if (result.curve[best].energy < result.energy) {  // the refinement cannot lose to the grid
    result.tan_beta = grid[best];
    result.energy = result.curve[best].energy;
  }
  const double edge_tolerance = 10 * tolerance;
  result.at_edge = result.tan_beta - tan_min < edge_tolerance || tan_max - result.tan_beta < edge_tolerance;
  return result;
}

SlopeEstimate SlopeSearcher::estimate(const SlopeSeries& series, const SlopeSearchOptions& options) const {
  const std::size_t n = series.times_s.size();
  if (series.chainage_m.size() != n || series.water_m.size() != n ||
      (!series.horizontal_m.empty() && series.horizontal_m.size() != n))
    throw std::invalid_argument("slope search: series lengths differ");
  std::vector<double> x(series.chainage_m.begin(), series.chainage_m.end());
  if (!series.horizontal_m.empty())
    for (std::size_t i = 0; i < n; ++i) x[i] += series.horizontal_m[i];
  const std::span<const double> w = series.water_m;
  CorrectedSeriesFn linear = [&](double tan_beta, std::span<double> out) {
    for (std::size_t i = 0; i < n; ++i) out[i] = x[i] + w[i] / tan_beta;
  };
  return run(series.times_s, w, linear, &x, options);
}

SlopeEstimate SlopeSearcher::estimate(std::span<const double> times_s, std::span<const double> water_m,
                                      const CorrectedSeriesFn& corrected, const SlopeSearchOptions& options) const {
  if (water_m.size() != times_s.size()) throw std::invalid_argument("slope search: series lengths differ");
  return run(times_s, water_m, corrected, nullptr, options);
}

SlopeEstimate SlopeSearcher::run(std::span<const double> times_s, std::span<const double> water_m,
                                 const CorrectedSeriesFn& corrected, const std::vector<double>* linear_x,
                                 const SlopeSearchOptions& options) const {
  check_options(options);
  SlopeEstimate est;
  est.method = linear_x ? "closed_form" : "grid_refine";
  est.remove_seasonal = options.remove_seasonal;
  est.tan_beta = est.sigma = est.ci95_low = est.ci95_high = est.excursion_m = est.excursion_min_m = kNaN;
  const std::size_t n = times_s.size();
  est.images_given = n;
  for (std::size_t i = 0; i < n; ++i)
    if (!std::isfinite(times_s[i]) || !std::isfinite(water_m[i]))
      throw std::invalid_argument("slope search: times and water levels must be finite");

  // Work in time order, times in days from the first image.
  std::vector<std::size_t> order(n);
  std::iota(order.begin(), order.end(), 0);
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return times_s[a] < times_s[b]; });
  std::vector<double> t(n), w(n), x;
  for (std::size_t i = 0; i < n; ++i) {
    t[i] = (times_s[order[i]] - times_s[order[0]]) / kSecondsPerDay;
    w[i] = water_m[order[i]];
  }
  if (linear_x) {
    x.resize(n);
    for (std::size_t i = 0; i < n; ++i) x[i] = (*linear_x)[order[i]];
  }
  std::vector<double> input_order_buffer(n);
  CorrectedSeriesFn corrected_sorted = [&](double tan_beta, std::span<double> out) {
    corrected(tan_beta, input_order_buffer);
    for (std::size_t i = 0; i < n; ++i) out[i] = input_order_buffer[order[i]];
  };
  est.kept.assign(n, 0);
  if (n < std::max<std::size_t>(options.min_images, 8)) {
    est.reasons.push_back("too_few_images");
    return est;
  }

  // (1) Tidal band.
  const std::vector<double> spectrum = water_spectrum(t, w, options.remove_seasonal);
  est.band = find_tidal_band(frequencies_cpd_, spectrum, t, options.band);
  if (!est.band.found) {
    est.reasons.push_back("no_clear_tidal_peak");
    return est;
  }
  std::vector<double> omegas;
  for (double f : est.band.frequencies_cpd) omegas.push_back(2 * std::numbers::pi * f);
  const BandBasis basis(t, omegas, est.band.weights_cpd, options.remove_seasonal);

  // (2)-(4) Provisional slope, residual screen, final slope.
  const double s_lo = 1 / options.tan_beta_max, s_hi = 1 / options.tan_beta_min;
  struct Solution {
    double s;
    bool at_edge;
    Quadratic q;
    std::vector<EnergyPoint> curve;
  };
  auto solve = [&](const std::vector<double>& multiplicity) {
    Solution sol{};
    if (linear_x) {
      sol.q = basis.quadratic(x, w, multiplicity);
      const double s = sol.q.a > 0 ? sol.q.argmin() : kNaN;
      sol.at_edge = !(s >= s_lo && s <= s_hi);
      sol.s = std::isnan(s) ? s_hi : std::clamp(s, s_lo, s_hi);
    } else {
      const GridSearchResult g = grid_refine_search(basis, corrected_sorted, options.tan_beta_min,
                                                    options.tan_beta_max, options.curve_step, multiplicity);
      sol.s = 1 / g.tan_beta;
      sol.at_edge = g.at_edge;
      sol.curve = g.curve;
    }
    return sol;
  };
  std::vector<double> multiplicity(n, 1.0);
  Solution sol = solve(multiplicity);
  std::vector<char> keep(n, 1);
  std::vector<double> y(n);
  for (int pass = 0; pass < options.screen_passes; ++pass) {
    // Residuals of the provisional correction about its trend (and seasonal
    // cycle), so the running median does not have to follow the seasons.
    corrected_sorted(1 / sol.s, y);
    std::vector<char> fresh(n, 1);
    screen_residuals(detrend_days(t, y, options.remove_seasonal), fresh, options.screen);
    const bool same = fresh == keep;
    keep = fresh;
    for (std::size_t i = 0; i < n; ++i) multiplicity[i] = keep[i] ? 1.0 : 0.0;
    if (same && pass > 0) break;
    sol = solve(multiplicity);
  }
  std::vector<std::size_t> kept_rows;
  std::vector<double> w_kept;
  for (std::size_t i = 0; i < n; ++i)
    if (keep[i]) {
      kept_rows.push_back(i);
      w_kept.push_back(w[i]);
      est.kept[order[i]] = 1;
    }
  est.images_used = kept_rows.size();
  est.images_screened = n - kept_rows.size();
  est.tan_beta = 1 / sol.s;
  if (est.images_used < options.min_images) est.reasons.push_back("too_few_images");
  if (sol.at_edge) est.reasons.push_back("minimum_at_range_edge");
  const double level_range_m = quantile_of(w_kept, 0.95) - quantile_of(w_kept, 0.05);
  est.excursion_m = level_range_m / est.tan_beta;

  // (5) Bootstrap over the kept images. The corrected series is linearised in s
  // at the estimate (exact for the closed-form path), so each resample costs
  // one quadratic.
  std::vector<double> xe, we(n);
  if (linear_x) {
    xe = x;
    we = w;
  } else {
    const double s = sol.s, ds = 1e-3 * s;
    std::vector<double> yp(n), ym(n);
    corrected_sorted(1 / s, y);
    corrected_sorted(1 / (s + ds), yp);
    corrected_sorted(1 / (s - ds), ym);
    xe.resize(n);
    for (std::size_t i = 0; i < n; ++i) {
      we[i] = (yp[i] - ym[i]) / (2 * ds);
      xe[i] = y[i] - s * we[i];
    }
  }
  if (options.bootstrap_count > 0) {
    std::mt19937_64 rng(options.seed);
    std::uniform_int_distribution<std::size_t> pick(0, kept_rows.size() - 1);
    Eigen::MatrixXd draws = Eigen::MatrixXd::Zero(static_cast<Eigen::Index>(options.bootstrap_count),
                                                  static_cast<Eigen::Index>(n));
    for (std::size_t b = 0; b < options.bootstrap_count; ++b)
      for (std::size_t k = 0; k < kept_rows.size(); ++k)
        draws(static_cast<Eigen::Index>(b), static_cast<Eigen::Index>(kept_rows[pick(rng)])) += 1.0;
    const std::vector<Quadratic> qs = basis.quadratics(xe, we, draws);
    std::vector<double> tans;
    double mean = 0;
    for (const Quadratic& q : qs) {
      const double s = q.a > 0 ? std::clamp(q.argmin(), s_lo, s_hi) : s_hi;
      tans.push_back(1 / s);
      mean += 1 / s;
    }
    mean /= static_cast<double>(tans.size());
    double var = 0;
    for (double v : tans) var += (v - mean) * (v - mean);
    est.sigma = tans.size() > 1 ? std::sqrt(var / static_cast<double>(tans.size() - 1)) : kNaN;
    est.ci95_low = quantile_of(tans, 0.025);
    est.ci95_high = quantile_of(tans, 0.975);
    // Resamples are clamped to the search range: an end reached means the
    // interval is cut there, not that the data stop there.
    const double edge_tolerance = 1e-9;
    est.ci_touches_range = est.ci95_low <= options.tan_beta_min * (1 + edge_tolerance) ||
                           est.ci95_high >= options.tan_beta_max * (1 - edge_tolerance);
    est.ci_wider_than_value = est.ci95_high - est.ci95_low > est.tan_beta;
  }
  // Judged on the steepest slope the interval allows, not on the estimate
  // alone: a wrong, flatter estimate would otherwise pass on its own excursion.
  const double steepest = options.bootstrap_count > 0 ? std::max(est.ci95_high, est.tan_beta) : est.tan_beta;
  est.excursion_min_m = level_range_m / steepest;
  if (!(est.excursion_min_m >= options.min_excursion_m)) est.reasons.push_back("tidal_excursion_below_limit");

  // Energy curve over the search range (from the quadratic when exact).
  if (linear_x) {
    est.energy = sol.q;
    for (double tb : tan_beta_grid(options.tan_beta_min, options.tan_beta_max, options.curve_step))
      est.curve.push_back({tb, sol.q.at(1 / tb)});
  } else {
    est.curve = sol.curve;
  }
  est.identifiable = est.reasons.empty();
  return est;
}

nlohmann::json SlopeEstimate::details() const {
  nlohmann::json band_json = nullptr;
  if (band.peak_cpd > 0) {
    band_json = {{"centre_period_days", 1 / band.peak_cpd},
                 {"centre_cpd", band.peak_cpd},
                 {"half_width_cpd", band.half_width_cpd},
                 {"period_range_days",
                  {1 / (band.peak_cpd + band.half_width_cpd),
                   band.peak_cpd > band.half_width_cpd ? 1 / (band.peak_cpd - band.half_width_cpd) : kNaN}},
                 {"n_frequencies", band.bins.size()},
                 {"peak_to_median", band.peak_to_median},
                 {"rayleigh_cpd", band.rayleigh_cpd},
                 {"seasonal_peak_skipped", band.seasonal_peak_skipped}};
    if (band.seasonal_peak_skipped) band_json["skipped_peak_period_days"] = 1 / band.skipped_peak_cpd;
  }
  nlohmann::json curve_tan = nlohmann::json::array(), curve_energy = nlohmann::json::array();
  for (const auto& p : curve) {
    curve_tan.push_back(p.tan_beta);
    curve_energy.push_back(p.energy);
  }
  nlohmann::json j = {{"method", method},
                      {"detrend", remove_seasonal ? "line+annual+semiannual" : "line"},
                      {"verdict", identifiable ? "identifiable" : "not_identifiable"},
                      {"reasons", reasons},
                      {"tan_beta", tan_beta},
                      {"sigma", sigma},
                      {"ci95", {ci95_low, ci95_high}},
                      {"n_images", images_used},
                      {"n_images_given", images_given},
                      {"n_images_screened", images_screened},
                      {"horizontal_tidal_excursion_m", excursion_m},
                      {"horizontal_tidal_excursion_min_m", excursion_min_m},
                      {"ci_touches_search_range", ci_touches_range},
                      {"ci_wider_than_value", ci_wider_than_value},
                      {"band", band_json},
                      {"energy_curve", {{"tan_beta", curve_tan}, {"energy", curve_energy}}}};
  if (!band.found && !band.reason.empty()) j["band_reason"] = band.reason;
  return j;
}

}  // namespace strandline::spectral
