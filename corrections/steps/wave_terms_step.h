// Step `wave_terms`: the Stockdon et al. (2006) setup and R2% at each image with
// the slope the slope step found, and the term entering the correction:
//   setup_m, runup_m  filled whenever waves are given (and H0, L0 and the slope are known)
//   wave_level_m      0 with `none`, setup_m with `setup`, runup_m with `runup`
//                     (R2% already contains the setup: never both)
//   wave_sigma_m      1-sigma of the applied term: the parameterisation's scatter
// Points without a sea state (no_wave_data) or without a slope keep every wave
// column empty, never 0.
#pragma once

#include "corrections/core/param_fields.h"
#include "corrections/core/step.h"

namespace strandline {

class WaveTermsStep final : public TransectStep {
 public:
  struct Params {
    // 1-sigma of R2% (Stockdon et al. 2006: rms error 0.38 m over ten experiments).
    double runup_sigma_m = 0.38;
    // 1-sigma of the setup as the waterline term. The paper's setup fit has its
    // own, smaller scatter, but an image's waterline sits anywhere in the swash
    // around the setup, so the R2% rms is kept as a conservative value.
    double setup_sigma_m = 0.38;
    static const ParamList<Params>& fields();  // each parameter: name, unit, range, meaning
  };
  static std::unique_ptr<Step> make(const nlohmann::json& params, const std::string& pointer);
  explicit WaveTermsStep(const Params& p);

 private:
  void process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const override;
  Params p_;
};

std::string_view wave_correction_name(WaveCorrection c);  // "none", "setup", "runup"
std::optional<WaveCorrection> wave_correction_from_name(std::string_view name);

}  // namespace strandline
