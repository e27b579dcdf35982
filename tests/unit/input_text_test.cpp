// The text rules every input passes (utf8_text.h, json_text.h, CsvTable):
// invalid UTF-8, control characters, UTF-16 bodies, deep nesting and number
// overflow are refused with their place, never passed on to a reply or the store.
// UTF-8 validity follows RFC 3629 section 4 (the byte-sequence table); JSON
// syntax follows RFC 8259.
#include <gtest/gtest.h>

#include <sstream>
#include <string>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"
#include "corrections/core/json_text.h"
#include "corrections/core/utf8_text.h"

using namespace strandline;

TEST(Utf8Text, SequenceLengthsFollowRfc3629) {
  EXPECT_EQ(utf8_sequence_length("a", 0), 1u);
  EXPECT_EQ(utf8_sequence_length("\xC3\xA9", 0), 2u);          // U+00E9
  EXPECT_EQ(utf8_sequence_length("\xE2\x82\xAC", 0), 3u);      // U+20AC
  EXPECT_EQ(utf8_sequence_length("\xF0\x9F\x8C\x8A", 0), 4u);  // U+1F30A
  EXPECT_EQ(utf8_sequence_length("\xF4\x8F\xBF\xBF", 0), 4u);  // U+10FFFF, the last code point
  EXPECT_EQ(utf8_sequence_length("\xC0\xAF", 0), 0u);          // overlong "/"
  EXPECT_EQ(utf8_sequence_length("\xE0\x80\xAF", 0), 0u);      // overlong, 3 bytes
  EXPECT_EQ(utf8_sequence_length("\xED\xA0\x80", 0), 0u);      // surrogate U+D800
  EXPECT_EQ(utf8_sequence_length("\xF4\x90\x80\x80", 0), 0u);  // above U+10FFFF
  EXPECT_EQ(utf8_sequence_length("\xE9", 0), 0u);              // Latin-1 "é"
  EXPECT_EQ(utf8_sequence_length("\xC3", 0), 0u);              // truncated
  EXPECT_EQ(utf8_sequence_length("\x80", 0), 0u);              // lone continuation byte
}

TEST(Utf8Text, FaultNamesTheByteAndItsOffset) {
  EXPECT_FALSE(text_fault("Plage d\xC3\xA9" "couverte").has_value());
  const auto latin1 = text_fault("caf\xE9!");
  ASSERT_TRUE(latin1.has_value());
  EXPECT_EQ(latin1->offset, 3u);
  EXPECT_NE(latin1->reason.find("0xE9"), std::string::npos) << latin1->reason;
  const auto nul = text_fault(std::string_view("ab\0c", 4));
  ASSERT_TRUE(nul.has_value());
  EXPECT_EQ(nul->offset, 2u);
  EXPECT_TRUE(text_fault("a\tb").has_value() == false);
  EXPECT_TRUE(text_fault("a\nb").has_value());         // a line break in a one-line value
  EXPECT_FALSE(text_fault("a\nb", true).has_value());  // allowed in free text
  EXPECT_TRUE(text_fault("a\x7F" "b", true).has_value());
  EXPECT_TRUE(text_fault("a\x1B[31m", true).has_value());  // a terminal escape in a log line
}

TEST(Utf8Text, PrintableTextIsValidAndKeepsGoodCharacters) {
  EXPECT_EQ(printable_text("caf\xE9"), "caf\\xE9");
  EXPECT_EQ(printable_text("\xC3\xA9t\xC3\xA9"), "\xC3\xA9t\xC3\xA9");
  EXPECT_EQ(printable_text(std::string_view("a\0b", 3)), "a\\x00b");
  EXPECT_FALSE(text_fault(printable_text("\xFF\xFE\x01\xED\xA0\x80")).has_value());
}

namespace {
std::string json_error(std::string_view text) {
  try {
    parse_json_text(text, "body.json");
  } catch (const JsonTextError& e) {
    return e.what();
  }
  return "";
}
std::string nested(std::size_t depth) { return std::string(depth, '[') + std::string(depth, ']'); }
}  // namespace

TEST(JsonText, DepthLimitIsExact) {
  EXPECT_EQ(json_error(nested(kMaxJsonDepth)), "");
  const std::string deep = json_error(nested(kMaxJsonDepth + 1));
  EXPECT_NE(deep.find("body.json: line 1, column 65: arrays and objects nested deeper than 64 levels"),
            std::string::npos)
      << deep;
  // Brackets inside strings do not count; objects count like arrays.
  EXPECT_EQ(json_error("{\"a\": \"" + std::string(500, '[') + "\"}"), "");
  std::string objects;
  for (int i = 0; i < 65; ++i) objects += "{\"k\":";
  objects += "1" + std::string(65, '}');
  EXPECT_NE(json_error(objects).find("nested deeper"), std::string::npos);
  // A million levels (the crash reproduced on the old main) is refused without recursion.
  EXPECT_NE(json_error(std::string(1000000, '[')).find("nested deeper"), std::string::npos);
}

TEST(JsonText, NumberOverflowIsAnErrorWithItsPlace) {
  const std::string e = json_error("{\n  \"amplitude_m\": 1e400\n}");
  EXPECT_NE(e.find("body.json: line 2, column 18: not valid JSON: number overflow"), std::string::npos) << e;
  EXPECT_EQ(json_error("{\"a\": 1e300}"), "");
}

TEST(JsonText, EncodingsAndControlCharacters) {
  EXPECT_NE(json_error("\xFF\xFE{\0}\0").find("UTF-16"), std::string::npos);
  EXPECT_NE(json_error(std::string_view("{\0\"\0a\0\"\0", 8)).find("UTF-16"), std::string::npos);
  EXPECT_EQ(json_error("\xEF\xBB\xBF{\"a\": 1}"), "");  // a UTF-8 byte order mark is tolerated
  const std::string latin1 = json_error("{\"site\": \"Plage d\xE9\"}");
  EXPECT_NE(latin1.find("body.json: line 1, column 18"), std::string::npos) << latin1;
  EXPECT_NE(latin1.find("0xE9"), std::string::npos) << latin1;
  EXPECT_NE(json_error(R"({"id": "a\u0000b"})").find("escaped control character (\\u0000)"), std::string::npos);
  EXPECT_NE(json_error(R"({"id": "a\u001bb"})").find("escaped control character"), std::string::npos);
  EXPECT_EQ(json_error(R"({"note": "two\nlines\tand \u00e9 \\u0000"})"), "");  // "\\u0000" is text, not an escape
  const std::string syntax = json_error("{\n\"a\": 1,\n\"b\": }");
  EXPECT_NE(syntax.find("body.json: line 3, column 6: not valid JSON"), std::string::npos) << syntax;
}

TEST(JsonText, StreamIsReadWhole) {
  std::istringstream in("{\"a\": [1, 2, 3]}");
  EXPECT_EQ(parse_json_stream(in, "f.json")["a"].size(), 3u);
}

namespace {
std::string csv_error(const std::string& text) {
  std::istringstream in(text);
  try {
    CsvTable table(in, "obs.csv");
    std::vector<std::string> fields;
    while (table.next(fields)) {
    }
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}
}  // namespace

TEST(CsvText, FieldsThatAreNotTextNameLineAndColumn) {
  EXPECT_EQ(csv_error("image_id,note\nIMG-1,d\xC3\xA9" "but\n"), "");
  const std::string latin1 = csv_error("image_id,note\nIMG-1,ok\nIMG-\xE9,x\n");
  EXPECT_NE(latin1.find("obs.csv:3: image_id"), std::string::npos) << latin1;
  EXPECT_NE(latin1.find("IMG-\\xE9"), std::string::npos) << latin1;  // the value is shown printable
  EXPECT_EQ(latin1.find('\xE9'), std::string::npos);
  const std::string nul = csv_error(std::string("image_id,note\nIMG-1,a\0b\n", 24));
  EXPECT_NE(nul.find("obs.csv:2: note \"a\\x00b\""), std::string::npos) << nul;
  const std::string header = csv_error("image_id,n\xF6te\nIMG-1,x\n");
  EXPECT_NE(header.find("obs.csv:1: header column 2"), std::string::npos) << header;
}

// Found by fuzz_transects_geojson (kept in its corpus): GDAL field names with
// invalid bytes reached an InputError's message, and the message a reply. Every
// error now makes its message printable, keeping line breaks.
TEST(ErrorText, InputAndConfigErrorsArePrintable) {
  const InputError plain("attributes found: propert\x8F" "es\nsecond line\t(tab)");
  EXPECT_STREQ(plain.what(), "attributes found: propert\\x8Fes\nsecond line\t(tab)");
  const InputError located("f.csv", 3, "image_id", "caf\xE9", "bad \x01 byte");
  EXPECT_STREQ(located.what(), "f.csv:3: image_id \"caf\\xE9\": bad \\x01 byte");
  EXPECT_EQ(located.reason, "bad \\x01 byte");
  const ConfigError config("/steps/h\xFF", "unknown step");
  EXPECT_STREQ(config.what(), "/steps/h\\xFF: unknown step");
  EXPECT_EQ(config.pointer, "/steps/h\\xFF");
}
