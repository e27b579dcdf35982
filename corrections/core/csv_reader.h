// Streaming RFC 4180 CSV reader: one record at a time, quoted fields with
// embedded commas, quotes and newlines, CRLF or LF, a UTF-8 BOM tolerated.
// Keeps the 1-based line number of each record's first line for messages.
#pragma once

#include <cstdint>
#include <istream>
#include <optional>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

namespace strandline {

class CsvReader {
 public:
  // `name` is used in messages (usually the file name).
  CsvReader(std::istream& in, std::string name);

  // Reads the next record into `fields`; false at end of input. Blank lines are
  // skipped. Throws InputError on an unterminated quote or text after a quote.
  bool next(std::vector<std::string>& fields);

  std::int64_t line() const { return record_line_; }  // line of the last record read
  const std::string& name() const { return name_; }

 private:
  std::istream& in_;
  std::string name_;
  std::int64_t current_line_ = 0;
  std::int64_t record_line_ = 0;
  bool first_ = true;
  std::string buffer_;
  bool line_ends_crlf_ = false;  // the physical line in buffer_ ended with CR LF
};

// Maps header names to column positions and checks required/forbidden columns.
class CsvHeader {
 public:
  // Throws InputError for empty or duplicate names.
  CsvHeader(const std::vector<std::string>& names, const std::string& file);

  std::optional<std::size_t> find(std::string_view name) const;
  // Throws InputError("missing required column ...") naming the file and the columns found.
  std::size_t require(std::string_view name) const;
  const std::vector<std::string>& names() const { return names_; }

 private:
  std::vector<std::string> names_;
  std::unordered_map<std::string, std::size_t> index_;
  std::string file_;
};

// Reads the header of a file and checks that every data record has as many
// fields; the common opening of every CSV codec.
class CsvTable {
 public:
  CsvTable(std::istream& in, const std::string& file);
  const CsvHeader& header() const { return *header_; }
  // Next data record; throws InputError when its field count differs from the
  // header's or a field is not UTF-8 text (utf8_text.h), naming the column.
  bool next(std::vector<std::string>& fields);
  std::int64_t line() const { return reader_.line(); }
  const std::string& file() const { return reader_.name(); }

 private:
  CsvReader reader_;
  std::optional<CsvHeader> header_;
};

// Strict numeric parsing for CSV fields. Throws FieldError ("not a number",
// "not finite"). Surrounding blanks are ignored.
double parse_number(std::string_view text);
// Empty (or blank) fields give nullopt.
std::optional<double> parse_optional_number(std::string_view text);

// Quotes a field when it needs quoting (comma, quote, CR or LF).
std::string csv_escape(std::string_view field);

}  // namespace strandline
