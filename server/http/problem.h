// RFC 7807 problem details: every error the service answers is one of these,
// with a stable `type` URI per kind of error so clients can branch on it.
#pragma once

#include <stdexcept>
#include <string>

#include <nlohmann/json.hpp>

namespace strandline::http {

// The stable problem types (relative URIs under /problems/), listed in the
// formats reference and the OpenAPI document.
namespace problem_type {
inline constexpr const char* bad_json = "/problems/bad-json";
inline constexpr const char* bad_request = "/problems/bad-request";
inline constexpr const char* unauthorized = "/problems/unauthorized";
inline constexpr const char* forbidden = "/problems/forbidden";
inline constexpr const char* not_found = "/problems/not-found";
inline constexpr const char* method_not_allowed = "/problems/method-not-allowed";
inline constexpr const char* conflict = "/problems/conflict";
inline constexpr const char* already_exists = "/problems/already-exists";
inline constexpr const char* too_large = "/problems/payload-too-large";
inline constexpr const char* unsupported_media_type = "/problems/unsupported-media-type";
inline constexpr const char* invalid_rows = "/problems/invalid-rows";
inline constexpr const char* invalid_body = "/problems/invalid-body";
inline constexpr const char* invalid_config = "/problems/invalid-run-options";
inline constexpr const char* insufficient_storage = "/problems/insufficient-storage";
inline constexpr const char* overloaded = "/problems/overloaded";
inline constexpr const char* internal = "/problems/internal-error";
}  // namespace problem_type

// Thrown by handlers; the router renders it as application/problem+json.
class Problem : public std::runtime_error {
 public:
  Problem(int status, std::string type, std::string title, std::string detail,
          nlohmann::json extra = nlohmann::json::object())
      : std::runtime_error(detail),
        status(status),
        type(std::move(type)),
        title(std::move(title)),
        detail(std::move(detail)),
        extra(std::move(extra)) {}

  nlohmann::json to_json(const std::string& instance) const;

  int status;
  std::string type;
  std::string title;
  std::string detail;
  nlohmann::json extra;  // members added to the problem object (e.g. "rows")
};

inline constexpr const char* kProblemContentType = "application/problem+json";

}  // namespace strandline::http
