// The one column rule of every tabular input kind, applied alike by the batch
// readers and the HTTP uploads (CSV headers and JSON member names):
//   - a required column that is absent is refused;
//   - a name that looks like an absent known column misspelt (differs in case,
//     underscores, hyphens or spaces, or within a small edit distance) is
//     refused, naming the column and the likely intended one, so a typo never
//     silently turns into "unknown" (e.g. `cloud_fration`);
//   - any other name is extra: kinds that allow extras (observations) carry
//     them through in the batch and report them as ignored in the service;
//     the other kinds refuse them.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "corrections/core/errors.h"

namespace strandline {

struct InputColumn {
  std::string_view name;
  bool required;
};

struct InputColumns {
  std::vector<InputColumn> columns;
  bool extras_allowed;
};

// A header refused as a whole; `column` names the column at fault.
class ColumnError : public InputError {
 public:
  ColumnError(const std::string& source, std::string column_name, const std::string& reason)
      : InputError(source, 1, "", "", reason), column(std::move(column_name)) {}
  std::string column;
};

// The known column a name looks like a misspelling of, among those not in
// `present` (a name next to its correctly spelt column is a genuine extra).
std::optional<std::string_view> misspelt_column_of(std::string_view name, const InputColumns& kind,
                                                   const std::vector<std::string>& present);

// Why a name outside the known columns is refused, or nullopt when it is an
// allowed extra. Shared by CSV headers and JSON members.
std::optional<std::string> unknown_column_problem(std::string_view name, const InputColumns& kind,
                                                  const std::vector<std::string>& present);

struct ResolvedColumns {
  std::vector<std::optional<std::size_t>> at;  // per InputColumn: position in the header
  std::vector<std::size_t> extra;              // positions of extra columns, in header order
};

// Resolves a header; throws ColumnError (line 1 of `source`).
ResolvedColumns resolve_columns(const std::vector<std::string>& header, const InputColumns& kind,
                                const std::string& source);

}  // namespace strandline
