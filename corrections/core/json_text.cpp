#include "corrections/core/json_text.h"

#include <istream>
#include <iterator>

#include "corrections/core/utf8_text.h"

namespace strandline {

namespace {

struct Position {
  std::int64_t line = 1;
  std::int64_t column = 1;
};

Position position_of(std::string_view text, std::size_t offset) {
  Position p;
  for (std::size_t i = 0; i < offset && i < text.size(); ++i) {
    if (text[i] == '\n') {
      ++p.line;
      p.column = 1;
    } else if ((static_cast<unsigned char>(text[i]) & 0xC0) != 0x80) {
      ++p.column;  // columns count characters, not continuation bytes
    }
  }
  return p;
}

[[noreturn]] void fail(std::string_view text, const std::string& source, std::size_t offset, const std::string& why) {
  const Position p = position_of(text, offset);
  throw JsonTextError(source, offset, p.line, p.column, why);
}

int hex_value(char c) {
  if (c >= '0' && c <= '9') return c - '0';
  if (c >= 'a' && c <= 'f') return c - 'a' + 10;
  if (c >= 'A' && c <= 'F') return c - 'A' + 10;
  return -1;
}

// A \uXXXX escape naming a control character other than tab and the line breaks.
bool escapes_a_control_character(std::string_view text, std::size_t backslash) {
  if (backslash + 5 >= text.size() || text[backslash + 1] != 'u') return false;
  int code = 0;
  for (std::size_t k = 2; k < 6; ++k) {
    const int h = hex_value(text[backslash + k]);
    if (h < 0) return false;  // the parser reports the malformed escape
    code = code * 16 + h;
  }
  return (code < 0x20 && code != '\t' && code != '\n' && code != '\r') || code == 0x7F;
}

void check_encoding(std::string_view text, const std::string& source) {
  const auto byte = [&](std::size_t i) { return static_cast<unsigned char>(text[i]); };
  if (text.size() >= 2 && ((byte(0) == 0xFF && byte(1) == 0xFE) || (byte(0) == 0xFE && byte(1) == 0xFF)))
    fail(text, source, 0, "the text is UTF-16 (it starts with a UTF-16 byte order mark); send UTF-8");
  if (text.size() >= 2 && (byte(0) == 0 || byte(1) == 0))
    fail(text, source, 0, "the text is UTF-16 or UTF-32 (it holds NUL bytes); send UTF-8");
  if (auto fault = text_fault(text, true)) fail(text, source, fault->offset, fault->reason);
}

// One pass over the text outside the parser: nesting depth and escaped control characters.
void check_structure(std::string_view text, const std::string& source) {
  std::size_t depth = 0;
  bool in_string = false;
  for (std::size_t i = 0; i < text.size(); ++i) {
    const char c = text[i];
    if (in_string) {
      if (c == '\\') {
        if (escapes_a_control_character(text, i))
          fail(text, source, i, "a string holds an escaped control character (" + std::string(text.substr(i, 6)) + ")");
        ++i;  // the escaped character cannot end the string
      } else if (c == '"') {
        in_string = false;
      }
    } else if (c == '"') {
      in_string = true;
    } else if (c == '[' || c == '{') {
      if (++depth > kMaxJsonDepth)
        fail(text, source, i, "arrays and objects nested deeper than " + std::to_string(kMaxJsonDepth) + " levels");
    } else if ((c == ']' || c == '}') && depth > 0) {
      --depth;
    }
  }
}

}  // namespace

JsonTextError::JsonTextError(const std::string& source, std::size_t byte_offset, std::int64_t line_number,
                             std::int64_t column_number, const std::string& why)
    : InputError(line_number > 0 ? source + ": line " + std::to_string(line_number) + ", column " +
                                       std::to_string(column_number) + ": " + why
                                 : source + ": " + why),
      offset(byte_offset),
      column(column_number) {
  file = source;
  line = line_number;
  reason = why;
}

nlohmann::json parse_json_text(std::string_view text, const std::string& source) {
  std::size_t start = 0;
  if (text.substr(0, 3) == "\xEF\xBB\xBF") start = 3;  // a UTF-8 byte order mark is tolerated
  const std::string_view body = text.substr(start);
  check_encoding(body, source);
  check_structure(body, source);
  try {
    return nlohmann::json::parse(body.begin(), body.end());
  } catch (const nlohmann::json::parse_error& e) {
    // e.byte is 1-based and points just past the offending token.
    const std::size_t at = e.byte > 0 ? std::min<std::size_t>(e.byte - 1, body.size()) : 0;
    std::string why = e.what();
    const auto colon = why.find(": ");  // drop the library's "[json.exception.parse_error.101] ... at line..: " prefix
    if (colon != std::string::npos) why = why.substr(colon + 2);
    fail(body, source, at, "not valid JSON: " + printable_text(why));
  } catch (const nlohmann::json::exception& e) {
    // Number overflow ("number overflow parsing '1e400'"): the library names
    // the literal but not where it is; the first occurrence is close enough.
    std::string why = e.what();
    const auto bracket = why.find("] ");
    if (bracket != std::string::npos) why = why.substr(bracket + 2);
    const auto open = why.find('\''), close = why.rfind('\'');
    if (open != std::string::npos && close > open) {
      const auto at = body.find(why.substr(open + 1, close - open - 1));
      if (at != std::string_view::npos) fail(body, source, at, "not valid JSON: " + printable_text(why));
    }
    throw JsonTextError(source, 0, 0, 0, "not valid JSON: " + printable_text(why));
  }
}

nlohmann::json parse_json_stream(std::istream& in, const std::string& source) {
  const std::string text{std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
  return parse_json_text(text, source);
}

}  // namespace strandline
