// Shore-normal transects along a baseline polyline: one every `spacing_m`
// metres of baseline (measured in the work CRS, from each line's first
// vertex), perpendicular to the baseline's local direction, pointing to the
// seaward side.
#pragma once

#include <cstddef>
#include <optional>
#include <string>

#include "server/geo/geo_types.h"

namespace strandline::geo {

enum class SeaSide { left, right };  // sea on the left/right walking along the line
SeaSide sea_side_from_name(const std::string& name);  // throws ArgumentError

struct BaselineOptions {
  std::optional<std::string> layer;
  std::optional<std::string> crs;  // work CRS when the baseline is not projected
  double spacing_m = 50.0;
  double length_m = 400.0;
  double landward_m = 0.0;         // the origin lies this far landward of the baseline
  double direction_window_m = kUnknown;   // baseline direction over this window; unknown: spacing
  SeaSide sea_side = SeaSide::left;
  std::string id_prefix = "T";
};

struct BaselineTransects {
  TransectSet set;
  std::size_t crossing_neighbours = 0;  // adjacent transects that cross each other
};

// Throws InputError naming layer and FID for empty, non-line or
// self-intersecting baselines, a missing CRS; ArgumentError for bad options.
BaselineTransects transects_from_baseline(const std::string& path, const BaselineOptions& options);

}  // namespace strandline::geo
