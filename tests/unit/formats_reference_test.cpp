// The formats reference documents every flag the engine can set, and lists the
// built-in sensor table as the code defines it.
#include <gtest/gtest.h>

#include <fstream>
#include <sstream>

#include "corrections/core/flags.h"
#include "corrections/core/sensor_table.h"

using namespace strandline;

static std::string formats_text() {
  std::ifstream in(std::string(STRANDLINE_SOURCE_DIR) + "/server/FORMATS.md");
  std::stringstream s;
  s << in.rdbuf();
  return s.str();
}

TEST(FormatsReference, DocumentsEveryFlagWithItsSeverity) {
  const std::string text = formats_text();
  ASSERT_FALSE(text.empty());
  for (const auto& f : flag_table()) {
    const char* severity = f.severity == FlagSeverity::reject ? "rejects" : f.severity == FlagSeverity::warn ? "warns" : "info";
    const std::string row = "| `" + std::string(f.name) + "` | " + severity + " |";
    EXPECT_NE(text.find(row), std::string::npos) << "missing or wrong flag row: " << row;
  }
}

TEST(FormatsReference, ListsBuiltInSensors) {
  const std::string text = formats_text();
  for (const auto& [sensor, cls] : SensorTable::defaults().entries()) {
    EXPECT_NE(text.find(sensor), std::string::npos) << sensor;
    EXPECT_NE(text.find(cls.name), std::string::npos) << cls.name;
  }
}
