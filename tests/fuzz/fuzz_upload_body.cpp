// Upload bodies as the service decodes them (CSV and JSON, every kind): the
// first byte picks kind and encoding, the rest is the body. Besides the
// refusal rules, every collected row issue must be printable once rendered.
#include <cstdint>
#include <set>

#include "corrections/core/sensor_table.h"
#include "server/app/upload_rows.h"
#include "tests/fuzz/fuzz_support.h"

using namespace strandline;

namespace {
template <class Parsed>
void check(const Parsed& parsed) {
  for (const auto& issue : parsed.invalid) {
    fuzz::require_printable(issue.reason.c_str());
    fuzz::require_printable(printable_text(issue.value).c_str());
  }
}
}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  if (size == 0) return 0;
  static const SensorTable sensors = SensorTable::defaults();
  static const std::set<std::string> transects = {"T1", "T2", "B01"};
  const BodyFormat format = data[0] & 1 ? BodyFormat::json : BodyFormat::csv;
  const int kind = (data[0] >> 1) % 4;
  const auto body = fuzz::as_text(data + 1, size - 1);
  fuzz::expect_accept_or_refuse([&] {
    switch (kind) {
      case 0: check(app::parse_observation_upload(body, format, transects, sensors)); break;
      case 1: check(app::parse_water_level_upload(body, format)); break;
      case 2: check(app::parse_wave_upload(body, format)); break;
      default: check(app::parse_slope_upload(body, format, transects)); break;
    }
  });
  return 0;
}
