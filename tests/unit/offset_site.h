// A generated site with a known truth for the sensor-offset tests: every
// transect moves at its own constant rate with a common annual cycle; Landsat
// images (landsat7, then landsat8) every 16 days 1999-2024, Sentinel-2 images
// (sentinel2a from mid-2015, sentinel2b from mid-2017) every 10 days each, 30%
// of images lost to cloud; every position scattered by its sensor's stated
// sigma (built-in table: Landsat 12 m, Sentinel-2 10 m) and the Sentinel-2
// family shifted seaward by `sentinel_offset_m`. Water level = z_ref = 0, so
// the correction is nil and the corrected position is the raw one. With
// `image_sigma_m` every image also shifts all its transects by one common error
// (geolocation), which transects cannot average away.
#pragma once

#include <cmath>
#include <numbers>
#include <random>
#include <string>
#include <vector>

#include "corrections/core/run_inputs.h"
#include "corrections/core/sensor_table.h"
#include "corrections/core/site_table.h"

namespace strandline::offset_test {

class LevelAtDatum final : public WaterLevelSource {
 public:
  std::optional<WaterLevelAt> at(TimeS, double) const override { return WaterLevelAt{0.0, 0.05, false}; }
  nlohmann::json describe() const override { return {{"kind", "constant test level"}}; }
};

struct OffsetSite {
  SiteTable table;
  std::vector<double> rate_m_per_yr;  // truth per transect (table order)
};

inline constexpr double kStartS = 915148800.0;  // 1999-01-01T00:00:00Z
inline double years_at(double t_s) { return (t_s - kStartS) / kSecondsPerJulianYear; }

inline OffsetSite make_offset_site(unsigned seed, std::size_t n_transects, double sentinel_offset_m,
                                   double landsat_sigma_m = 12.0, double sentinel_sigma_m = 10.0,
                                   double image_sigma_m = 0.0) {
  std::mt19937_64 rng(seed);
  std::normal_distribution<double> normal(0.0, 1.0);
  std::uniform_real_distribution<double> uniform(0.0, 1.0);
  struct Image {
    double t_s;
    std::string sensor;
  };
  std::vector<Image> images;
  const double day = kSecondsPerDay, end = kStartS + 25.0 * kSecondsPerJulianYear;
  for (double t = kStartS + 0.4 * day; t < end; t += 16 * day)
    images.push_back({t, years_at(t) < 14.3 ? "landsat7" : "landsat8"});
  for (double t = kStartS + 16.5 * kSecondsPerJulianYear; t < end; t += 10 * day) images.push_back({t, "sentinel2a"});
  for (double t = kStartS + 18.5 * kSecondsPerJulianYear + 5 * day; t < end; t += 10 * day)
    images.push_back({t, "sentinel2b"});

  OffsetSite site;
  std::vector<std::string> ids;
  for (std::size_t k = 0; k < n_transects; ++k) {
    site.rate_m_per_yr.push_back(-1.5 + 3.0 * uniform(rng));
    ids.push_back("T" + std::to_string(100 + k));  // table order = this order
  }
  SiteTableBuilder b;
  std::uint32_t row = 0;
  for (std::size_t m = 0; m < images.size(); ++m) {
    if (uniform(rng) < 0.3) continue;  // cloud
    const Image& im = images[m];
    const bool sentinel = im.sensor.rfind("sentinel2", 0) == 0;
    const double y = years_at(im.t_s);
    const double image_shift = image_sigma_m > 0 ? image_sigma_m * normal(rng) : 0.0;
    for (std::size_t k = 0; k < n_transects; ++k) {
      const double truth = 200.0 + site.rate_m_per_yr[k] * (y - 12.5) + 4.0 * std::cos(2 * std::numbers::pi * y);
      const double x = truth + image_shift + (sentinel ? sentinel_offset_m + sentinel_sigma_m * normal(rng)
                                         : landsat_sigma_m * normal(rng));
      b.add(b.transect_index(ids[k]), b.image_index("img" + std::to_string(m)), b.sensor_index(im.sensor),
            {row++, im.t_s, x});
    }
  }
  site.table = std::move(b).build();
  return site;
}

// Inputs for the generated site: level at the datum, one known slope.
struct OffsetInputs {
  LevelAtDatum level;
  SensorTable sensors = SensorTable::defaults();
  RunInputs inputs;
  OffsetInputs() {
    inputs.water_levels = &level;
    inputs.sensors = &sensors;
    inputs.slopes.all = SlopeValue{0.1, kUnknown};
  }
  OffsetInputs(const OffsetInputs&) = delete;
};

}  // namespace strandline::offset_test
