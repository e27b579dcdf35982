#include "corrections/core/sensor_table.h"

#include <algorithm>
#include <cmath>
#include <fstream>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"

namespace strandline {

SensorTable SensorTable::defaults() {
  // Common practice for satellite-derived waterlines (see the formats reference):
  // 10-30 m pixel sensors ~10-15 m, 3-5 m small-satellite imagery ~4-5 m.
  SensorTable t;
  for (const char* s : {"landsat5", "landsat7", "landsat8", "landsat9"}) t.add(s, "moderate_resolution", 12.0);
  for (const char* s : {"sentinel2a", "sentinel2b", "sentinel2c"}) t.add(s, "moderate_resolution", 10.0);
  t.add("smallsat", "high_resolution", 4.5);
  t.add("moderate_resolution", "moderate_resolution", 12.0);
  t.add("high_resolution", "high_resolution", 4.5);
  return t;
}

void SensorTable::add(const std::string& sensor, const std::string& class_name, double sigma_m) {
  by_sensor_[sensor] = SensorClass{class_name, sigma_m};
}

std::optional<SensorClass> SensorTable::lookup(const std::string& sensor) const {
  auto it = by_sensor_.find(sensor);
  if (it == by_sensor_.end()) return std::nullopt;
  return it->second;
}

std::vector<std::string> SensorTable::sensor_names() const {
  std::vector<std::string> names;
  for (const auto& [k, v] : by_sensor_) names.push_back(k);
  std::sort(names.begin(), names.end());
  return names;
}

std::vector<std::pair<std::string, SensorClass>> SensorTable::entries() const {
  std::vector<std::pair<std::string, SensorClass>> out(by_sensor_.begin(), by_sensor_.end());
  std::sort(out.begin(), out.end(), [](const auto& a, const auto& b) { return a.first < b.first; });
  return out;
}

SensorTable SensorTable::from_csv_file(const std::string& path) {
  std::ifstream in(path);
  if (!in) throw InputError(path, 0, "", "", "cannot open file");
  CsvTable csv(in, path);
  const auto c_sensor = csv.header().require("sensor");
  const auto c_class = csv.header().require("class");
  const auto c_sigma = csv.header().require("sigma_m");
  SensorTable t;
  std::vector<std::string> f;
  while (csv.next(f)) {
    if (f[c_sensor].empty()) throw InputError(path, csv.line(), "sensor", "", "empty sensor name");
    if (f[c_class].empty()) throw InputError(path, csv.line(), "class", "", "empty class name");
    double sigma = 0;
    try {
      sigma = parse_number(f[c_sigma]);
    } catch (const FieldError& e) {
      throw InputError(path, csv.line(), "sigma_m", f[c_sigma], e.what());
    }
    if (sigma <= 0) throw InputError(path, csv.line(), "sigma_m", f[c_sigma], "must be positive");
    if (t.lookup(f[c_sensor]))
      throw InputError(path, csv.line(), "sensor", f[c_sensor], "listed twice");
    t.add(f[c_sensor], f[c_class], sigma);
  }
  return t;
}

}  // namespace strandline
