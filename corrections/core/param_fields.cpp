#include "corrections/core/param_fields.h"

#include <charconv>
#include <cmath>

#include "corrections/core/errors.h"

namespace strandline {

namespace {

// Shortest text that reads back to the same double; whole numbers without
// exponent ("10800", not "1.08e+04"), exponents without padding ("1e-4").
std::string number_text(double v) {
  if (v == std::trunc(v) && std::abs(v) < 1e15) return std::to_string(static_cast<long long>(v));
  char buf[64];
  const auto end = std::to_chars(buf, buf + sizeof buf, v).ptr;
  std::string s(buf, end);
  if (auto e = s.find('e'); e != std::string::npos) {
    std::string mantissa = s.substr(0, e), exponent = s.substr(e + 1);
    const bool negative = exponent[0] == '-';
    if (exponent[0] == '+' || exponent[0] == '-') exponent.erase(0, 1);
    exponent.erase(0, std::min(exponent.find_first_not_of('0'), exponent.size() - 1));
    s = mantissa + "e" + (negative ? "-" : "") + exponent;
  }
  return s;
}

bool only_lower_zero(const ParamSpec& s) { return s.lower.present && s.lower.value == 0 && !s.upper.present; }

bool within(double v, const ParamSpec& s) {
  if (s.lower.present && !(s.lower.inclusive ? v >= s.lower.value : v > s.lower.value)) return false;
  if (s.upper.present && !(s.upper.inclusive ? v <= s.upper.value : v < s.upper.value)) return false;
  return true;
}

std::string choices_text(const ParamSpec& s, const char* quote) {
  std::string out;
  for (std::size_t i = 0; i < s.choices.size(); ++i)
    out += (i ? ", " : "") + std::string(quote) + std::string(s.choices[i]) + quote;
  return out;
}

std::string default_text(const ParamSpec& s, const nlohmann::json& v) {
  switch (s.kind) {
    case ParamKind::number: return number_text(v.get<double>());
    case ParamKind::integer: return std::to_string(v.get<long long>());
    case ParamKind::boolean: return v.get<bool>() ? "true" : "false";
    case ParamKind::text: return "`" + v.get<std::string>() + "`";
  }
  return "";
}

std::string article(const std::string& noun) { return (noun[0] == 'i' ? "an " : "a ") + noun; }

const char* kind_text(ParamKind k) {
  switch (k) {
    case ParamKind::number: return "number";
    case ParamKind::integer: return "integer";
    case ParamKind::boolean: return "boolean";
    case ParamKind::text: return "text";
  }
  return "";
}

std::string escape_cell(std::string_view text) {
  std::string out;
  for (char c : text) out += c == '|' ? std::string("\\|") : std::string(1, c);
  return out;
}

}  // namespace

std::string param_range_text(const ParamSpec& s) {
  if (s.kind == ParamKind::boolean) return "true or false";
  if (s.kind == ParamKind::text) return s.choices.empty() ? "any text" : "one of " + choices_text(s, "");
  if (only_lower_zero(s)) return s.lower.inclusive ? "non-negative" : "positive";
  if (s.lower.present && s.upper.present)
    return std::string(s.lower.inclusive ? "[" : "(") + number_text(s.lower.value) + ", " +
           number_text(s.upper.value) + (s.upper.inclusive ? "]" : ")");
  if (s.lower.present) return (s.lower.inclusive ? ">= " : "> ") + number_text(s.lower.value);
  if (s.upper.present) return (s.upper.inclusive ? "<= " : "< ") + number_text(s.upper.value);
  return "any";
}

void check_param_value(const ParamSpec& s, const nlohmann::json& value, const std::string& pointer) {
  if (s.kind == ParamKind::boolean) return;
  if (s.kind == ParamKind::text) {
    const std::string text = value.get<std::string>();
    for (auto c : s.choices)
      if (c == text) return;
    if (!s.choices.empty()) throw ConfigError(pointer, "expected one of " + choices_text(s, "\""));
    return;
  }
  if (within(value.get<double>(), s)) return;
  // "expected a positive number", "expected an integer in [3, 1000]", "expected a number >= 1"
  const std::string noun = s.kind == ParamKind::integer ? "integer" : "number";
  const std::string range = param_range_text(s);
  std::string message;
  if (only_lower_zero(s)) message = "expected a " + range + " " + noun;
  else if (s.lower.present && s.upper.present) message = "expected " + article(noun) + " in " + range;
  else message = "expected " + article(noun) + " " + range;
  if (!s.unit.empty()) message += " (" + std::string(s.unit) + ")";
  throw ConfigError(pointer, message);
}

std::string param_table_markdown(const std::vector<ParamSpec>& specs, const std::vector<nlohmann::json>& defaults) {
  if (specs.empty()) return "No parameters.\n";
  std::string out =
      "| parameter | type | default | unit | allowed | meaning |\n"
      "| --- | --- | --- | --- | --- | --- |\n";
  for (std::size_t i = 0; i < specs.size(); ++i) {
    const ParamSpec& s = specs[i];
    out += "| `" + std::string(s.name) + "` | " + kind_text(s.kind) + " | " + escape_cell(default_text(s, defaults[i]));
    out += " | " + escape_cell(s.unit) + " | " + escape_cell(param_range_text(s)) + " | " + escape_cell(s.meaning);
    out += " |\n";
  }
  return out;
}

}  // namespace strandline
