// The rows of an upload body: `text/csv` with a header line, or
// `application/json` as an array of objects (or an object holding that array
// under one key, e.g. {"observations": [...]}). Both are presented as text
// fields in a fixed column order, so one validation serves both encodings.
#pragma once

#include <cstdint>
#include <functional>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace strandline::http {

enum class BodyFormat { csv, json };

// 415 Problem unless the media type is text/csv or application/json.
BodyFormat body_format_of(std::string_view content_type);

struct RowSource {
  std::int64_t line = 0;  // CSV: 1-based line; JSON: 1-based array position
  std::optional<std::string> json_problem_field;  // a JSON member of the wrong type or unknown
  std::string json_problem;
};

class TabularBody {
 public:
  // `columns` are the names the kind knows (JSON members outside them are row
  // errors); `array_key` is the member holding the array in an object body.
  // Throws Problem (400 bad JSON, 422 missing columns / wrong shape).
  TabularBody(std::string_view body, BodyFormat format, std::vector<std::string> columns, std::string array_key);

  // The header (CSV: as in the body; JSON: `columns`).
  const std::vector<std::string>& header() const { return header_; }

  using RowFn = std::function<void(const std::vector<std::string>& fields, const RowSource& source)>;
  // Calls `fn` for every data row. CSV structure errors (field count, quotes)
  // are reported as a row with `json_problem` set and no fields.
  void for_each(const RowFn& fn) const;

 private:
  std::string_view body_;
  BodyFormat format_;
  std::vector<std::string> columns_;
  std::string array_key_;
  std::vector<std::string> header_;
};

}  // namespace strandline::http
