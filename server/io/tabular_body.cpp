#include "server/io/tabular_body.h"

#include <algorithm>
#include <istream>
#include <streambuf>

#include <nlohmann/json.hpp>

#include "corrections/core/csv_reader.h"
#include "corrections/core/json_text.h"

namespace strandline {

namespace {

// An istream over a body without copying it.
class ViewBuffer : public std::streambuf {
 public:
  explicit ViewBuffer(std::string_view text) {
    char* p = const_cast<char*>(text.data());
    setg(p, p, p + text.size());
  }
};

}  // namespace

TabularBody::TabularBody(std::string_view body, BodyFormat format, const InputColumns& kind, std::string array_key)
    : body_(body), format_(format), kind_(kind), array_key_(std::move(array_key)) {
  if (format_ == BodyFormat::json) {
    for (const auto& c : kind_.columns) header_.emplace_back(c.name);
    return;
  }
  ViewBuffer buffer(body_);
  std::istream in(&buffer);
  CsvTable table(in, "body");
  header_ = table.header().names();
}

void TabularBody::for_each(const RowFn& fn) {
  if (format_ == BodyFormat::csv) {
    ViewBuffer buffer(body_);
    std::istream in(&buffer);
    CsvTable table(in, "body");
    std::vector<std::string> fields;
    for (;;) {
      RowSource source;
      try {
        if (!table.next(fields)) break;
      } catch (const InputError& e) {
        // A malformed record (field count, quoting, text that is not UTF-8):
        // report it as a bad row. An unterminated quote swallows the rest of
        // the body, so stop there.
        source.line = e.line > 0 ? e.line : table.line();
        source.problem = e.reason.empty() ? e.what() : e.reason;
        source.problem_field = e.field;
        fn({}, source);
        if (e.reason.find("quote") != std::string::npos) break;
        continue;
      }
      source.line = table.line();
      fn(fields, source);
    }
    return;
  }

  nlohmann::json document;
  try {
    document = parse_json_text(body_, "body");
  } catch (const JsonTextError& e) {
    throw BodyError(e.what(), "", true);
  }
  const nlohmann::json* rows = &document;
  if (document.is_object()) {
    if (!document.contains(array_key_) || document.size() != 1)
      throw BodyError("body: expected a JSON array of rows or an object with the single member \"" + array_key_ + "\"",
                      "", false);
    rows = &document[array_key_];
  }
  if (!rows->is_array())
    throw BodyError("body: expected a JSON array of row objects", rows == &document ? "" : "/" + array_key_, false);

  std::vector<std::string> fields(header_.size());
  std::vector<std::string> members;
  std::int64_t position = 0;
  for (const auto& row : *rows) {
    ++position;
    RowSource source;
    source.line = position;
    std::fill(fields.begin(), fields.end(), std::string());
    if (!row.is_object()) {
      source.problem = "expected a JSON object";
      fn({}, source);
      continue;
    }
    members.clear();
    for (auto it = row.begin(); it != row.end(); ++it) members.push_back(it.key());
    for (auto it = row.begin(); it != row.end() && source.problem.empty(); ++it) {
      const auto column = std::find(header_.begin(), header_.end(), it.key());
      if (column == header_.end()) {
        if (auto why = unknown_column_problem(it.key(), kind_, members)) {
          source.problem_field = it.key();
          source.problem = *why;
        } else {
          ignored_.insert(it.key());
        }
        continue;
      }
      const auto& v = it.value();
      std::string& cell = fields[static_cast<std::size_t>(column - header_.begin())];
      if (v.is_string()) cell = v.get<std::string>();
      else if (v.is_number()) cell = v.dump();
      else if (!v.is_null()) {
        source.problem_field = it.key();
        source.problem = "expected a string, a number or null";
      }
    }
    fn(source.problem.empty() ? fields : std::vector<std::string>{}, source);
  }
}

}  // namespace strandline
