// Strict reading of a JSON object of step parameters: every key must be known,
// every value of the right type; errors name the JSON pointer (RFC 6901).
#pragma once

#include <set>
#include <string>

#include <nlohmann/json.hpp>

#include "corrections/core/errors.h"

namespace strandline {

class ParamReader {
 public:
  // `object` may be null (all defaults). `pointer` is where it sits, e.g. "/steps/hampel".
  ParamReader(const nlohmann::json& object, std::string pointer);

  // Each reads the key when present and leaves `value` (the default) otherwise.
  void number(const std::string& key, double& value);
  void integer(const std::string& key, long long& value);
  void boolean(const std::string& key, bool& value);
  void text(const std::string& key, std::string& value);
  // Raw access for nested objects or arrays; marks the key as known.
  const nlohmann::json* raw(const std::string& key);

  std::string pointer_to(const std::string& key) const;
  [[noreturn]] void fail(const std::string& key, const std::string& reason) const;

  // Throws ConfigError for the first key that no reader asked for.
  void finish() const;

 private:
  const nlohmann::json* find(const std::string& key);
  const nlohmann::json& object_;
  std::string pointer_;
  std::set<std::string> known_;
};

// Escapes a key for use in a JSON pointer ("~" -> "~0", "/" -> "~1").
std::string json_pointer_escape(const std::string& key);

}  // namespace strandline
