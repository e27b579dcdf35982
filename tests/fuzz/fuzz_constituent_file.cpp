// A tide constituent file (JSON) as the batch and the service read it.
#include <cstdint>
#include <sstream>

#include "corrections/tide/constituent_file.h"
#include "tests/fuzz/fuzz_support.h"

using namespace strandline;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  std::istringstream in(std::string(fuzz::as_text(data, size)));
  fuzz::expect_accept_or_refuse([&] { tide::read_constituent_file(in, "site_tide.json"); });
  return 0;
}
