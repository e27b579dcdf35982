#include "corrections/steps/wave_terms_step.h"

#include "corrections/waves/stockdon.h"

namespace strandline {

std::string_view wave_correction_name(WaveCorrection c) {
  switch (c) {
    case WaveCorrection::none: return "none";
    case WaveCorrection::setup: return "setup";
    case WaveCorrection::runup: return "runup";
  }
  return "none";
}

std::optional<WaveCorrection> wave_correction_from_name(std::string_view name) {
  for (auto c : {WaveCorrection::none, WaveCorrection::setup, WaveCorrection::runup})
    if (wave_correction_name(c) == name) return c;
  return std::nullopt;
}

const ParamList<WaveTermsStep::Params>& WaveTermsStep::Params::fields() {
  static const ParamList<Params> list = {
      {.name = "runup_sigma_m", .member = member_of<&Params::runup_sigma_m>, .unit = "m", .lower = at_least(0),
       .meaning = "1σ of R2% (Stockdon et al. 2006: rms error over ten experiments)"},
      {.name = "setup_sigma_m", .member = member_of<&Params::setup_sigma_m>, .unit = "m", .lower = at_least(0),
       .meaning = "1σ of the setup as the waterline term (the R2% rms: the waterline sits anywhere in the swash)"},
  };
  return list;
}

std::unique_ptr<Step> WaveTermsStep::make(const nlohmann::json& params, const std::string& pointer) {
  return std::make_unique<WaveTermsStep>(read_params(Params::fields(), params, pointer));
}

WaveTermsStep::WaveTermsStep(const Params& p) : TransectStep("wave_terms", params_json(Params::fields(), p)), p_(p) {}

void WaveTermsStep::process(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const {
  if (inputs.waves == nullptr) return;
  log.note("wave_correction", std::string(wave_correction_name(inputs.wave_correction)));
  const TransectInfo& t = table.transects[transect];
  if (!(t.slope > 0)) {
    log.count("no_slope", static_cast<std::int64_t>(t.size()));
    return;
  }
  for (std::size_t i = t.begin; i < t.end; ++i) {
    if (!known(table.hs0_m[i]) || !known(table.l0_m[i])) {
      log.count("no_wave_data");
      continue;
    }
    const StockdonTerms terms = stockdon_terms(table.hs0_m[i], table.l0_m[i], t.slope);
    table.setup_m[i] = terms.setup_m;
    table.runup_m[i] = terms.runup_m;
    log.count(terms.dissipative ? "dissipative" : "intermediate_reflective");
    switch (inputs.wave_correction) {
      case WaveCorrection::none:
        table.wave_level_m[i] = 0.0;
        break;
      case WaveCorrection::setup:
        table.wave_level_m[i] = terms.setup_m;
        table.wave_sigma_m[i] = p_.setup_sigma_m;
        break;
      case WaveCorrection::runup:
        table.wave_level_m[i] = terms.runup_m;
        table.wave_sigma_m[i] = p_.runup_sigma_m;
        break;
    }
  }
}

}  // namespace strandline
