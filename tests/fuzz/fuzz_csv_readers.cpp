// The batch readers of tabular files: the first byte picks the reader, the
// rest is the file.
#include <cstdint>
#include <sstream>

#include "corrections/core/sensor_table.h"
#include "server/io/observations_csv.h"
#include "server/io/slopes_json.h"
#include "server/io/transect_params_csv.h"
#include "server/io/water_level_csv.h"
#include "server/io/wave_csv.h"
#include "tests/fuzz/fuzz_support.h"

using namespace strandline;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  if (size == 0) return 0;
  static const SensorTable sensors = SensorTable::defaults();
  const int reader = data[0] % 6;
  std::istringstream in(std::string(fuzz::as_text(data + 1, size - 1)));
  fuzz::expect_accept_or_refuse([&] {
    switch (reader) {
      case 0: read_observations(in, "f.csv", {.skip_invalid = false, .sensors = &sensors, .unknown_sensor_hint = {}}); break;
      case 1: read_observations(in, "f.csv", {.skip_invalid = true, .sensors = &sensors, .unknown_sensor_hint = {}}); break;
      case 2: read_water_levels(in, "f.csv", 0.05); break;
      case 3: read_wave_csv(in, "f.csv"); break;
      case 4: read_transect_params(in, "f.csv", false); break;
      default: read_slopes_json(in, "f.json"); break;
    }
  });
  return 0;
}
