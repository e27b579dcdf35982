// Degrees and radians in the tide code (astronomical arguments, phases, lags).
#pragma once

#include <numbers>

namespace strandline::tide {

inline constexpr double kRad = std::numbers::pi / 180.0;  // radians per degree
inline constexpr double kDeg = 180.0 / std::numbers::pi;  // degrees per radian

}  // namespace strandline::tide
