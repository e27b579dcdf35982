// Helpers shared by the files implementing SqliteStore.
#pragma once

#include <cstdint>
#include <optional>
#include <string>

#include "server/store/sqlite_connection.h"

namespace strandline::store::detail {

// The internal key of a site; throws NotFound.
std::int64_t site_key(Connection& db, const std::string& site_id);

// Doubles stored and read back through SQLite REAL are bit-identical; NaN (NULL) equals NaN.
bool same_value(double a, double b);

}  // namespace strandline::store::detail
