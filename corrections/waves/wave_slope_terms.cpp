#include "corrections/waves/wave_slope_terms.h"

#include <stdexcept>

#include "corrections/waves/stockdon.h"

namespace strandline {

WaveSlopeTerms::WaveSlopeTerms(const SiteTable& table, std::span<const std::size_t> rows, const RunInputs& inputs)
    : correction_(inputs.wave_correction), have_waves_(inputs.waves != nullptr) {
  h0_m_.reserve(rows.size());
  l0_m_.reserve(rows.size());
  for (std::size_t r : rows) {
    h0_m_.push_back(table.hs0_m[r]);
    l0_m_.push_back(table.l0_m[r]);
  }
}

WaveSlopeTerms::WaveSlopeTerms(std::vector<double> h0_m, std::vector<double> l0_m, WaveCorrection correction)
    : h0_m_(std::move(h0_m)), l0_m_(std::move(l0_m)), correction_(correction), have_waves_(true) {
  if (h0_m_.size() != l0_m_.size()) throw std::invalid_argument("WaveSlopeTerms: H0 and L0 differ in length");
}

std::vector<double> WaveSlopeTerms::horizontal_m() const {
  if (!have_waves_ || correction_ != WaveCorrection::setup) return {};
  std::vector<double> h(size(), 0.0);
  for (std::size_t i = 0; i < size(); ++i)
    if (known(h0_m_[i]) && known(l0_m_[i])) h[i] = setup_horizontal_m(h0_m_[i], l0_m_[i]);
  return h;
}

void WaveSlopeTerms::horizontal_at(double tan_beta, std::span<double> out) const {
  if (out.size() != size()) throw std::invalid_argument("WaveSlopeTerms: output size differs from the images");
  for (std::size_t i = 0; i < size(); ++i) {
    out[i] = 0.0;
    if (!have_waves_ || !known(h0_m_[i]) || !known(l0_m_[i])) continue;
    if (correction_ == WaveCorrection::setup) out[i] = setup_horizontal_m(h0_m_[i], l0_m_[i]);
    else if (correction_ == WaveCorrection::runup) out[i] = stockdon_terms(h0_m_[i], l0_m_[i], tan_beta).runup_m / tan_beta;
  }
}

WaveCorrectedSeriesFn WaveSlopeTerms::corrected_series(std::span<const double> raw_m,
                                                       std::span<const double> water_m) const {
  if (raw_m.size() != size() || water_m.size() != size())
    throw std::invalid_argument("WaveSlopeTerms: series sizes differ from the images");
  return [this, raw_m, water_m](double tan_beta, std::span<double> out) {
    horizontal_at(tan_beta, out);
    for (std::size_t i = 0; i < out.size(); ++i) out[i] += raw_m[i] + water_m[i] / tan_beta;
  };
}

std::size_t WaveSlopeTerms::dissipative_count(double tan_beta) const {
  std::size_t n = 0;
  for (std::size_t i = 0; i < size(); ++i)
    if (known(h0_m_[i]) && known(l0_m_[i]) && iribarren_number(h0_m_[i], l0_m_[i], tan_beta) < kStockdonDissipativeIribarren) ++n;
  return n;
}

}  // namespace strandline
