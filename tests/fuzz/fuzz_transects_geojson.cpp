// Our checks around GDAL's GeoJSON reader: a transect file (lines or points
// with azimuth and length) read from memory. GDAL itself is not instrumented.
#include <cstdint>
#include <string>

#include <cpl_conv.h>
#include <cpl_vsi.h>

#include "server/geo/transect_reader.h"
#include "tests/fuzz/fuzz_support.h"

using namespace strandline;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  static const bool quiet = [] {
    CPLSetErrorHandler(CPLQuietErrorHandler);
    return true;
  }();
  (void)quiet;
  const std::string path = "/vsimem/fuzz_transects.geojson";
  VSILFILE* file = VSIFileFromMemBuffer(path.c_str(), const_cast<GByte*>(data), size, FALSE);
  if (!file) return 0;
  VSIFCloseL(file);
  geo::TransectReadOptions options;
  options.crs = "EPSG:32631";
  options.drivers = {"GeoJSON"};  // as the service reads a body
  fuzz::expect_accept_or_refuse([&] { geo::read_transects(path, options); });
  VSIUnlink(path.c_str());
  return 0;
}
