// Rendering of uploads in replies: row issues as the report's rows, and the
// errors of server/app/uploads.h as RFC 7807 problems.
#pragma once

#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "corrections/core/errors.h"
#include "server/http/problem.h"
#include "server/http/tabular_body.h"
#include "server/store/store.h"

namespace strandline::http {

// The report form of a row issue: {"line", "field", "value", "reason"} (JSON
// bodies: "pointer" to the array element instead of "line").
nlohmann::json row_issue_json(const store::RowIssue& issue, BodyFormat format, const std::string& array_key);
// Replies list at most this many row issues (the first ones, in row order) beside their count.
inline constexpr std::size_t kMaxListedRowIssues = store::kStoredRejectedRows;
// The first kMaxListedRowIssues issues in report form.
nlohmann::json row_issues_json(const std::vector<store::RowIssue>& issues, BodyFormat format,
                               const std::string& array_key);

// A body refused as a whole: not JSON → 400 bad-json; a header, JSON shape or
// whole-record rule → 422 invalid-body (with `field` or `pointer`).
Problem body_problem(const std::exception& e);

// Runs `upload`, turning a refused body into its problem. Row issues
// (app::InvalidRows) pass through to the caller.
template <class Fn>
auto refusing_bad_bodies(Fn&& upload) -> decltype(upload()) {
  try {
    return upload();
  } catch (const InputError& e) {
    throw body_problem(e);
  }
}

}  // namespace strandline::http
