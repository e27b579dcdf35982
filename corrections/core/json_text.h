// JSON text from outside (a file, a request body, a stored document) is
// checked before the parser sees it: UTF-8 (a UTF-16 or UTF-32 text is named as
// such), no control characters in strings (not even as \u escapes, except tab
// and line breaks), at most kMaxJsonDepth nested arrays and objects (the
// parser's copies and serialisation recurse, so a deep document would overflow
// the stack), and numbers the parser can hold (1e400 is refused, not a crash).
#pragma once

#include <cstddef>
#include <string>
#include <string_view>

#include <nlohmann/json.hpp>

#include "corrections/core/errors.h"

namespace strandline {

inline constexpr std::size_t kMaxJsonDepth = 64;

// JSON text that cannot be accepted; what() is "<source>: line L, column C: reason".
class JsonTextError : public InputError {
 public:
  JsonTextError(const std::string& source, std::size_t byte_offset, std::int64_t line, std::int64_t column,
                const std::string& reason);
  std::size_t offset;  // 0-based byte offset of the fault in the text
  std::int64_t column;
};

// Throws JsonTextError naming `source` when the text breaks a rule above or is not JSON.
nlohmann::json parse_json_text(std::string_view text, const std::string& source);

// Same for a stream (a file): reads it whole first.
nlohmann::json parse_json_stream(std::istream& in, const std::string& source);

}  // namespace strandline
