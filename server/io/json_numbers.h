// A number that may be unknown (NaN) as JSON: the value, or null.
#pragma once

#include <nlohmann/json.hpp>

#include "corrections/core/site_table.h"

namespace strandline {

inline nlohmann::json number_or_null(double v) { return known(v) ? nlohmann::json(v) : nlohmann::json(nullptr); }

}  // namespace strandline
