#include "server/http/upload_rows.h"

#include <algorithm>

#include "corrections/core/errors.h"
#include "corrections/core/utf8_text.h"
#include "server/io/column_rules.h"
#include "server/io/tabular_body.h"

namespace strandline::http {

namespace {

// A value is quoted to show the mistake, not echoed whole: a 10 MB field stays a line.
constexpr std::size_t kMaxQuotedValueBytes = 200;

std::string shortened_value(const std::string& value) {
  std::string text = printable_text(value);
  if (text.size() <= kMaxQuotedValueBytes) return text;
  std::size_t cut = kMaxQuotedValueBytes;
  while (cut > 0 && (static_cast<unsigned char>(text[cut]) & 0xC0) == 0x80) --cut;  // not inside a character
  return text.substr(0, cut) + "... (" + std::to_string(value.size()) + " bytes)";
}

}  // namespace

nlohmann::json row_issue_json(const store::RowIssue& issue, BodyFormat format, const std::string& array_key) {
  nlohmann::json j;
  if (format == BodyFormat::json)
    j["pointer"] = "/" + array_key + "/" + std::to_string(issue.line - 1);
  else
    j["line"] = issue.line;
  if (!issue.key.empty()) j["key"] = issue.key;
  if (!issue.field.empty()) j["field"] = issue.field;
  if (!issue.value.empty()) j["value"] = shortened_value(issue.value);
  j["reason"] = issue.reason;
  return j;
}

nlohmann::json row_issues_json(const std::vector<store::RowIssue>& issues, BodyFormat format,
                               const std::string& array_key) {
  nlohmann::json out = nlohmann::json::array();
  const std::size_t listed = std::min(issues.size(), kMaxListedRowIssues);
  for (std::size_t k = 0; k < listed; ++k) out.push_back(row_issue_json(issues[k], format, array_key));
  return out;
}

Problem body_problem(const std::exception& e) {
  if (const auto* b = dynamic_cast<const BodyError*>(&e)) {
    if (b->not_json) return Problem(400, problem_type::bad_json, "Malformed JSON", b->what());
    return Problem(422, problem_type::invalid_body, "Invalid body", b->what(), {{"pointer", b->pointer}});
  }
  if (const auto* c = dynamic_cast<const ColumnError*>(&e))
    return Problem(422, problem_type::invalid_body, "Invalid columns", c->what(), {{"field", c->column}});
  return Problem(422, problem_type::invalid_body, "Invalid body", e.what());
}

}  // namespace strandline::http
