// The compact residual table the per-site filters work on: for each point, its
// departure from its own transect's robust running level (storm-aware running
// median of the accepted points), with the transect's noise for its sensor
// class, grouped by image.
#pragma once

#include <vector>

#include "corrections/core/run_inputs.h"
#include "corrections/core/site_table.h"
#include "qc/transect_series.h"

namespace strandline {

struct ResidualTable {
  std::vector<double> residual_m;  // per table row; NaN when the row takes no part
  std::vector<double> noise_m;     // per table row
  std::vector<std::vector<std::size_t>> rows_by_image;  // rows with a residual, by image index
};

// A row takes part when it is corrected and rejected by no flag outside
// `tolerated` (e.g. per-transect outlier flags, which an image-level fit must
// still see). Levels come from the accepted rows only.
ResidualTable build_residual_table(const SiteTable& table, const RunInputs& inputs, const LevelWindow& window,
                                   FlagSet tolerated);

}  // namespace strandline
