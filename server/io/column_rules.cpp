#include "server/io/column_rules.h"

#include <algorithm>
#include <cctype>

namespace strandline {

namespace {

// Lower case without separators: `Cloud-Fraction` and `cloudfraction` compare equal.
std::string folded(std::string_view name) {
  std::string out;
  for (char c : name)
    if (c != '_' && c != '-' && c != ' ') out += static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return out;
}

// Optimal string alignment distance (Levenshtein plus adjacent transpositions).
std::size_t edit_distance(const std::string& a, const std::string& b) {
  std::vector<std::vector<std::size_t>> d(a.size() + 1, std::vector<std::size_t>(b.size() + 1));
  for (std::size_t i = 0; i <= a.size(); ++i) d[i][0] = i;
  for (std::size_t j = 0; j <= b.size(); ++j) d[0][j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i)
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const std::size_t cost = a[i - 1] == b[j - 1] ? 0 : 1;
      d[i][j] = std::min({d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost});
      if (i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1]) d[i][j] = std::min(d[i][j], d[i - 2][j - 2] + 1);
    }
  return d[a.size()][b.size()];
}

// Short names tolerate no edit (`tide` is not `time`), longer ones one or two.
std::size_t tolerated_edits(std::size_t length) { return length <= 4 ? 0 : length <= 7 ? 1 : 2; }

std::string column_list(const InputColumns& kind) {
  std::string required, optional;
  for (const auto& c : kind.columns) {
    std::string& list = c.required ? required : optional;
    list += (list.empty() ? "" : ",") + std::string(c.name);
  }
  return optional.empty() ? required : required + " and optionally " + optional;
}

bool is_known(std::string_view name, const InputColumns& kind) {
  return std::any_of(kind.columns.begin(), kind.columns.end(), [&](const InputColumn& c) { return c.name == name; });
}

}  // namespace

std::optional<std::string_view> misspelt_column_of(std::string_view name, const InputColumns& kind,
                                                   const std::vector<std::string>& present) {
  const std::string f = folded(name);
  std::optional<std::string_view> best;
  std::size_t best_distance = 0;
  for (const auto& c : kind.columns) {
    if (std::find(present.begin(), present.end(), c.name) != present.end()) continue;
    const std::string k = folded(c.name);
    const std::size_t d = edit_distance(f, k);
    if (d <= tolerated_edits(std::min(f.size(), k.size())) && (!best || d < best_distance)) {
      best = c.name;
      best_distance = d;
    }
  }
  return best;
}

std::optional<std::string> unknown_column_problem(std::string_view name, const InputColumns& kind,
                                                  const std::vector<std::string>& present) {
  if (auto intended = misspelt_column_of(name, kind, present))
    return "column \"" + std::string(name) + "\" looks like \"" + std::string(*intended) +
           "\" misspelt: rename it (expected " + column_list(kind) + ")";
  if (kind.extras_allowed) return std::nullopt;
  return "unknown column \"" + std::string(name) + "\" (expected " + column_list(kind) + ")";
}

ResolvedColumns resolve_columns(const std::vector<std::string>& header, const InputColumns& kind,
                                const std::string& source) {
  ResolvedColumns out;
  for (std::size_t i = 0; i < header.size(); ++i) {
    if (is_known(header[i], kind)) continue;
    if (auto why = unknown_column_problem(header[i], kind, header)) throw ColumnError(source, header[i], *why);
    out.extra.push_back(i);
  }
  for (const auto& c : kind.columns) {
    const auto it = std::find(header.begin(), header.end(), c.name);
    if (it == header.end()) {
      if (!c.required) {
        out.at.emplace_back();
        continue;
      }
      std::string found;
      for (const auto& n : header) found += (found.empty() ? "" : ",") + n;
      throw ColumnError(source, std::string(c.name),
                        "missing required column \"" + std::string(c.name) + "\" (header has: " + found + ")");
    }
    out.at.emplace_back(static_cast<std::size_t>(it - header.begin()));
  }
  return out;
}

}  // namespace strandline
