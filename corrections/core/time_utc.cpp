#include "corrections/core/time_utc.h"

#include <date/date.h>

#include <chrono>
#include <cmath>
#include <cstdio>

#include "corrections/core/errors.h"

namespace strandline {

namespace {

// A cursor over the text that reads fixed-width decimal fields.
struct Cursor {
  std::string_view text;
  std::size_t pos = 0;

  bool at_end() const { return pos >= text.size(); }
  char peek() const { return at_end() ? '\0' : text[pos]; }

  int digits(int count, const char* what) {
    int value = 0;
    for (int i = 0; i < count; ++i) {
      if (at_end() || text[pos] < '0' || text[pos] > '9')
        throw FieldError(std::string("expected ") + std::to_string(count) + " digits for the " +
                         what + " (RFC 3339, e.g. 2019-03-04T23:41:07Z)");
      value = value * 10 + (text[pos] - '0');
      ++pos;
    }
    return value;
  }

  void expect(char c, const char* context) {
    if (peek() != c)
      throw FieldError(std::string("expected '") + c + "' " + context +
                       " (RFC 3339, e.g. 2019-03-04T23:41:07Z)");
    ++pos;
  }
};

}  // namespace

TimeS parse_time_utc(std::string_view text) {
  // Surrounding blanks are tolerated; anything else must match the grammar.
  while (!text.empty() && (text.front() == ' ' || text.front() == '\t')) text.remove_prefix(1);
  while (!text.empty() && (text.back() == ' ' || text.back() == '\t' || text.back() == '\r'))
    text.remove_suffix(1);
  if (text.empty()) throw FieldError("empty time");

  Cursor c{text};
  const int year = c.digits(4, "year");
  c.expect('-', "after the year");
  const int month = c.digits(2, "month");
  c.expect('-', "after the month");
  const int day = c.digits(2, "day");
  if (c.at_end()) throw FieldError("date without time of day and zone (expected e.g. 2019-03-04T00:00Z)");
  if (c.peek() != 'T' && c.peek() != 't' && c.peek() != ' ')
    throw FieldError("expected 'T' between date and time");
  ++c.pos;
  const int hour = c.digits(2, "hour");
  c.expect(':', "after the hour");
  const int minute = c.digits(2, "minute");
  int second = 0;
  double fraction = 0.0;
  if (c.peek() == ':') {
    ++c.pos;
    second = c.digits(2, "second");
    if (c.peek() == '.' || c.peek() == ',') {
      ++c.pos;
      double scale = 0.1;
      std::size_t start = c.pos;
      while (!c.at_end() && c.peek() >= '0' && c.peek() <= '9') {
        fraction += (c.peek() - '0') * scale;
        scale *= 0.1;
        ++c.pos;
      }
      if (c.pos == start) throw FieldError("expected digits after the decimal point of the seconds");
    }
  }
  int offset_minutes = 0;
  if (c.at_end()) throw FieldError("missing zone designator (append Z for UTC or an offset such as +02:00)");
  if (c.peek() == 'Z' || c.peek() == 'z') {
    ++c.pos;
  } else if (c.peek() == '+' || c.peek() == '-') {
    const int sign = c.peek() == '+' ? 1 : -1;
    ++c.pos;
    const int off_h = c.digits(2, "zone offset hours");
    c.expect(':', "in the zone offset (+HH:MM)");
    const int off_m = c.digits(2, "zone offset minutes");
    if (off_h > 23 || off_m > 59) throw FieldError("zone offset out of range");
    offset_minutes = sign * (off_h * 60 + off_m);
  } else {
    throw FieldError("unexpected text where the zone designator should be (Z or +HH:MM)");
  }
  if (!c.at_end()) throw FieldError("unexpected text after the zone designator");

  if (month < 1 || month > 12) throw FieldError("month out of range");
  const date::year_month_day ymd{date::year{year}, date::month{static_cast<unsigned>(month)},
                                 date::day{static_cast<unsigned>(day)}};
  if (!ymd.day().ok() || !ymd.ok()) throw FieldError("day out of range for the month");
  if (hour > 23) throw FieldError("hour out of range");
  if (minute > 59) throw FieldError("minute out of range");
  // 60 is allowed by RFC 3339 for a leap second; it is folded onto the next second.
  if (second > 60) throw FieldError("second out of range");

  const date::sys_days days{ymd};
  const double day_seconds = static_cast<double>(days.time_since_epoch().count()) * kSecondsPerDay;
  return day_seconds + hour * 3600.0 + minute * 60.0 + second + fraction - offset_minutes * 60.0;
}

std::string format_time_utc(TimeS time_s) {
  using namespace std::chrono;
  const double whole = std::floor(time_s);
  long long millis = std::llround((time_s - whole) * 1000.0);
  long long seconds = static_cast<long long>(whole);
  if (millis == 1000) {
    millis = 0;
    ++seconds;
  }
  const sys_seconds tp{std::chrono::seconds{seconds}};
  const auto day_point = date::floor<date::days>(tp);
  const date::year_month_day ymd{day_point};
  const date::hh_mm_ss<std::chrono::seconds> tod{tp - day_point};
  char buffer[48];
  if (millis == 0) {
    std::snprintf(buffer, sizeof buffer, "%04d-%02u-%02uT%02d:%02d:%02dZ", int(ymd.year()),
                  unsigned(ymd.month()), unsigned(ymd.day()), int(tod.hours().count()),
                  int(tod.minutes().count()), int(tod.seconds().count()));
  } else {
    std::snprintf(buffer, sizeof buffer, "%04d-%02u-%02uT%02d:%02d:%02d.%03lldZ", int(ymd.year()),
                  unsigned(ymd.month()), unsigned(ymd.day()), int(tod.hours().count()),
                  int(tod.minutes().count()), int(tod.seconds().count()), millis);
  }
  return buffer;
}

}  // namespace strandline
