#include "qc/transect_series.h"

#include <cmath>
#include <map>
#include <string>

#include "qc/robust_stats.h"

namespace strandline {

std::vector<char> usable_mask(const SiteTable& table, std::size_t transect) {
  const TransectInfo& t = table.transects[transect];
  std::vector<char> mask(t.size(), 0);
  for (std::size_t i = t.begin; i < t.end; ++i) mask[i - t.begin] = qc_usable(table, i) ? 1 : 0;
  return mask;
}

std::vector<double> class_noise_m(const SiteTable& table, std::size_t transect, const RunInputs& inputs,
                                  const std::vector<char>& mask, std::size_t min_pairs, double fallback_m) {
  const TransectInfo& t = table.transects[transect];
  // Class of each sensor index (class name from the sensor table, else the sensor name).
  std::vector<std::string> class_of(table.sensor_names.size());
  std::vector<double> table_sigma(table.sensor_names.size(), kUnknown);
  for (std::size_t s = 0; s < table.sensor_names.size(); ++s) {
    class_of[s] = table.sensor_names[s];
    if (inputs.sensors)
      if (auto c = inputs.sensors->lookup(table.sensor_names[s])) {
        class_of[s] = c->name;
        table_sigma[s] = c->sigma_m;
      }
  }
  std::map<std::string, std::vector<double>> diffs;
  std::map<std::string, double> last_value;
  std::vector<double> pooled;
  for (std::size_t i = t.begin; i < t.end; ++i) {
    if (!mask[i - t.begin]) continue;
    const std::string& c = class_of[table.sensor[i]];
    auto it = last_value.find(c);
    if (it != last_value.end()) {
      const double d = table.chainage_m[i] - it->second;
      diffs[c].push_back(d);
      pooled.push_back(d);
    }
    last_value[c] = table.chainage_m[i];
  }
  auto noise_of = [](std::vector<double> d) { return kMadToSigma * mad_about(d, median_in_place(d)) / std::sqrt(2.0); };
  const double pooled_noise = pooled.size() >= min_pairs ? noise_of(pooled) : kUnknown;
  std::map<std::string, double> by_class;
  for (auto& [c, d] : diffs)
    if (d.size() >= min_pairs) by_class[c] = noise_of(d);

  std::vector<double> out(t.size());
  for (std::size_t i = t.begin; i < t.end; ++i) {
    const std::size_t s = table.sensor[i];
    auto it = by_class.find(class_of[s]);
    double v = it != by_class.end() ? it->second : pooled_noise;
    if (!known(v) || !(v > 0)) v = table_sigma[s];
    if (!known(v) || !(v > 0)) v = fallback_m;
    out[i - t.begin] = v;
  }
  return out;
}

RunningLevel running_level(const SiteTable& table, std::size_t transect, const std::vector<char>& mask,
                           const LevelWindow& window) {
  const TransectInfo& t = table.transects[transect];
  const std::size_t n = t.size();
  // Usable rows (offsets into the transect) and their segment numbers.
  std::vector<std::size_t> rows;
  std::vector<int> segment_of_usable;
  int segment = 0;
  bool previous_storm = false;
  for (std::size_t k = 0; k < n; ++k) {
    if (!mask[k]) continue;
    const bool storm = has_flag(table.flags[t.begin + k], Flag::storm_response);
    if (window.break_at_storm_onsets && storm && !previous_storm && !rows.empty()) ++segment;
    previous_storm = storm;
    rows.push_back(k);
    segment_of_usable.push_back(segment);
  }
  RunningLevel level{std::vector<double>(n, kUnknown), std::vector<double>(n, kUnknown), std::vector<std::size_t>(n, 0)};
  if (rows.empty()) return level;

  const double half_s = window.half_width_days * kSecondsPerDay;
  std::vector<double> values;
  std::size_t u = 0;  // first usable row at or after k
  for (std::size_t k = 0; k < n; ++k) {
    while (u < rows.size() && rows[u] < k) ++u;
    // The segment of row k: that of the usable row at or before it (the next one if none).
    const std::size_t anchor = (u < rows.size() && rows[u] == k) ? u : (u > 0 ? u - 1 : 0);
    const int seg = segment_of_usable[anchor];
    const TimeS tk = table.time_s[t.begin + k];
    std::size_t lo = anchor, hi = anchor + 1;  // [lo, hi) over `rows`
    while (lo > 0 && segment_of_usable[lo - 1] == seg && tk - table.time_s[t.begin + rows[lo - 1]] <= half_s) --lo;
    while (hi < rows.size() && segment_of_usable[hi] == seg && table.time_s[t.begin + rows[hi]] - tk <= half_s) ++hi;
    // Widen to the nearest points of the segment when the window is too sparse.
    while (hi - lo < window.min_points) {
      const bool can_lo = lo > 0 && segment_of_usable[lo - 1] == seg;
      const bool can_hi = hi < rows.size() && segment_of_usable[hi] == seg;
      if (!can_lo && !can_hi) break;
      const double d_lo = can_lo ? tk - table.time_s[t.begin + rows[lo - 1]] : HUGE_VAL;
      const double d_hi = can_hi ? table.time_s[t.begin + rows[hi]] - tk : HUGE_VAL;
      if (d_lo <= d_hi) --lo;
      else ++hi;
    }
    values.clear();
    for (std::size_t j = lo; j < hi; ++j) values.push_back(table.chainage_m[t.begin + rows[j]]);
    std::vector<double> work = values;
    const double med = median_in_place(work);
    level.median_m[k] = med;
    level.mad_m[k] = mad_about(values, med);
    level.count[k] = values.size();
  }
  return level;
}

}  // namespace strandline
