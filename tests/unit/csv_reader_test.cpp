#include <gtest/gtest.h>

#include <sstream>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"

using namespace strandline;

TEST(CsvReader, ReadsQuotedFieldsAcrossLines) {
  std::istringstream in("a,b\n\"x,1\",\"he said \"\"hi\"\"\"\n\"two\nlines\",3\r\n\n4,5\n");
  CsvReader r(in, "t.csv");
  std::vector<std::string> f;
  ASSERT_TRUE(r.next(f));
  EXPECT_EQ(r.line(), 1);
  ASSERT_TRUE(r.next(f));
  EXPECT_EQ(f, (std::vector<std::string>{"x,1", "he said \"hi\""}));
  ASSERT_TRUE(r.next(f));
  EXPECT_EQ(f, (std::vector<std::string>{"two\nlines", "3"}));
  EXPECT_EQ(r.line(), 3);
  ASSERT_TRUE(r.next(f));  // the blank line is skipped
  EXPECT_EQ(f, (std::vector<std::string>{"4", "5"}));
  EXPECT_EQ(r.line(), 6);
  EXPECT_FALSE(r.next(f));
}

TEST(CsvReader, StripsByteOrderMark) {
  std::istringstream in("\xEF\xBB\xBFtime,level_m\n");
  CsvTable t(in, "t.csv");
  EXPECT_TRUE(t.header().find("time").has_value());
}

TEST(CsvReader, UnterminatedQuoteNamesTheLine) {
  std::istringstream in("a,b\n1,\"open\n");
  CsvReader r(in, "t.csv");
  std::vector<std::string> f;
  r.next(f);
  try {
    r.next(f);
    FAIL();
  } catch (const InputError& e) {
    EXPECT_STREQ(e.what(), "t.csv:2: unterminated quoted field");
  }
}

TEST(CsvNumbers, ParsesStrictly) {
  EXPECT_DOUBLE_EQ(parse_number(" 12.5 "), 12.5);
  EXPECT_DOUBLE_EQ(parse_number("+3e2"), 300.0);
  EXPECT_THROW(parse_number("12,5"), FieldError);
  EXPECT_THROW(parse_number("nan"), FieldError);
  EXPECT_THROW(parse_number("inf"), FieldError);
  EXPECT_THROW(parse_number("1e999"), FieldError);
  EXPECT_THROW(parse_number(""), FieldError);
  EXPECT_FALSE(parse_optional_number("  ").has_value());
}

TEST(CsvEscape, QuotesWhenNeeded) {
  EXPECT_EQ(csv_escape("plain"), "plain");
  EXPECT_EQ(csv_escape("a,b"), "\"a,b\"");
  EXPECT_EQ(csv_escape("say \"x\""), "\"say \"\"x\"\"\"");
}
