// Step `slope`: the beach-face slope of each transect from the run's SlopePlan:
// a listed slope for the transect, one slope for every transect, the spectral
// estimate (corrections/spectral/slope_search.h), or the default with a flag.
// Points of a transect without a slope are flagged no_slope and stay uncorrected.
//
// With estimation, transects listed in per_transect keep their listed slope. The
// estimate uses the transect's points that carry no rejecting flag yet and have a
// water level; w = water level - z_ref. The wave term enters as the run applies
// it: with `setup` as the slope-free horizontal term 0.35 sqrt(H0 L0) (closed
// form), with `runup` through the grid + refine path with Stockdon R2% at each
// candidate slope. Not identifiable: flag slope_not_identifiable, then the default
// (flag default_slope) or no slope (flag no_slope).
#pragma once

#include <memory>

#include "corrections/core/param_fields.h"
#include "corrections/core/step.h"
#include "corrections/spectral/slope_search.h"

namespace strandline {

class SlopeStep final : public TransectStep {
 public:
  struct Params {
    // Spectrum grid (cycles per day): the published method's 1/400 .. 1/10 c/d.
    double f_min_cpd = 1.0 / 400.0;
    double f_max_cpd = 1.0 / 10.0;
    long long n_frequencies = 4000;
    double band_half_width_cpd = 8.64e-4;
    double min_peak_to_median = 20.0;
    long long min_images = 40;
    double min_excursion_m = 10.0;
    long long bootstrap_count = 200;
    long long seed = 20261202;
    double screen_k = 3.5;
    long long screen_half_window = 5;
    long long screen_passes = 2;
    bool remove_seasonal = true;
    double curve_step = 0.0025;
    static const ParamList<Params>& fields();  // each parameter: name, unit, range, meaning
    void validate(const std::string& pointer) const;  // rules between fields
  };
  static std::unique_ptr<Step> make(const nlohmann::json& params, const std::string& pointer);
  explicit SlopeStep(const Params& p);

  // The search options for one run's range (from the SlopePlan).
  spectral::SlopeSearchOptions search_options(double tan_beta_min, double tan_beta_max) const;
  const spectral::SlopeSearcher& searcher() const { return *searcher_; }

 private:
  void process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const override;
  void estimate(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const;
  Params p_;
  std::shared_ptr<const spectral::SlopeSearcher> searcher_;  // FFT plan made once, shared by threads
};

// The slope a plan gives a transect without estimation, if any.
std::optional<SlopeValue> planned_slope(const SlopePlan& plan, const std::string& transect_id);

// A per-transect seed: the step's seed mixed with the transect id (FNV-1a), so
// results do not depend on the order or the number of transects.
// The 1-sigma a default slope really carries: the stated one, else the spread of
// a slope uniform over the search range; at least the distance to the data's own
// (rejected) minimum when the search found one. Records the value and its basis
// in `details` (the slope_details object) when that is an object.
double default_slope_sigma(const SlopeValue& fallback, const SlopePlan& plan, nlohmann::json& details);

std::uint64_t transect_seed(std::uint64_t seed, const std::string& transect_id);

}  // namespace strandline
