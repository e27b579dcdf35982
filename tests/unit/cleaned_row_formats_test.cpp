// The JSON and CSV forms of a cleaned row carry the same numbers: the JSON
// value is the number the CSV text spells, also on rounding ties.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdlib>

#include "server/io/cleaned_rows.h"

namespace strandline {
namespace {

std::vector<std::string> csv_fields(const std::string& line) {
  std::vector<std::string> out(1);
  for (char c : line) {
    if (c == ',') out.emplace_back();
    else if (c != '\n') out.back() += c;
  }
  return out;
}

TEST(CleanedRowFormats, JsonNumbersEqualTheCsvText) {
  // Values whose binary form lies just below a decimal tie: std::round(v * 1000)
  // rounds them away from the value the CSV prints.
  for (double v : {-9.9295, 2.6745, 0.0005, 1.0005, -0.0015, 123.4565}) {
    CleanedRow r;
    r.transect_id = "T1";
    r.image_id = "A";
    r.sensor = "landsat8";
    r.correction_m = v;
    r.chainage_m = v;
    r.sigma_m = v;
    r.slope = v / 100;
    const std::string csv = cleaned_rows_csv({r});
    const auto header = csv_fields(csv.substr(0, csv.find('\n')));
    const auto fields = csv_fields(csv.substr(csv.find('\n') + 1));
    ASSERT_EQ(header.size(), fields.size());
    const nlohmann::json j = cleaned_row_json(r);
    for (const char* name : {"correction_m", "chainage_m", "sigma_m", "slope"}) {
      const auto at = std::find(header.begin(), header.end(), name) - header.begin();
      EXPECT_EQ(j[name].get<double>(), std::strtod(fields[at].c_str(), nullptr)) << name << " of " << v;
    }
  }
}

TEST(CleanedRowFormats, TextIsEscapedOnceInCsvAndNotAtAllInJson) {
  CleanedRow r;
  r.transect_id = "T 1";
  r.image_id = "IMG,7 \"x\"";
  r.sensor = "landsat8";
  const std::string csv = cleaned_rows_csv({r});
  EXPECT_NE(csv.find("\nT 1,"), std::string::npos) << csv;
  EXPECT_NE(csv.find(",landsat8,\"IMG,7 \"\"x\"\"\","), std::string::npos) << csv;
  EXPECT_EQ(cleaned_row_json(r)["image_id"], "IMG,7 \"x\"");
  std::vector<CellValue> values;
  cleaned_values(r, values);
  EXPECT_EQ(format_cell(values[3], cleaned_columns()[3]), "IMG,7 \"x\"");  // writers escape, not cells
}

}  // namespace
}  // namespace strandline
