// Each step parameter is declared once, as a ParamField of the step's Params:
// name, member, unit, range and a one-line meaning. That one list drives strict
// reading (unknown keys and wrong types are ConfigErrors naming the JSON
// pointer), the range checks, the effective parameters recorded in provenance
// and the step's parameter table in server/FORMATS.md. A rule between two
// fields stays in the Params' own `validate(pointer)`, called after the fields
// pass their ranges.
#pragma once

#include <span>
#include <string>
#include <string_view>
#include <vector>

#include <nlohmann/json.hpp>

#include "corrections/core/param_reader.h"

namespace strandline {

// One end of a numeric range; absent by default.
struct ParamBound {
  bool present = false;
  double value = 0.0;
  bool inclusive = false;
};
constexpr ParamBound greater_than(double v) { return {true, v, false}; }
constexpr ParamBound at_least(double v) { return {true, v, true}; }
constexpr ParamBound less_than(double v) { return {true, v, false}; }
constexpr ParamBound at_most(double v) { return {true, v, true}; }

enum class ParamKind { number, integer, boolean, text };

// What the checks and the documentation need of a field, whatever its Params.
struct ParamSpec {
  std::string_view name;
  ParamKind kind;
  std::string_view unit;
  ParamBound lower, upper;
  std::string_view meaning;
  std::span<const std::string_view> choices;  // text: allowed values, empty = any
};

// How a field reaches its member: the member's kind, and reading and writing
// it by its type (so no code is generated for types the member does not have).
template <class Params>
struct ParamAccess {
  ParamKind kind;
  nlohmann::json (*get)(const Params&);
  void (*read)(ParamReader&, const std::string& key, Params&);
};

namespace param_fields_detail {
inline void read(ParamReader& r, const std::string& key, double& v) { r.number(key, v); }
inline void read(ParamReader& r, const std::string& key, long long& v) { r.integer(key, v); }
inline void read(ParamReader& r, const std::string& key, bool& v) { r.boolean(key, v); }
inline void read(ParamReader& r, const std::string& key, std::string& v) { r.text(key, v); }

template <class T> constexpr ParamKind kind_of();
template <> constexpr ParamKind kind_of<double>() { return ParamKind::number; }
template <> constexpr ParamKind kind_of<long long>() { return ParamKind::integer; }
template <> constexpr ParamKind kind_of<bool>() { return ParamKind::boolean; }
template <> constexpr ParamKind kind_of<std::string>() { return ParamKind::text; }

template <class T> struct member_types;
template <class Owner, class Value> struct member_types<Value Owner::*> {
  using owner = Owner;
  using value = Value;
};
}  // namespace param_fields_detail

// `member_of<&Params::k>`: the access to one member (double, long long, bool or std::string).
template <auto Member>
inline constexpr ParamAccess<typename param_fields_detail::member_types<decltype(Member)>::owner> member_of = {
    param_fields_detail::kind_of<typename param_fields_detail::member_types<decltype(Member)>::value>(),
    [](const auto& p) { return nlohmann::json(p.*Member); },
    [](ParamReader& r, const std::string& key, auto& p) { param_fields_detail::read(r, key, p.*Member); }};

template <class Params>
struct ParamField {
  std::string_view name;
  ParamAccess<Params> member;  // member_of<&Params::name>
  std::string_view unit{};     // e.g. "m", "s", "days"; empty when dimensionless or a count
  ParamBound lower{};          // numbers and integers only
  ParamBound upper{};
  std::string_view meaning{};
  std::span<const std::string_view> choices{};  // text only: the allowed values (empty = any text)

  ParamSpec spec() const { return {name, member.kind, unit, lower, upper, meaning, choices}; }
};

template <class Params>
using ParamList = std::vector<ParamField<Params>>;

// Throws ConfigError(pointer, "expected ...") when `value` is outside the field's range or choices.
void check_param_value(const ParamSpec& spec, const nlohmann::json& value, const std::string& pointer);
// The range as the documentation and the error messages word it: "positive", "[3, 1000]", ">= 8", ...
std::string param_range_text(const ParamSpec& spec);
// A Markdown table of the fields with their defaults (or "No parameters." when there are none).
std::string param_table_markdown(const std::vector<ParamSpec>& specs, const std::vector<nlohmann::json>& defaults);

// The effective parameters: every field by name, defaults filled in.
template <class Params>
nlohmann::json params_json(const ParamList<Params>& fields, const Params& p) {
  nlohmann::json j = nlohmann::json::object();
  for (const auto& f : fields) j[std::string(f.name)] = f.member.get(p);
  return j;
}

// Reads `object` (null = all defaults) at `pointer`: wrong types, then unknown
// keys, then ranges (defaults included), then Params::validate(pointer) if any.
template <class Params>
Params read_params(const ParamList<Params>& fields, const nlohmann::json& object, const std::string& pointer) {
  Params p{};
  ParamReader reader(object, pointer);
  for (const auto& f : fields) f.member.read(reader, std::string(f.name), p);
  reader.finish();
  for (const auto& f : fields)
    check_param_value(f.spec(), f.member.get(p), reader.pointer_to(std::string(f.name)));
  if constexpr (requires(const Params& q, const std::string& s) { q.validate(s); }) p.validate(pointer);
  return p;
}

// The Markdown parameter table of server/FORMATS.md, defaults taken from `defaults`.
template <class Params>
std::string params_markdown_table(const ParamList<Params>& fields, const Params& defaults) {
  std::vector<ParamSpec> specs;
  std::vector<nlohmann::json> values;
  for (const auto& f : fields) {
    specs.push_back(f.spec());
    values.push_back(f.member.get(defaults));
  }
  return param_table_markdown(specs, values);
}

}  // namespace strandline
