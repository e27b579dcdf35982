// Error types shared by every layer. Each carries enough context to point a user
// at the offending file, line and field; the CLI maps them to exit codes and the
// HTTP layer to RFC 7807 problem types.
#pragma once

#include <cstdint>
#include <stdexcept>
#include <string>

namespace strandline {

// Process exit codes of the CLI (documented in the formats reference).
inline constexpr int kExitOk = 0;
inline constexpr int kExitInternal = 1;
inline constexpr int kExitBadInput = 2;
inline constexpr int kExitNothingCorrected = 3;  // the run ended but corrected no row (reason printed)

// A malformed value inside one field: raised by low-level parsers that do not
// know the file or line; callers wrap it into an InputError.
class FieldError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

// Bad user input (file content, option value, configuration). `what()` is the
// full message, e.g. `obs.csv:1043: time "2019-13-01T00:00Z": month out of range`.
// Messages quote what users sent, and they reach replies and logs: every byte
// that is not UTF-8 text is written as \xNN when the error is made (utf8_text.h).
class InputError : public std::runtime_error {
 public:
  explicit InputError(const std::string& message);
  InputError(const std::string& file, std::int64_t line, const std::string& field,
             const std::string& value, const std::string& reason);

  // Location parts, kept for machine-readable error reports (HTTP problem rows).
  std::string file;
  std::int64_t line = 0;  // 1-based; 0 when the error concerns the whole file
  std::string field;
  std::string reason;
};

// A bad value handed to a library function (a rule name, a distance, a file
// name's extension) rather than bad file content. Worded in terms of the value,
// never of a CLI option: each face says where the value came from. An
// InputError, so the faces map it like bad input (exit 2, HTTP 4xx).
class ArgumentError : public InputError {
 public:
  explicit ArgumentError(const std::string& message) : InputError(message) {}
};

// Bad command line or option combination (the CLI face only).
class UsageError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

// Invalid pipeline configuration; the message starts with the JSON pointer.
class ConfigError : public std::runtime_error {
 public:
  ConfigError(const std::string& pointer, const std::string& reason);
  std::string pointer;
};

}  // namespace strandline
