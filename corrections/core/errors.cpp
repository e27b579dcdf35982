#include "corrections/core/errors.h"

#include "corrections/core/utf8_text.h"

namespace strandline {

namespace {
std::string format_input_error(const std::string& file, std::int64_t line, const std::string& field,
                               const std::string& value, const std::string& reason) {
  std::string message = file;
  if (line > 0) message += ":" + std::to_string(line);
  message += ": ";
  if (!field.empty()) {
    message += field;
    message += " \"" + value + "\"";
    message += ": ";
  }
  message += reason;
  return message;
}
}  // namespace

InputError::InputError(const std::string& message) : std::runtime_error(printable_message(message)) {}

ConfigError::ConfigError(const std::string& at, const std::string& reason)
    : std::runtime_error(printable_message(at + ": " + reason)), pointer(printable_text(at)) {}

InputError::InputError(const std::string& file_name, std::int64_t line_number,
                       const std::string& field_name, const std::string& value,
                       const std::string& why)
    : std::runtime_error(printable_message(format_input_error(file_name, line_number, field_name, value, why))),
      file(printable_text(file_name)),
      line(line_number),
      field(printable_text(field_name)),
      reason(printable_message(why)) {}

}  // namespace strandline
