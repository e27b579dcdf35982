// The identifier rule of both faces (transect and image ids): valid UTF-8
// without control characters, at most 128 bytes, no "/" in a transect id.
#include <gtest/gtest.h>

#include "server/io/id_rules.h"

namespace strandline {
namespace {

TEST(IdRules, TextAPersonWouldTypeIsAnId) {
  for (std::string_view id : {"T1", "T 1", "Tø2", "IMG,7", "IMG\"8", "ÎMG-é9", "a/b"})
    EXPECT_EQ(id_problem(id, "image id"), std::nullopt) << id;
  EXPECT_EQ(id_problem(std::string(kMaxIdBytes, 'x'), "image id"), std::nullopt);
  EXPECT_EQ(id_problem("\xF0\x9F\x8C\x8A", "image id"), std::nullopt);  // U+1F30A, four bytes
}

TEST(IdRules, BytesThatAreNotTextAreRefused) {
  EXPECT_EQ(id_problem("", "image id"), "empty image id");
  EXPECT_EQ(id_problem(std::string(kMaxIdBytes + 1, 'x'), "image id"), "image id longer than 128 bytes");
  EXPECT_EQ(id_problem("caf\xE9", "image id"), "image id is not valid UTF-8 (byte 4)");     // Latin-1
  EXPECT_EQ(id_problem("\xC0\xAE", "image id"), "image id is not valid UTF-8 (byte 1)");    // overlong "."
  EXPECT_EQ(id_problem("a\xED\xA0\x80", "image id"), "image id is not valid UTF-8 (byte 2)");  // surrogate
  EXPECT_EQ(id_problem("\xF4\x90\x80\x80", "image id"), "image id is not valid UTF-8 (byte 1)");  // > U+10FFFF
  EXPECT_EQ(id_problem("\xE2\x82", "image id"), "image id is not valid UTF-8 (byte 1)");    // truncated
  EXPECT_EQ(id_problem(std::string("a\0b", 3), "image id"), "image id holds a control character (byte 2)");
  EXPECT_EQ(id_problem("a\tb", "image id"), "image id holds a control character (byte 2)");
  EXPECT_EQ(id_problem("a\x7F", "image id"), "image id holds a control character (byte 2)");
}

TEST(IdRules, ATransectIdNamesAPathSegment) {
  EXPECT_EQ(id_problem("T1/A", "transect id", true), "transect id holds \"/\" (it names a path segment of the service)");
  EXPECT_EQ(id_problem("T1/A", "image id"), std::nullopt);
}

TEST(IdRules, PrintableTextEscapesWhatCannotBeShown) {
  EXPECT_EQ(printable_text("caf\xE9 ok é"), "caf\\xE9 ok é");
  EXPECT_EQ(printable_text(std::string("a\0\n", 3)), "a\\x00\\x0A");
  EXPECT_EQ(printable_text("plain"), "plain");
}

// One site id rule for the service's site creation and `keys add --site`.
TEST(IdRules, SiteIdsAreShortPathSafeNames) {
  for (std::string_view id : std::initializer_list<std::string_view>{"cove", "Gull-wing_2.b", std::string_view("abcdefghijklmnopqrstuvwxyzabcdefghijklmnopqrstuvwxyzabcdefghijkl")})
    EXPECT_EQ(site_id_problem(id), std::nullopt) << id;
  for (std::string_view id : std::initializer_list<std::string_view>{"", "a b", "a/b", "caf\xC3\xA9", "x?y",
                              std::string_view("abcdefghijklmnopqrstuvwxyzabcdefghijklmnopqrstuvwxyzabcdefghijklm")})
    EXPECT_NE(site_id_problem(id), std::nullopt) << id;
  EXPECT_EQ(*site_id_problem("caf\xE9"), "site id \"caf\\xE9\" must be 1-64 characters of A-Z a-z 0-9 . _ -");
}

}  // namespace
}  // namespace strandline
