// Time conventions: UTC everywhere; seconds since 1970-01-01T00:00:00Z as double
// inside the engine; RFC 3339 / ISO 8601 text with a zone designator outside.
#pragma once

#include <string>
#include <string_view>

namespace strandline {

using TimeS = double;  // seconds since the Unix epoch, UTC

inline constexpr double kSecondsPerDay = 86400.0;
inline constexpr double kDaysPerJulianYear = 365.25;
inline constexpr double kSecondsPerJulianYear = kDaysPerJulianYear * kSecondsPerDay;

// Parses `YYYY-MM-DDTHH:MM[:SS[.fraction]](Z|+HH:MM|-HH:MM)`; a space may stand
// for the `T` and `z` for `Z`. Throws FieldError naming what is wrong ("month out
// of range", "missing zone designator", ...). Calendar validity is checked by the
// date library, not by hand.
TimeS parse_time_utc(std::string_view text);

// Formats as `2019-03-04T23:41:07Z`; sub-second parts are written (milliseconds)
// only when present.
std::string format_time_utc(TimeS time_s);

}  // namespace strandline
