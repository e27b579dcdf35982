// Hand-made series for the QC filter tests: a table whose corrected position is
// the given value (as if the correction had already run).
#pragma once

#include <string>
#include <vector>

#include "corrections/core/site_table.h"
#include "corrections/core/step.h"

namespace strandline::qc_test {

struct Obs {
  std::string transect, image, sensor;
  double day;
  double chainage_m;
  double cloud = kUnknown, georef = kUnknown;
};

inline SiteTable make_table(const std::vector<Obs>& obs) {
  SiteTableBuilder b;
  for (std::size_t k = 0; k < obs.size(); ++k) {
    const auto& o = obs[k];
    b.add(b.transect_index(o.transect), b.image_index(o.image), b.sensor_index(o.sensor),
          {static_cast<std::uint32_t>(k), 1.5e9 + o.day * kSecondsPerDay, o.chainage_m, o.cloud, o.georef});
  }
  SiteTable t = std::move(b).build();
  t.reset_derived();
  for (std::size_t i = 0; i < t.size(); ++i) t.chainage_m[i] = t.chainage_raw_m[i];
  return t;
}

// Row of the table holding input row k.
inline std::size_t row_of(const SiteTable& t, std::size_t k) {
  for (std::size_t i = 0; i < t.size(); ++i)
    if (t.input_row[i] == k) return i;
  return t.size();
}

inline void run_transect_step(const Step& step, SiteTable& table, const RunInputs& in) {
  StepLog log;
  for (std::size_t tr = 0; tr < table.transects.size(); ++tr)
    static_cast<const TransectStep&>(step).run(table, tr, in, log);
}
inline void run_site_step(const Step& step, SiteTable& table, const RunInputs& in) {
  StepLog log;
  static_cast<const SiteStep&>(step).run(table, in, log);
}

// A deterministic noise sequence in [-1, 1] (no RNG dependence across platforms).
inline double wobble(std::size_t k) {
  return std::sin(12.9898 * double(k) + 78.233 * double(k % 7)) * 0.5 + std::sin(0.37 * double(k * k % 101)) * 0.5;
}

}  // namespace strandline::qc_test
