// The rows of an upload body: `text/csv` with a header line, or
// `application/json` as an array of objects (or an object holding that array
// under one key, e.g. {"observations": [...]}). Both are presented as text
// fields in one column order, so one set of rules serves both encodings.
// Errors of the whole body are InputErrors (CSV: with the line) or BodyErrors
// (JSON: with the pointer); errors of one row are reported with the row.
#pragma once

#include <cstdint>
#include <functional>
#include <optional>
#include <set>
#include <string>
#include <string_view>
#include <vector>

#include "corrections/core/errors.h"
#include "server/io/column_rules.h"

namespace strandline {

enum class BodyFormat { csv, json };

// A JSON body that is not JSON (`not_json`) or not an array of rows (`pointer`).
class BodyError : public InputError {
 public:
  BodyError(const std::string& message, std::string at, bool syntax)
      : InputError(message), pointer(std::move(at)), not_json(syntax) {}
  std::string pointer;
  bool not_json;
};

struct RowSource {
  std::int64_t line = 0;       // CSV: 1-based line; JSON: 1-based array position
  std::string problem_field;   // a JSON member of the wrong type or refused
  std::string problem;         // non-empty: the row is malformed (no fields given)
};

class TabularBody {
 public:
  // `kind` names the columns the kind knows; `array_key` the member holding the
  // array in an object body. Throws InputError for a bad CSV header, BodyError
  // for a JSON body of the wrong shape.
  TabularBody(std::string_view body, BodyFormat format, const InputColumns& kind, std::string array_key);

  // The header (CSV: as in the body; JSON: the kind's columns).
  const std::vector<std::string>& header() const { return header_; }

  using RowFn = std::function<void(const std::vector<std::string>& fields, const RowSource& source)>;
  // Calls `fn` for every data row; a malformed row (field count, quotes, a JSON
  // member of the wrong type or refused by the column rule) comes with
  // `source.problem` set and no fields.
  void for_each(const RowFn& fn);

  // JSON members allowed as extras by the column rule and left out (sorted).
  const std::set<std::string>& ignored_members() const { return ignored_; }

 private:
  std::string_view body_;
  BodyFormat format_;
  const InputColumns& kind_;
  std::string array_key_;
  std::vector<std::string> header_;
  std::set<std::string> ignored_;
};

}  // namespace strandline
