#include "server/io/id_rules.h"

#include <cstdint>

#include "corrections/core/utf8_text.h"

namespace strandline {

std::optional<std::string> id_problem(std::string_view id, std::string_view what, bool names_a_path) {
  const std::string name(what);
  if (id.empty()) return "empty " + name;
  if (id.size() > kMaxIdBytes) return name + " longer than " + std::to_string(kMaxIdBytes) + " bytes";
  for (std::size_t i = 0; i < id.size();) {
    const std::size_t n = utf8_sequence_length(id, i);
    if (n == 0) return name + " is not valid UTF-8 (byte " + std::to_string(i + 1) + ")";
    const auto c = static_cast<unsigned char>(id[i]);
    if (n == 1 && (c < 0x20 || c == 0x7F)) return name + " holds a control character (byte " + std::to_string(i + 1) + ")";
    if (names_a_path && c == '/') return name + " holds \"/\" (it names a path segment of the service)";
    i += n;
  }
  return std::nullopt;
}

std::optional<std::string> site_id_problem(std::string_view id) {
  const bool ok = !id.empty() && id.size() <= 64 &&
                  id.find_first_not_of("ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789._-") ==
                      std::string_view::npos;
  if (ok) return std::nullopt;
  return "site id \"" + printable_text(id) + "\" must be 1-64 characters of A-Z a-z 0-9 . _ -";
}

}  // namespace strandline
