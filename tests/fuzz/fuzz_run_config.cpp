// A run configuration (the batch's --config file, a service run's body, a
// site's processing defaults): JSON text, then the run settings and the
// pipeline built from it.
#include <cstdint>

#include "corrections/core/json_text.h"
#include "server/app/run_config.h"
#include "tests/fuzz/fuzz_support.h"

using namespace strandline;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  fuzz::expect_accept_or_refuse([&] {
    const auto config = parse_json_text(fuzz::as_text(data, size), "run.json");
    app::read_run_config(config, app::RunDefaults{});
  });
  return 0;
}
