#include "server/io/id_rules.h"

#include <cstdint>

namespace strandline {

namespace {

// Length of the UTF-8 sequence at `s[i]`, 0 when it is not valid (RFC 3629:
// no overlong forms, no surrogates, nothing above U+10FFFF).
std::size_t utf8_length(std::string_view s, std::size_t i) {
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
    if (c == 0xF0 && b(1) < 0x90) return 0;  // overlong
    if (c == 0xF4 && b(1) >= 0x90) return 0;  // above U+10FFFF
    return 4;
  }
  return 0;
}

}  // namespace

std::string printable_text(std::string_view text) {
  static const char* hex = "0123456789ABCDEF";
  std::string out;
  for (std::size_t i = 0; i < text.size();) {
    const std::size_t n = utf8_length(text, i);
    const auto c = static_cast<unsigned char>(text[i]);
    if (n == 0 || (n == 1 && (c < 0x20 || c == 0x7F))) {
      out += "\\x";
      out += hex[c >> 4];
      out += hex[c & 15];
      ++i;
    } else {
      out.append(text.substr(i, n));
      i += n;
    }
  }
  return out;
}

std::optional<std::string> id_problem(std::string_view id, std::string_view what, bool names_a_path) {
  const std::string name(what);
  if (id.empty()) return "empty " + name;
  if (id.size() > kMaxIdBytes) return name + " longer than " + std::to_string(kMaxIdBytes) + " bytes";
  for (std::size_t i = 0; i < id.size();) {
    const std::size_t n = utf8_length(id, i);
    if (n == 0) return name + " is not valid UTF-8 (byte " + std::to_string(i + 1) + ")";
    const auto c = static_cast<unsigned char>(id[i]);
    if (n == 1 && (c < 0x20 || c == 0x7F)) return name + " holds a control character (byte " + std::to_string(i + 1) + ")";
    if (names_a_path && c == '/') return name + " holds \"/\" (it names a path segment of the service)";
    i += n;
  }
  return std::nullopt;
}

}  // namespace strandline
