#include "corrections/steps/slope_step.h"

#include <cmath>

#include "corrections/waves/stockdon.h"

namespace strandline {

namespace {
constexpr double kZ95 = 1.959964;  // two-sided 95% normal quantile
}

std::optional<SlopeValue> planned_slope(const SlopePlan& plan, const std::string& transect_id) {
  if (auto it = plan.per_transect.find(transect_id); it != plan.per_transect.end()) return it->second;
  if (plan.all) return plan.all;
  return std::nullopt;
}

double default_slope_sigma(const SlopeValue& fallback, const SlopePlan& plan, nlohmann::json& details) {
  // Unstated: the default could be any slope of the search range (uniform: width / sqrt(12)).
  double sigma = fallback.slope_sigma;
  std::string basis = "stated";
  if (!known(sigma) && plan.search_max > plan.search_min) {
    sigma = (plan.search_max - plan.search_min) / std::sqrt(12.0);
    basis = "search_range_uniform";
  }
  // The data's own minimum, though not accepted, says how far the default may be off.
  if (details.is_object() && details.contains("tan_beta") && details["tan_beta"].is_number()) {
    const double found = details["tan_beta"].get<double>();
    if (std::isfinite(found) && std::abs(found - fallback.slope) > (known(sigma) ? sigma : 0.0)) {
      sigma = std::abs(found - fallback.slope);
      basis = "distance_to_data_minimum";
    }
  }
  if (details.is_object()) {
    details["default_sigma"] = known(sigma) ? nlohmann::json(sigma) : nlohmann::json(nullptr);
    details["default_sigma_basis"] = basis;
  }
  return sigma;
}

std::uint64_t transect_seed(std::uint64_t seed, const std::string& transect_id) {
  std::uint64_t h = 14695981039346656037ull;
  for (unsigned char c : transect_id) {
    h ^= c;
    h *= 1099511628211ull;
  }
  return seed ^ h;
}

const ParamList<SlopeStep::Params>& SlopeStep::Params::fields() {
  static const ParamList<Params> list = {
      {.name = "f_min_cpd", .member = member_of<&Params::f_min_cpd>, .unit = "cycles/day", .lower = greater_than(0),
       .meaning = "lowest frequency of the spectrum grid (1/400)"},
      {.name = "f_max_cpd", .member = member_of<&Params::f_max_cpd>, .unit = "cycles/day", .lower = greater_than(0),
       .meaning = "highest frequency of the grid (1/10); above `f_min_cpd`"},
      {.name = "n_frequencies", .member = member_of<&Params::n_frequencies>, .lower = at_least(16),
       .upper = at_most(1000000), .meaning = "frequencies of the grid"},
      {.name = "band_half_width_cpd", .member = member_of<&Params::band_half_width_cpd>, .unit = "cycles/day",
       .lower = greater_than(0), .meaning = "half-width of the tidal band around its peak (the published band)"},
      {.name = "min_peak_to_median", .member = member_of<&Params::min_peak_to_median>, .lower = at_least(1),
       .meaning = "peak over median power of a clear tidal peak"},
      {.name = "min_images", .member = member_of<&Params::min_images>, .lower = at_least(8),
       .meaning = "images needed for an estimate"},
      {.name = "min_excursion_m", .member = member_of<&Params::min_excursion_m>, .unit = "m", .lower = at_least(0),
       .meaning = "a smaller horizontal tidal excursion makes the slope not identifiable"},
      {.name = "bootstrap_count", .member = member_of<&Params::bootstrap_count>, .lower = at_least(0),
       .upper = at_most(100000), .meaning = "bootstrap resamples over images for the sigma and the 95% interval"},
      {.name = "seed", .member = member_of<&Params::seed>, .lower = at_least(0),
       .meaning = "bootstrap seed, mixed with each transect id"},
      {.name = "screen_k", .member = member_of<&Params::screen_k>, .lower = greater_than(0),
       .meaning = "the residual screen drops images beyond screen_k robust sigmas"},
      {.name = "screen_half_window", .member = member_of<&Params::screen_half_window>, .lower = at_least(1),
       .upper = at_most(1000), .meaning = "half-window of the residual screen, in images"},
      {.name = "screen_passes", .member = member_of<&Params::screen_passes>, .lower = at_least(0), .upper = at_most(10),
       .meaning = "passes of the residual screen"},
      {.name = "remove_seasonal", .member = member_of<&Params::remove_seasonal>,
       .meaning = "annual and semi-annual sinusoids removed with the line before the spectrum"},
      {.name = "curve_step", .member = member_of<&Params::curve_step>, .lower = greater_than(0), .upper = less_than(1),
       .meaning = "tan β step of the energy curve"},
  };
  return list;
}

void SlopeStep::Params::validate(const std::string& pointer) const {
  if (!(f_max_cpd > f_min_cpd)) throw ConfigError(pointer + "/f_max_cpd", "must exceed f_min_cpd");
}

std::unique_ptr<Step> SlopeStep::make(const nlohmann::json& params, const std::string& pointer) {
  return std::make_unique<SlopeStep>(read_params(Params::fields(), params, pointer));
}

SlopeStep::SlopeStep(const Params& p) : TransectStep("slope", params_json(Params::fields(), p)), p_(p) {
  spectral::SpectrumGrid grid;
  grid.f_min_cpd = p.f_min_cpd;
  grid.f_max_cpd = p.f_max_cpd;
  grid.count = static_cast<std::size_t>(p.n_frequencies);
  searcher_ = std::make_shared<const spectral::SlopeSearcher>(grid);
}

spectral::SlopeSearchOptions SlopeStep::search_options(double tan_beta_min, double tan_beta_max) const {
  spectral::SlopeSearchOptions o;
  o.tan_beta_min = tan_beta_min;
  o.tan_beta_max = tan_beta_max;
  o.band.half_width_cpd = p_.band_half_width_cpd;
  o.band.min_peak_to_median = p_.min_peak_to_median;
  o.screen.k = p_.screen_k;
  o.screen.half_window = static_cast<std::size_t>(p_.screen_half_window);
  o.screen_passes = static_cast<int>(p_.screen_passes);
  o.remove_seasonal = p_.remove_seasonal;
  o.min_images = static_cast<std::size_t>(p_.min_images);
  o.min_excursion_m = p_.min_excursion_m;
  o.bootstrap_count = static_cast<std::size_t>(p_.bootstrap_count);
  o.seed = static_cast<std::uint64_t>(p_.seed);
  o.curve_step = p_.curve_step;
  return o;
}

void SlopeStep::process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const {
  TransectInfo& t = table.transects[transect];
  auto flag_all = [&](Flag f) {
    for (std::size_t i = t.begin; i < t.end; ++i) table.add_flag(i, f);
  };
  if (auto fixed = planned_slope(inputs.slopes, t.id)) {
    t.slope = fixed->slope;
    t.slope_sigma = fixed->slope_sigma;
    t.slope_source = SlopeSource::fixed;
    log.count("fixed");
  } else {
    if (inputs.slopes.estimate) {
      estimate(table, transect, inputs, log);
      if (t.slope_identifiable) return;  // slope, sigma and the bootstrap interval are set
    }
    if (!inputs.slopes.default_value) {
      t.slope_source = SlopeSource::none;
      flag_all(Flag::no_slope);
      log.count("none");
      return;
    }
    t.slope = inputs.slopes.default_value->slope;
    t.slope_sigma = default_slope_sigma(*inputs.slopes.default_value, inputs.slopes, t.slope_details);
    t.slope_source = SlopeSource::default_value;
    flag_all(Flag::default_slope);
    log.count("default");
  }
  if (known(t.slope_sigma)) {
    t.slope_ci95_low = std::max(0.0, t.slope - kZ95 * t.slope_sigma);
    t.slope_ci95_high = t.slope + kZ95 * t.slope_sigma;
  }
}

void SlopeStep::estimate(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const {
  TransectInfo& t = table.transects[transect];
  std::vector<double> times, x, w, h0, l0;
  for (std::size_t i = t.begin; i < t.end; ++i) {
    if (!table.accepted(i) || !known(table.water_level_m[i]) || !known(table.chainage_raw_m[i]) ||
        !known(t.z_ref_m))
      continue;
    times.push_back(table.time_s[i]);
    x.push_back(table.chainage_raw_m[i]);
    w.push_back(table.water_level_m[i] - t.z_ref_m);
    h0.push_back(table.hs0_m[i]);
    l0.push_back(table.l0_m[i]);
  }
  const bool waves = inputs.waves != nullptr && inputs.wave_correction != WaveCorrection::none;
  const spectral::SlopeSearchOptions options = search_options(inputs.slopes.search_min, inputs.slopes.search_max);
  spectral::SlopeSearchOptions seeded = options;
  seeded.seed = transect_seed(options.seed, t.id);
  spectral::SlopeEstimate est;
  nlohmann::json setup_classes;  // with `setup`: how many images took the dissipative setup
  if (waves && inputs.wave_correction == WaveCorrection::runup) {
    // R2% depends on the slope: grid + refine with the runup at each candidate.
    spectral::CorrectedSeriesFn corrected = [&](double tan_beta, std::span<double> out) {
      for (std::size_t k = 0; k < x.size(); ++k) {
        const bool sea_state = known(h0[k]) && known(l0[k]);
        const double runup = sea_state ? stockdon_terms(h0[k], l0[k], tan_beta).runup_m : 0.0;
        out[k] = x[k] + (w[k] + runup) / tan_beta;
      }
    };
    est = searcher_->estimate(times, w, corrected, seeded);
  } else if (!waves) {
    est = searcher_->estimate({times, x, w, {}}, seeded);
  } else {
    // The general setup is slope-free horizontally (0.35 sqrt(H0 L0)); the
    // dissipative one (0.016 sqrt(H0 L0), xi0 < 0.3) is a level, so its image's
    // waterline level w gains it. The class depends on the slope: start from the
    // general form, classify at the estimate, solve again until the classes stand.
    std::vector<double> horizontal(x.size(), 0.0), level(x.size());
    std::vector<char> dissipative(x.size(), 0);
    std::size_t solves = 0, dissipative_images = 0;
    bool settled = false;
    while (!settled && solves < 5) {
      ++solves;
      for (std::size_t k = 0; k < x.size(); ++k) {
        const bool sea_state = known(h0[k]) && known(l0[k]);
        const double setup_level = sea_state && dissipative[k] ? stockdon_terms(h0[k], l0[k], 0.0).setup_dissipative_m : 0.0;  // slope-free
        horizontal[k] = sea_state && !dissipative[k] ? setup_horizontal_m(h0[k], l0[k]) : 0.0;
        level[k] = w[k] + setup_level;
      }
      est = searcher_->estimate({times, x, level, horizontal}, seeded);
      if (!std::isfinite(est.tan_beta)) break;
      bool changed = false;
      dissipative_images = 0;
      for (std::size_t k = 0; k < x.size(); ++k) {
        const char now = known(h0[k]) && known(l0[k]) && stockdon_terms(h0[k], l0[k], est.tan_beta).dissipative;
        changed = changed || now != dissipative[k];
        dissipative[k] = now;
        dissipative_images += now ? 1 : 0;
      }
      settled = !changed;
    }
    setup_classes = {{"dissipative_images", dissipative_images}, {"solves", solves}, {"settled", settled}};
  }
  t.slope_details = est.details();
  t.slope_details["wave_term"] = waves ? std::string(inputs.wave_correction == WaveCorrection::runup ? "runup" : "setup")
                                       : std::string("none");
  t.slope_details["search_range"] = {options.tan_beta_min, options.tan_beta_max};
  if (!setup_classes.is_null()) t.slope_details["setup_regimes"] = setup_classes;
  t.slope_identifiable = est.identifiable;
  for (const auto& reason : est.reasons) log.count("reason_" + reason);
  if (!est.identifiable) {
    log.count("not_identifiable");
    for (std::size_t i = t.begin; i < t.end; ++i) table.add_flag(i, Flag::slope_not_identifiable);
    return;
  }
  log.count("estimated");
  if (est.ci_touches_range || est.ci_wider_than_value) {
    for (std::size_t i = t.begin; i < t.end; ++i) table.add_flag(i, Flag::slope_poorly_constrained);
    log.count("poorly_constrained");
  }
  t.slope = est.tan_beta;
  t.slope_sigma = est.sigma;
  t.slope_ci95_low = est.ci95_low;
  t.slope_ci95_high = est.ci95_high;
  t.slope_source = SlopeSource::estimated;
}

}  // namespace strandline
