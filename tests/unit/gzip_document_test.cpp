// Stored gzip members of series documents, and Accept-Encoding negotiation.
#include <gtest/gtest.h>

#include <string>

#include "server/io/gzip_document.h"

using namespace strandline;

namespace {

TEST(GzipDocument, RoundTripsAndIsSmaller) {
  std::string text;
  for (int i = 0; i < 5000; ++i) text += "{\"chainage_m\":" + std::to_string(100 + i % 37) + ".125,\"flags\":[]},";
  const std::string member = gzip_compress(text);
  EXPECT_LT(member.size() * 5, text.size());
  EXPECT_EQ(gzip_decompress(member), text);
  EXPECT_EQ(gzip_decompress(gzip_compress("")), "");
}

// RFC 1952 §2.3: ID1 ID2 = 1f 8b, CM = 8 (deflate); the member ends with
// CRC-32 and ISIZE of the text. CRC-32 of "123456789" is cbf43926: the check
// value of the CRC-32 used by gzip, recalled from memory (a widely published
// test vector).
TEST(GzipDocument, MemberLayoutFollowsRfc1952) {
  const std::string member = gzip_compress("123456789");
  ASSERT_GE(member.size(), 18u);
  EXPECT_EQ(static_cast<unsigned char>(member[0]), 0x1f);
  EXPECT_EQ(static_cast<unsigned char>(member[1]), 0x8b);
  EXPECT_EQ(static_cast<unsigned char>(member[2]), 8);
  const auto byte = [&](std::size_t i) { return static_cast<unsigned>(static_cast<unsigned char>(member[i])); };
  const std::size_t n = member.size();
  const unsigned crc = byte(n - 8) | byte(n - 7) << 8 | byte(n - 6) << 16 | byte(n - 5) << 24;
  const unsigned isize = byte(n - 4) | byte(n - 3) << 8 | byte(n - 2) << 16 | byte(n - 1) << 24;
  EXPECT_EQ(crc, 0xcbf43926u);
  EXPECT_EQ(isize, 9u);
}

TEST(GzipDocument, DamagedMemberIsRefused) {
  std::string member = gzip_compress(std::string(1000, 'a'));
  member[member.size() / 2] ^= 0x55;
  EXPECT_THROW(gzip_decompress(member), std::runtime_error);
  EXPECT_THROW(gzip_decompress("short"), std::runtime_error);
}

// RFC 9110 §12.5.3: codings by name, case-insensitive, q=0 means "not
// acceptable", "*" stands for any coding not named.
TEST(AcceptEncoding, FollowsRfc9110) {
  EXPECT_TRUE(accepts_gzip("gzip"));
  EXPECT_TRUE(accepts_gzip("gzip, deflate, br"));
  EXPECT_TRUE(accepts_gzip(" GZip ;q=0.5"));
  EXPECT_TRUE(accepts_gzip("x-gzip"));
  EXPECT_TRUE(accepts_gzip("br;q=1.0, *;q=0.1"));
  EXPECT_FALSE(accepts_gzip(""));
  EXPECT_FALSE(accepts_gzip("identity"));
  EXPECT_FALSE(accepts_gzip("br"));
  EXPECT_FALSE(accepts_gzip("gzip;q=0"));
  EXPECT_FALSE(accepts_gzip("gzip;q=0.000, *"));
  EXPECT_FALSE(accepts_gzip("*;q=0"));
}

}  // namespace
