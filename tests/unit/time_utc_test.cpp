// Time grammar (RFC 3339 with Z or an offset; seconds and fractions optional).
// Reference values: the Unix epoch offsets below are computed by Python's
// datetime (e.g. datetime(2019,3,4,23,41,7,tzinfo=timezone.utc).timestamp()
// = 1551742867), recalled from memory and re-derivable by hand from days since 1970.
#include <gtest/gtest.h>

#include "corrections/core/errors.h"
#include "corrections/core/time_utc.h"

using namespace strandline;

TEST(TimeUtc, ParsesFullUtcTime) { EXPECT_DOUBLE_EQ(parse_time_utc("2019-03-04T23:41:07Z"), 1551742867.0); }

TEST(TimeUtc, ParsesWithoutSeconds) { EXPECT_DOUBLE_EQ(parse_time_utc("2020-01-01T00:00Z"), 1577836800.0); }

TEST(TimeUtc, ParsesFractionAndOffset) {
  // 01:30:00.25+02:00 is 23:30:00.25 the previous day in UTC.
  EXPECT_DOUBLE_EQ(parse_time_utc("2020-01-02T01:30:00.25+02:00"), 1577836800.0 + 23.5 * 3600 + 0.25);
  EXPECT_DOUBLE_EQ(parse_time_utc("2020-01-01T00:00:00-05:30"), 1577836800.0 + 5.5 * 3600);
}

TEST(TimeUtc, LeapDayAccepted) { EXPECT_DOUBLE_EQ(parse_time_utc("2000-02-29T00:00:00Z"), 951782400.0); }

TEST(TimeUtc, RoundTripsFormatting) {
  EXPECT_EQ(format_time_utc(1551742867.0), "2019-03-04T23:41:07Z");
  EXPECT_EQ(format_time_utc(1551742867.5), "2019-03-04T23:41:07.500Z");
  EXPECT_EQ(format_time_utc(-86400.0), "1969-12-31T00:00:00Z");
}

static std::string error_of(const std::string& text) {
  try {
    parse_time_utc(text);
  } catch (const FieldError& e) {
    return e.what();
  }
  return "";
}

TEST(TimeUtc, RejectsMonthOutOfRange) { EXPECT_EQ(error_of("2019-13-01T00:00Z"), "month out of range"); }
TEST(TimeUtc, RejectsDayOutOfRange) { EXPECT_EQ(error_of("2019-02-29T00:00Z"), "day out of range for the month"); }
TEST(TimeUtc, RejectsHourOutOfRange) { EXPECT_EQ(error_of("2019-02-01T24:00Z"), "hour out of range"); }
TEST(TimeUtc, RejectsMissingZone) { EXPECT_NE(error_of("2019-02-01T10:00:00").find("missing zone designator"), std::string::npos); }
TEST(TimeUtc, RejectsDateOnly) { EXPECT_NE(error_of("2019-02-01").find("without time of day"), std::string::npos); }
TEST(TimeUtc, RejectsTrailingText) { EXPECT_NE(error_of("2019-02-01T10:00Zx").find("after the zone"), std::string::npos); }
TEST(TimeUtc, RejectsGarbage) { EXPECT_NE(error_of("yesterday").find("year"), std::string::npos); }
TEST(TimeUtc, RejectsEmpty) { EXPECT_EQ(error_of("   "), "empty time"); }
