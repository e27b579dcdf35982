#include "qc/residual_table.h"

namespace strandline {

ResidualTable build_residual_table(const SiteTable& table, const RunInputs& inputs, const LevelWindow& window,
                                   FlagSet tolerated) {
  ResidualTable out;
  out.residual_m.assign(table.size(), kUnknown);
  out.noise_m.assign(table.size(), kUnknown);
  out.rows_by_image.resize(table.image_ids.size());
  const FlagSet blocking = rejecting_flags() & ~tolerated;
  for (std::size_t tr = 0; tr < table.transects.size(); ++tr) {
    const TransectInfo& t = table.transects[tr];
    const auto mask = usable_mask(table, tr);
    const auto noise = class_noise_m(table, tr, inputs, mask);
    const auto level = running_level(table, tr, mask, window);
    for (std::size_t i = t.begin; i < t.end; ++i) {
      const std::size_t k = i - t.begin;
      out.noise_m[i] = noise[k];
      if (!known(table.chainage_m[i]) || (table.flags[i] & blocking) != 0 || !known(level.median_m[k])) continue;
      out.residual_m[i] = table.chainage_m[i] - level.median_m[k];
      out.rows_by_image[table.image[i]].push_back(i);
    }
  }
  return out;
}

}  // namespace strandline
