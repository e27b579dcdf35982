#include "corrections/core/param_reader.h"

#include <cmath>

namespace strandline {

namespace {
const nlohmann::json& null_json() {
  static const nlohmann::json n = nullptr;
  return n;
}
}  // namespace

std::string json_pointer_escape(const std::string& key) {
  std::string out;
  for (char c : key) {
    if (c == '~') out += "~0";
    else if (c == '/') out += "~1";
    else out += c;
  }
  return out;
}

ParamReader::ParamReader(const nlohmann::json& object, std::string pointer)
    : object_(object.is_null() ? null_json() : object), pointer_(std::move(pointer)) {
  if (!object_.is_null() && !object_.is_object())
    throw ConfigError(pointer_.empty() ? "/" : pointer_, "expected a JSON object");
}

std::string ParamReader::pointer_to(const std::string& key) const {
  return pointer_ + "/" + json_pointer_escape(key);
}

void ParamReader::fail(const std::string& key, const std::string& reason) const {
  throw ConfigError(pointer_to(key), reason);
}

const nlohmann::json* ParamReader::find(const std::string& key) {
  known_.insert(key);
  if (object_.is_null()) return nullptr;
  auto it = object_.find(key);
  return it == object_.end() ? nullptr : &*it;
}

void ParamReader::number(const std::string& key, double& value) {
  if (const auto* v = find(key)) {
    if (!v->is_number()) fail(key, "expected a number");
    const double d = v->get<double>();
    if (!std::isfinite(d)) fail(key, "expected a finite number");
    value = d;
  }
}

void ParamReader::integer(const std::string& key, long long& value) {
  if (const auto* v = find(key)) {
    if (!v->is_number_integer()) fail(key, "expected an integer");
    value = v->get<long long>();
  }
}

void ParamReader::boolean(const std::string& key, bool& value) {
  if (const auto* v = find(key)) {
    if (!v->is_boolean()) fail(key, "expected true or false");
    value = v->get<bool>();
  }
}

void ParamReader::text(const std::string& key, std::string& value) {
  if (const auto* v = find(key)) {
    if (!v->is_string()) fail(key, "expected a string");
    value = v->get<std::string>();
  }
}

const nlohmann::json* ParamReader::raw(const std::string& key) { return find(key); }

void ParamReader::finish() const {
  if (object_.is_null()) return;
  for (auto it = object_.begin(); it != object_.end(); ++it)
    if (!known_.count(it.key())) throw ConfigError(pointer_to(it.key()), "unknown key");
}

}  // namespace strandline
