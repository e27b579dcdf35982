#include "corrections/steps/slope_step.h"

#include <cmath>

#include "corrections/core/param_reader.h"
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

std::uint64_t transect_seed(std::uint64_t seed, const std::string& transect_id) {
  std::uint64_t h = 14695981039346656037ull;
  for (unsigned char c : transect_id) {
    h ^= c;
    h *= 1099511628211ull;
  }
  return seed ^ h;
}

void SlopeStep::Params::validate(const std::string& pointer) const {
  auto fail = [&](const std::string& key, const std::string& reason) { throw ConfigError(pointer + "/" + key, reason); };
  if (!(f_min_cpd > 0)) fail("f_min_cpd", "must be positive (cycles per day)");
  if (!(f_max_cpd > f_min_cpd)) fail("f_max_cpd", "must exceed f_min_cpd");
  if (n_frequencies < 16 || n_frequencies > 1000000) fail("n_frequencies", "expected 16 to 1000000");
  if (!(band_half_width_cpd > 0)) fail("band_half_width_cpd", "must be positive (cycles per day)");
  if (!(min_peak_to_median >= 1)) fail("min_peak_to_median", "must be at least 1");
  if (min_images < 8) fail("min_images", "must be at least 8");
  if (!(min_excursion_m >= 0)) fail("min_excursion_m", "must be zero or positive (metres)");
  if (bootstrap_count < 0 || bootstrap_count > 100000) fail("bootstrap_count", "expected 0 to 100000");
  if (seed < 0) fail("seed", "must be zero or positive");
  if (!(screen_k > 0)) fail("screen_k", "must be positive");
  if (screen_half_window < 1 || screen_half_window > 1000) fail("screen_half_window", "expected 1 to 1000 images");
  if (screen_passes < 0 || screen_passes > 10) fail("screen_passes", "expected 0 to 10");
  if (!(curve_step > 0 && curve_step < 1)) fail("curve_step", "expected a tan(beta) step between 0 and 1");
}

nlohmann::json SlopeStep::Params::to_json() const {
  return {{"f_min_cpd", f_min_cpd},
          {"f_max_cpd", f_max_cpd},
          {"n_frequencies", n_frequencies},
          {"band_half_width_cpd", band_half_width_cpd},
          {"min_peak_to_median", min_peak_to_median},
          {"min_images", min_images},
          {"min_excursion_m", min_excursion_m},
          {"bootstrap_count", bootstrap_count},
          {"seed", seed},
          {"screen_k", screen_k},
          {"screen_half_window", screen_half_window},
          {"screen_passes", screen_passes},
          {"remove_seasonal", remove_seasonal},
          {"curve_step", curve_step}};
}

std::unique_ptr<Step> SlopeStep::make(const nlohmann::json& params, const std::string& pointer) {
  Params p;
  ParamReader r(params, pointer);
  r.number("f_min_cpd", p.f_min_cpd);
  r.number("f_max_cpd", p.f_max_cpd);
  r.integer("n_frequencies", p.n_frequencies);
  r.number("band_half_width_cpd", p.band_half_width_cpd);
  r.number("min_peak_to_median", p.min_peak_to_median);
  r.integer("min_images", p.min_images);
  r.number("min_excursion_m", p.min_excursion_m);
  r.integer("bootstrap_count", p.bootstrap_count);
  r.integer("seed", p.seed);
  r.number("screen_k", p.screen_k);
  r.integer("screen_half_window", p.screen_half_window);
  r.integer("screen_passes", p.screen_passes);
  r.boolean("remove_seasonal", p.remove_seasonal);
  r.number("curve_step", p.curve_step);
  r.finish();
  p.validate(pointer);
  return std::make_unique<SlopeStep>(p);
}

SlopeStep::SlopeStep(const Params& p) : TransectStep("slope", p.to_json()), p_(p) {
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
    t.slope_sigma = inputs.slopes.default_value->slope_sigma;
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
  } else {
    std::vector<double> horizontal;
    if (waves) {
      horizontal.resize(x.size(), 0.0);
      for (std::size_t k = 0; k < x.size(); ++k)
        if (known(h0[k]) && known(l0[k])) horizontal[k] = setup_horizontal_m(h0[k], l0[k]);
    }
    est = searcher_->estimate({times, x, w, horizontal}, seeded);
  }
  t.slope_details = est.details();
  t.slope_details["wave_term"] = waves ? std::string(inputs.wave_correction == WaveCorrection::runup ? "runup" : "setup")
                                       : std::string("none");
  t.slope_details["search_range"] = {options.tan_beta_min, options.tan_beta_max};
  t.slope_identifiable = est.identifiable;
  for (const auto& reason : est.reasons) log.count("reason_" + reason);
  if (!est.identifiable) {
    log.count("not_identifiable");
    for (std::size_t i = t.begin; i < t.end; ++i) table.add_flag(i, Flag::slope_not_identifiable);
    return;
  }
  log.count("estimated");
  t.slope = est.tan_beta;
  t.slope_sigma = est.sigma;
  t.slope_ci95_low = est.ci95_low;
  t.slope_ci95_high = est.ci95_high;
  t.slope_source = SlopeSource::estimated;
}

}  // namespace strandline
