#include "server/http/tabular_body.h"

#include <istream>
#include <streambuf>

#include <nlohmann/json.hpp>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"
#include "server/http/problem.h"

namespace strandline::http {

namespace {

// An istream over a body without copying it.
class ViewBuffer : public std::streambuf {
 public:
  explicit ViewBuffer(std::string_view text) {
    char* p = const_cast<char*>(text.data());
    setg(p, p, p + text.size());
  }
};

std::string_view media_type(std::string_view content_type) {
  auto semicolon = content_type.find(';');
  auto t = content_type.substr(0, semicolon);
  while (!t.empty() && t.back() == ' ') t.remove_suffix(1);
  return t;
}

std::string lower(std::string_view s) {
  std::string out(s);
  for (auto& c : out) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return out;
}

}  // namespace

BodyFormat body_format_of(std::string_view content_type) {
  const std::string t = lower(media_type(content_type));
  if (t == "text/csv") return BodyFormat::csv;
  if (t == "application/json") return BodyFormat::json;
  throw Problem(415, problem_type::unsupported_media_type, "Unsupported media type",
                "expected Content-Type text/csv or application/json, got \"" + std::string(content_type) + "\"");
}

TabularBody::TabularBody(std::string_view body, BodyFormat format, std::vector<std::string> columns,
                         std::string array_key)
    : body_(body), format_(format), columns_(std::move(columns)), array_key_(std::move(array_key)) {
  if (format_ == BodyFormat::json) {
    header_ = columns_;
    return;
  }
  ViewBuffer buffer(body_);
  std::istream in(&buffer);
  try {
    CsvTable table(in, "body");
    header_ = table.header().names();
  } catch (const InputError& e) {
    throw Problem(422, problem_type::invalid_body, "Invalid CSV", e.what());
  }
}

void TabularBody::for_each(const RowFn& fn) const {
  if (format_ == BodyFormat::csv) {
    ViewBuffer buffer(body_);
    std::istream in(&buffer);
    std::optional<CsvTable> table;
    try {
      table.emplace(in, "body");
    } catch (const InputError& e) {
      throw Problem(422, problem_type::invalid_body, "Invalid CSV", e.what());
    }
    std::vector<std::string> fields;
    for (;;) {
      RowSource source;
      try {
        if (!table->next(fields)) break;
      } catch (const InputError& e) {
        // A malformed record (field count or quoting): report it as a bad row.
        // An unterminated quote swallows the rest of the body, so stop there.
        source.line = e.line > 0 ? e.line : table->line();
        source.json_problem = e.reason.empty() ? e.what() : e.reason;
        fn({}, source);
        if (e.reason.find("quote") != std::string::npos) break;
        continue;
      }
      source.line = table->line();
      fn(fields, source);
    }
    return;
  }

  nlohmann::json document;
  try {
    document = nlohmann::json::parse(body_.begin(), body_.end());
  } catch (const nlohmann::json::parse_error& e) {
    throw Problem(400, problem_type::bad_json, "Malformed JSON", e.what());
  }
  const nlohmann::json* rows = &document;
  if (document.is_object()) {
    if (!document.contains(array_key_) || document.size() != 1)
      throw Problem(422, problem_type::invalid_body, "Invalid body",
                    "expected a JSON array of rows or an object with the single member \"" + array_key_ + "\"",
                    {{"pointer", ""}});
    rows = &document[array_key_];
  }
  if (!rows->is_array())
    throw Problem(422, problem_type::invalid_body, "Invalid body", "expected a JSON array of row objects",
                  {{"pointer", rows == &document ? "" : "/" + array_key_}});

  std::vector<std::string> fields(columns_.size());
  std::int64_t position = 0;
  for (const auto& row : *rows) {
    ++position;
    RowSource source;
    source.line = position;
    std::fill(fields.begin(), fields.end(), std::string());
    if (!row.is_object()) {
      source.json_problem = "expected a JSON object";
      fn({}, source);
      continue;
    }
    for (auto it = row.begin(); it != row.end(); ++it) {
      std::size_t i = 0;
      while (i < columns_.size() && columns_[i] != it.key()) ++i;
      if (i == columns_.size()) {
        source.json_problem_field = it.key();
        source.json_problem = "unknown member";
        break;
      }
      const auto& v = it.value();
      if (v.is_string()) fields[i] = v.get<std::string>();
      else if (v.is_number()) fields[i] = v.dump();
      else if (!v.is_null()) {
        source.json_problem_field = it.key();
        source.json_problem = "expected a string, a number or null";
        break;
      }
    }
    fn(source.json_problem.empty() ? fields : std::vector<std::string>{}, source);
  }
}

}  // namespace strandline::http
