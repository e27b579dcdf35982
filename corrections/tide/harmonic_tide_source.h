// The harmonic prediction as a water-level source: available at any time (no
// record to run out of), marked `predicted`, with the analysis residual
// standard deviation as its 1-sigma when the constituent file carries one.
// Astronomical tide only: surge, river flow and datum offsets are not in it.
#pragma once

#include <string>

#include "corrections/core/run_inputs.h"
#include "corrections/tide/tide_predictor.h"

namespace strandline::tide {

class HarmonicTideSource final : public WaterLevelSource {
 public:
  // `origin` names the constituent file in provenance.
  HarmonicTideSource(const ConstituentSet& set, std::string origin);

  std::optional<WaterLevelAt> at(TimeS time_s, double max_gap_s) const override;
  nlohmann::json describe() const override;

  const TidePredictor& predictor() const { return predictor_; }

 private:
  TidePredictor predictor_;
  std::string origin_;
};

}  // namespace strandline::tide
