#include "corrections/core/csv_reader.h"

#include <charconv>
#include <cmath>

#include "corrections/core/errors.h"
#include "corrections/core/utf8_text.h"

namespace strandline {

CsvReader::CsvReader(std::istream& in, std::string name) : in_(in), name_(std::move(name)) {}

bool CsvReader::next(std::vector<std::string>& fields) {
  while (true) {
    if (!std::getline(in_, buffer_)) {
      fields.clear();
      return false;
    }
    ++current_line_;
    if (first_) {
      first_ = false;
      if (buffer_.size() >= 3 && buffer_.compare(0, 3, "\xEF\xBB\xBF") == 0) buffer_.erase(0, 3);
    }
    line_ends_crlf_ = !buffer_.empty() && buffer_.back() == '\r';
    if (line_ends_crlf_) buffer_.pop_back();
    bool blank = true;
    for (char c : buffer_)
      if (c != ' ' && c != '\t') blank = false;
    if (!blank) break;
  }
  record_line_ = current_line_;

  // Fields reuse the strings (and their capacity) of the previous record.
  std::size_t count = 0;
  auto field_at = [&]() -> std::string& {
    if (count == fields.size()) fields.emplace_back();
    std::string& f = fields[count];
    f.clear();
    return f;
  };
  std::string* field = &field_at();
  std::size_t i = 0;
  bool in_quotes = false;
  bool was_quoted = false;
  while (true) {
    if (i >= buffer_.size()) {
      if (in_quotes) {
        // The quoted field continues on the next physical line; the line
        // break inside the quotes is part of the field, CR LF or LF as written.
        *field += line_ends_crlf_ ? "\r\n" : "\n";
        if (!std::getline(in_, buffer_))
          throw InputError(name_, record_line_, "", "", "unterminated quoted field");
        ++current_line_;
        line_ends_crlf_ = !buffer_.empty() && buffer_.back() == '\r';
        if (line_ends_crlf_) buffer_.pop_back();
        i = 0;
        continue;
      }
      fields.resize(count + 1);
      return true;
    }
    const char c = buffer_[i];
    if (in_quotes) {
      if (c == '"') {
        if (i + 1 < buffer_.size() && buffer_[i + 1] == '"') {
          *field += '"';
          i += 2;
          continue;
        }
        in_quotes = false;
        ++i;
        if (i < buffer_.size() && buffer_[i] != ',')
          throw InputError(name_, record_line_, "", "",
                           "unexpected text after a closing quote in field " + std::to_string(count + 1));
        continue;
      }
      *field += c;
      ++i;
    } else if (c == ',') {
      ++count;
      field = &field_at();
      was_quoted = false;
      ++i;
    } else if (c == '"' && field->empty() && !was_quoted) {
      in_quotes = true;
      was_quoted = true;
      ++i;
    } else {
      // Unquoted text runs to the next comma or quote: append it at once.
      std::size_t j = i + 1;
      while (j < buffer_.size() && buffer_[j] != ',' && buffer_[j] != '"') ++j;
      field->append(buffer_, i, j - i);
      i = j;
    }
  }
}

CsvHeader::CsvHeader(const std::vector<std::string>& names, const std::string& file)
    : names_(names), file_(file) {
  for (std::size_t i = 0; i < names_.size(); ++i) {
    std::string& n = names_[i];
    while (!n.empty() && (n.front() == ' ' || n.front() == '\t')) n.erase(0, 1);
    while (!n.empty() && (n.back() == ' ' || n.back() == '\t')) n.pop_back();
    if (n.empty())
      throw InputError(file_, 1, "", "", "header column " + std::to_string(i + 1) + " has no name");
    if (!index_.emplace(n, i).second)
      throw InputError(file_, 1, "", "", "duplicate column \"" + n + "\" in the header");
  }
}

std::optional<std::size_t> CsvHeader::find(std::string_view name) const {
  auto it = index_.find(std::string(name));
  if (it == index_.end()) return std::nullopt;
  return it->second;
}

std::size_t CsvHeader::require(std::string_view name) const {
  if (auto i = find(name)) return *i;
  std::string found;
  for (const auto& n : names_) found += (found.empty() ? "" : ",") + n;
  throw InputError(file_, 1, "", "",
                   "missing required column \"" + std::string(name) + "\" (header has: " + found + ")");
}

CsvTable::CsvTable(std::istream& in, const std::string& file) : reader_(in, file) {
  std::vector<std::string> names;
  if (!reader_.next(names)) throw InputError(file, 0, "", "", "empty file: expected a header line");
  for (std::size_t i = 0; i < names.size(); ++i)
    if (auto fault = text_fault(names[i]))
      throw InputError(file, reader_.line(), "header column " + std::to_string(i + 1), printable_text(names[i]),
                       fault->reason);
  header_.emplace(names, file);
}

bool CsvTable::next(std::vector<std::string>& fields) {
  if (!reader_.next(fields)) return false;
  const auto& names = header_->names();
  if (fields.size() != names.size())
    throw InputError(reader_.name(), reader_.line(), "", "",
                     "expected " + std::to_string(names.size()) + " fields as in the header, found " +
                         std::to_string(fields.size()));
  // Every field is text that may reach a reply, a log or the store: UTF-8
  // without control characters (a quoted field may hold line breaks).
  for (std::size_t i = 0; i < fields.size(); ++i)
    if (auto fault = text_fault(fields[i], true))
      throw InputError(reader_.name(), reader_.line(), names[i], printable_text(fields[i]), fault->reason);
  return true;
}

static std::string_view trim(std::string_view t) {
  while (!t.empty() && (t.front() == ' ' || t.front() == '\t')) t.remove_prefix(1);
  while (!t.empty() && (t.back() == ' ' || t.back() == '\t')) t.remove_suffix(1);
  return t;
}

double parse_number(std::string_view text) {
  const std::string_view t = trim(text);
  if (t.empty()) throw FieldError("empty: expected a number");
  double value = 0.0;
  const char* begin = t.data();
  if (*begin == '+') ++begin;
  auto [ptr, ec] = std::from_chars(begin, t.data() + t.size(), value);
  if (ec == std::errc::result_out_of_range) throw FieldError("number out of range");
  if (ec != std::errc() || ptr != t.data() + t.size()) throw FieldError("not a number");
  if (!std::isfinite(value)) throw FieldError("not a finite number");
  return value;
}

std::optional<double> parse_optional_number(std::string_view text) {
  if (trim(text).empty()) return std::nullopt;
  return parse_number(text);
}

std::string csv_escape(std::string_view field) {
  if (field.find_first_of(",\"\r\n") == std::string_view::npos) return std::string(field);
  std::string out = "\"";
  for (char c : field) {
    if (c == '"') out += '"';
    out += c;
  }
  out += '"';
  return out;
}

}  // namespace strandline
