// Identifiers of the data (transect and image ids): one rule for every input
// and both faces. An id is text a person typed or a program wrote: 1 to 128
// bytes of valid UTF-8 without control characters; a transect id also names a
// URL path segment of the service, so it holds no "/".
#pragma once

#include <optional>
#include <string>
#include <string_view>

#include "corrections/core/utf8_text.h"  // printable_text, for messages about ids

namespace strandline {

inline constexpr std::size_t kMaxIdBytes = 128;

// Why `id` is not a valid identifier ("transect id", "image id" in `what`), or nothing.
std::optional<std::string> id_problem(std::string_view id, std::string_view what, bool names_a_path = false);

// A site id names URL paths, files and key scopes: 1-64 characters of A-Z a-z 0-9 . _ -.
// Why `id` is not one, or nothing.
std::optional<std::string> site_id_problem(std::string_view id);


}  // namespace strandline
