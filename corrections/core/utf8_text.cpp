#include "corrections/core/utf8_text.h"

namespace strandline {

namespace {

const char* const kHex = "0123456789ABCDEF";

std::string hex_byte(unsigned char c) { return std::string("0x") + kHex[c >> 4] + kHex[c & 15]; }

bool is_control(unsigned char c) { return c < 0x20 || c == 0x7F; }

}  // namespace

std::size_t utf8_sequence_length(std::string_view s, std::size_t i) {
  const auto b = [&](std::size_t k) { return static_cast<unsigned char>(s[i + k]); };
  const auto cont = [&](std::size_t k) { return i + k < s.size() && (b(k) & 0xC0) == 0x80; };
  const unsigned char c = b(0);
  if (c < 0x80) return 1;
  if (c >= 0xC2 && c <= 0xDF) return cont(1) ? 2 : 0;
  if (c >= 0xE0 && c <= 0xEF) {
    if (!cont(1) || !cont(2)) return 0;
    if (c == 0xE0 && b(1) < 0xA0) return 0;   // overlong
    if (c == 0xED && b(1) >= 0xA0) return 0;  // surrogate
    return 3;
  }
  if (c >= 0xF0 && c <= 0xF4) {
    if (!cont(1) || !cont(2) || !cont(3)) return 0;
    if (c == 0xF0 && b(1) < 0x90) return 0;   // overlong
    if (c == 0xF4 && b(1) >= 0x90) return 0;  // above U+10FFFF
    return 4;
  }
  return 0;
}

std::optional<TextFault> text_fault(std::string_view text, bool line_breaks_allowed) {
  for (std::size_t i = 0; i < text.size();) {
    const auto c = static_cast<unsigned char>(text[i]);
    if (c >= 0x20 && c < 0x7F) {  // the common case: printable ASCII
      ++i;
      continue;
    }
    const std::size_t n = utf8_sequence_length(text, i);
    if (n == 0) return TextFault{i, "invalid UTF-8 byte " + hex_byte(c) + " at byte " + std::to_string(i + 1)};
    if (n == 1 && is_control(c) && c != '\t' && !(line_breaks_allowed && (c == '\r' || c == '\n')))
      return TextFault{i, "control character " + hex_byte(c) + " at byte " + std::to_string(i + 1)};
    i += n;
  }
  return std::nullopt;
}

namespace {
std::string escaped(std::string_view text, bool keep_line_breaks) {
  std::string out;
  out.reserve(text.size());
  for (std::size_t i = 0; i < text.size();) {
    const std::size_t n = utf8_sequence_length(text, i);
    const auto c = static_cast<unsigned char>(text[i]);
    const bool kept = keep_line_breaks && (c == '\n' || c == '\r' || c == '\t');
    if (n == 0 || (n == 1 && is_control(c) && !kept)) {
      out += "\\x";
      out += kHex[c >> 4];
      out += kHex[c & 15];
      ++i;
    } else {
      out.append(text.substr(i, n));
      i += n;
    }
  }
  return out;
}
}  // namespace

std::string printable_text(std::string_view text) { return escaped(text, false); }

std::string printable_message(std::string_view text) { return escaped(text, true); }

}  // namespace strandline
