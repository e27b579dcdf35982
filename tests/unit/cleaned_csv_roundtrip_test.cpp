// write_cleaned_csv round trip: carried-through fields and ids holding commas,
// double quotes, line breaks (LF and CRLF), leading/trailing blanks and UTF-8
// come back byte for byte when the cleaned CSV (and the rejected CSV) are read
// again with the project's RFC 4180 reader. Catches a writer that forgets to
// quote, quotes without doubling inner quotes, or escapes a field twice.
#include <gtest/gtest.h>

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <map>
#include <string>
#include <vector>

#include "corrections/core/csv_reader.h"
#include "corrections/core/sensor_table.h"
#include "server/io/cleaned_rows.h"
#include "server/io/observations_csv.h"

using namespace strandline;
namespace fs = std::filesystem;

namespace {

class TempDir {
 public:
  TempDir() {
    char pattern[] = "/tmp/strandline-csv-roundtrip-XXXXXX";
    const char* made = mkdtemp(pattern);
    if (!made) throw std::runtime_error("mkdtemp failed");
    path_ = made;
  }
  ~TempDir() {
    std::error_code ec;
    fs::remove_all(path_, ec);
  }
  std::string file(const std::string& name) const { return (fs::path(path_) / name).string(); }

 private:
  std::string path_;
};

std::vector<std::vector<std::string>> read_all(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  CsvReader reader(in, path);
  std::vector<std::vector<std::string>> out;
  std::vector<std::string> fields;
  while (reader.next(fields)) out.push_back(fields);
  return out;
}

// Quotes every field (always valid RFC 4180), so the input itself is unambiguous.
std::string quoted(const std::string& field) {
  std::string out = "\"";
  for (char c : field) out += c == '"' ? std::string("\"\"") : std::string(1, c);
  return out + "\"";
}

struct InputRow {
  std::string transect_id, time, chainage, sensor, image_id, note, tag;
};

const std::vector<InputRow>& input_rows() {
  static const std::vector<InputRow> rows = {
      {"T 1", "2024-01-01T10:00:00Z", "150.5", "sentinel2a", "IMG,7", "calm, clear", "plain"},
      {"T 1", "2024-01-04T10:00:00Z", "151.0", "sentinel2a", "IMG\"8", "operator said \"ok\"", "a\"b,c"},
      {"T 1", "2024-01-07T10:00:00Z", "149.0", "smallsat", "IMG,\"9\",x", "two\nlines", "cr\nlf"},
      {"Tø2", "2024-01-01T10:00:00Z", "160.25", "sentinel2a", "IMG,7", "  padded  ", ""},
      {"Tø2", "2024-01-04T10:00:00Z", "161.75", "sentinel2a", "IMG\"8", "\"", ","},
      {"Tø2", "2024-01-07T10:00:00Z", "158.0", "smallsat", "ÎMG-é9", "ünïcödé\n\"quoted\"\n", "x"},
  };
  return rows;
}

void write_input(const std::string& path, bool with_bad_row) {
  std::ofstream out(path, std::ios::binary);
  out << "transect_id,time,chainage_m,sensor,image_id,note,tag\n";
  for (const auto& r : input_rows()) {
    out << quoted(r.transect_id) << ',' << r.time << ',' << r.chainage << ',' << r.sensor << ',' << quoted(r.image_id)
        << ',' << quoted(r.note) << ',' << quoted(r.tag) << '\n';
  }
  // A row rejected for its chainage, carrying the same awkward text.
  if (with_bad_row) out << "\"T 1\",2024-01-10T10:00:00Z,abc,sentinel2a,\"IMG,10\",\"bad, \"\"row\"\"\nhere\",z\n";
}

}  // namespace

TEST(CleanedCsvRoundTrip, CarriedFieldsAndIdsComeBackExactly) {
  TempDir dir;
  const std::string input = dir.file("obs.csv");
  write_input(input, false);
  const SensorTable sensors = SensorTable::defaults();
  ObservationReadOptions options;
  options.sensors = &sensors;
  const ObservationFile observations = read_observations_file(input, options);
  ASSERT_EQ(observations.table.size(), input_rows().size());

  CleanedRowStream rows(input, observations, observations.table);
  const std::string out = dir.file("cleaned.csv");
  write_cleaned_csv(rows, out, "");

  const auto records = read_all(out);
  ASSERT_EQ(records.size(), 1 + input_rows().size());
  const auto& header = records[0];
  std::map<std::string, std::size_t> col;
  for (std::size_t i = 0; i < header.size(); ++i) col[header[i]] = i;
  ASSERT_EQ(header.size(), cleaned_columns().size() + 2);
  ASSERT_TRUE(col.count("note") && col.count("tag") && col.count("transect_id") && col.count("image_id"));
  for (std::size_t i = 0; i < input_rows().size(); ++i) {
    const auto& want = input_rows()[i];
    const auto& got = records[i + 1];
    ASSERT_EQ(got.size(), header.size()) << "row " << i + 1;
    EXPECT_EQ(got[col["transect_id"]], want.transect_id) << "row " << i + 1;
    EXPECT_EQ(got[col["image_id"]], want.image_id) << "row " << i + 1;
    EXPECT_EQ(got[col["time"]], want.time) << "row " << i + 1;
    EXPECT_EQ(got[col["sensor"]], want.sensor) << "row " << i + 1;
    EXPECT_EQ(got[col["note"]], want.note) << "row " << i + 1;
    EXPECT_EQ(got[col["tag"]], want.tag) << "row " << i + 1;
    EXPECT_DOUBLE_EQ(std::stod(got[col["chainage_raw_m"]]), std::stod(want.chainage)) << "row " << i + 1;
  }
}

TEST(CleanedCsvRoundTrip, RejectedRowsKeepTheirFieldsAndReason) {
  TempDir dir;
  const std::string input = dir.file("obs.csv");
  write_input(input, true);
  const SensorTable sensors = SensorTable::defaults();
  ObservationReadOptions options;
  options.sensors = &sensors;
  options.skip_invalid = true;
  const ObservationFile observations = read_observations_file(input, options);
  ASSERT_EQ(observations.table.size(), input_rows().size());
  ASSERT_EQ(observations.rejected.size(), 1u);

  CleanedRowStream rows(input, observations, observations.table);
  const std::string out = dir.file("cleaned.csv"), rejected = dir.file("rejected.csv");
  write_cleaned_csv(rows, out, rejected);

  EXPECT_EQ(read_all(out).size(), 1 + input_rows().size());
  const auto records = read_all(rejected);
  ASSERT_EQ(records.size(), 2u);
  const std::vector<std::string> header = {"line", "field",    "value",    "reason", "transect_id", "time",
                                           "chainage_m", "sensor", "image_id", "note",   "tag"};
  EXPECT_EQ(records[0], header);
  const auto& r = records[1];
  ASSERT_EQ(r.size(), header.size());
  EXPECT_EQ(r[0], "12");  // the bad row's first line: header 1, six rows on lines 2-11 (two span 3 lines)
  EXPECT_EQ(r[1], "chainage_m");
  EXPECT_EQ(r[2], "abc");
  EXPECT_EQ(r[4], "T 1");
  EXPECT_EQ(r[8], "IMG,10");
  EXPECT_EQ(r[9], "bad, \"row\"\nhere");
  EXPECT_EQ(r[10], "z");
}

// RFC 4180 allows CRLF inside a quoted field; a carried-through field keeps it.
TEST(CleanedCsvRoundTrip, CarriageReturnLineFeedInsideQuotesIsKept) {
  TempDir dir;
  const std::string input = dir.file("obs.csv");
  {
    std::ofstream out(input, std::ios::binary);
    out << "transect_id,time,chainage_m,sensor,image_id,note\n"
        << "T1,2024-01-01T10:00:00Z,150.5,sentinel2a,IMG1,\"first\r\nsecond\"\n";
  }
  const SensorTable sensors = SensorTable::defaults();
  ObservationReadOptions options;
  options.sensors = &sensors;
  const ObservationFile observations = read_observations_file(input, options);
  CleanedRowStream rows(input, observations, observations.table);
  const std::string out = dir.file("cleaned.csv");
  write_cleaned_csv(rows, out, "");
  const auto records = read_all(out);
  ASSERT_EQ(records.size(), 2u);
  EXPECT_EQ(records[1].back(), "first\r\nsecond");
}
