#include "server/http/tabular_body.h"

#include <cctype>
#include <string>

#include "server/http/problem.h"

namespace strandline::http {

namespace {

std::string_view media_type(std::string_view content_type) {
  auto semicolon = content_type.find(';');
  auto t = content_type.substr(0, semicolon);
  while (!t.empty() && t.back() == ' ') t.remove_suffix(1);
  return t;
}

std::string lower(std::string_view s) {
  std::string out(s);
  for (auto& c : out) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return out;
}

}  // namespace

BodyFormat body_format_of(std::string_view content_type) {
  const std::string t = lower(media_type(content_type));
  if (t == "text/csv") return BodyFormat::csv;
  if (t == "application/json") return BodyFormat::json;
  throw Problem(415, problem_type::unsupported_media_type, "Unsupported media type",
                "expected Content-Type text/csv or application/json, got \"" + std::string(content_type) + "\"");
}

}  // namespace strandline::http
