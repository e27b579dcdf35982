// Upload bodies to store rows: a large CSV body is parsed in two halves at
// once; rows, counts and the line named by every bad row must be exactly those
// of the body itself, wherever the split falls.
#include <gtest/gtest.h>

#include <set>
#include <string>

#include "server/app/upload_rows.h"

using namespace strandline;
using namespace strandline::app;

namespace {

constexpr const char* kHeader = "transect_id,time,chainage_m,sensor,image_id,cloud_fraction,georef_rmse_m\n";

// `rows` data lines (line 2 onwards); a line number in `bad` gets an invalid chainage.
std::string body_of(int rows, const std::set<int>& bad, bool crlf = false) {
  std::string body = kHeader;
  for (int i = 0; i < rows; ++i) {
    const int line = i + 2;
    body += "T" + std::to_string(1 + i % 3) + ",2020-01-01T00:00:00Z," +
            (bad.count(line) ? std::string("wide") : std::to_string(100 + i % 50)) + ",sentinel2a,IMG" +
            std::to_string(i) + ",0.05,4.0" + (crlf ? "\r\n" : "\n");
  }
  return body;
}

const std::set<std::string> kTransects = {"T1", "T2", "T3"};

void expect_exact(const std::string& body, int rows, const std::set<int>& bad) {
  const auto parsed = parse_observation_upload(body, BodyFormat::csv, kTransects, SensorTable::defaults());
  EXPECT_EQ(parsed.received, rows);
  ASSERT_EQ(parsed.invalid.size(), bad.size());
  auto b = bad.begin();
  for (const auto& issue : parsed.invalid) {
    EXPECT_EQ(issue.line, *b++);
    EXPECT_EQ(issue.field, "chainage_m");
  }
  ASSERT_EQ(parsed.rows.size(), static_cast<std::size_t>(rows) - bad.size());
  // Every valid row keeps its own line: image IMGi sits on line i + 2.
  std::int64_t previous = 0;
  for (const auto& r : parsed.rows) {
    EXPECT_EQ(r.image_id, "IMG" + std::to_string(r.line - 2));
    EXPECT_GT(r.line, previous);
    previous = r.line;
  }
}

TEST(ObservationUpload, LargeBodySplitKeepsLinesAndCounts) {
  const int rows = 200000;  // ~15 MiB: above the two-thread threshold
  const std::set<int> bad = {2, 3, 99999, 100000, 100001, 100002, 100003, 150000, rows + 1};
  const std::string body = body_of(rows, bad);
  ASSERT_GT(body.size(), 8u << 20);
  expect_exact(body, rows, bad);
}

TEST(ObservationUpload, LargeBodyWithCrLfAndNoFinalNewline) {
  const int rows = 200000;
  const std::set<int> bad = {4, 100001, rows};
  std::string body = body_of(rows, bad, true);
  body.resize(body.size() - 2);
  expect_exact(body, rows, bad);
}

// A quoted field may hold a line break, so a body with quotes is never split:
// the record spanning two lines is one row (refused whole: an id holds no
// control character), named by the line it starts on.
TEST(ObservationUpload, QuotedLargeBodyIsParsedWhole) {
  const int rows = 200000;
  std::string body = body_of(rows, {});
  body += "T1,2020-01-01T00:00:00Z,101,sentinel2a,\"IMG\nBROKEN\",0.05,4.0\n";
  body += "T1,2020-01-01T00:00:01Z,102,sentinel2a,\"IMG,LAST\",0.05,4.0\n";
  const auto parsed = parse_observation_upload(body, BodyFormat::csv, kTransects, SensorTable::defaults());
  EXPECT_EQ(parsed.received, rows + 2);
  ASSERT_EQ(parsed.rows.size(), static_cast<std::size_t>(rows + 1));
  EXPECT_EQ(parsed.rows.back().image_id, "IMG,LAST");
  EXPECT_EQ(parsed.rows.back().line, rows + 4);
  ASSERT_EQ(parsed.invalid.size(), 1u);
  EXPECT_EQ(parsed.invalid[0].line, rows + 2);
  EXPECT_EQ(parsed.invalid[0].field, "image_id");
  EXPECT_EQ(parsed.invalid[0].value, "IMG\\x0ABROKEN");
}

}  // namespace
