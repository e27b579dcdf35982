// Text rules shared by every input: what reaches a reply, a log or the store
// is valid UTF-8 (RFC 3629) without control characters other than tab and the
// line breaks. A fault is reported with its byte offset, never with the raw
// bytes (they would make the message itself invalid).
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <string_view>

namespace strandline {

// Length of the UTF-8 sequence starting at `s[i]`; 0 when it is not valid (no
// overlong forms, no surrogates, nothing above U+10FFFF).
std::size_t utf8_sequence_length(std::string_view s, std::size_t i);

struct TextFault {
  std::size_t offset = 0;  // 0-based byte offset of the offending byte
  std::string reason;      // e.g. "invalid UTF-8 byte 0xE9 at byte 6"
};

// The first byte of `text` that is not valid UTF-8 or is a control character
// (tab, and CR/LF when `line_breaks_allowed`, excepted); nothing when the text is clean.
std::optional<TextFault> text_fault(std::string_view text, bool line_breaks_allowed = false);

// `text` with every byte that is not valid UTF-8, and every control character,
// written as \xNN: safe to show in a message, a JSON reply or a log.
std::string printable_text(std::string_view text);

// The same, keeping tab and line breaks: for messages of several lines.
std::string printable_message(std::string_view text);

}  // namespace strandline
