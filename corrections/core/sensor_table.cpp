#include "corrections/core/sensor_table.h"

#include <algorithm>
#include <cmath>
#include <fstream>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"

namespace strandline {

namespace {
// A shoreline offset beyond this is a unit or sign mistake, not a sensor difference.
constexpr double kMaxSensorOffset_m = 500.0;
}  // namespace

std::string builtin_sensor_family(const std::string& sensor) {
  for (const char* s : {"landsat5", "landsat7", "landsat8", "landsat9"})
    if (sensor == s) return "landsat";
  for (const char* s : {"sentinel2a", "sentinel2b", "sentinel2c"})
    if (sensor == s) return "sentinel2";
  if (sensor == "smallsat") return "smallsat";
  return "";
}

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

void SensorTable::add(const std::string& sensor, const std::string& class_name, double sigma_m,
                      const std::string& family) {
  std::string f = family.empty() ? builtin_sensor_family(sensor) : family;
  if (f.empty()) f = sensor;
  by_sensor_[sensor] = SensorClass{class_name, sigma_m, std::move(f)};
}

bool SensorTable::set_offset(const std::string& sensor, double offset_m, double offset_sigma_m) {
  auto it = by_sensor_.find(sensor);
  if (it == by_sensor_.end()) return false;
  it->second.offset_m = offset_m;
  it->second.offset_sigma_m = offset_sigma_m;
  return true;
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

bool SensorTable::has_offsets() const {
  return std::any_of(by_sensor_.begin(), by_sensor_.end(),
                     [](const auto& e) { return !std::isnan(e.second.offset_m); });
}

SensorTable SensorTable::from_csv_file(const std::string& path) {
  std::ifstream in(path);
  if (!in) throw InputError(path, 0, "", "", "cannot open file");
  CsvTable csv(in, path);
  const auto c_sensor = csv.header().require("sensor");
  const auto c_class = csv.header().require("class");
  const auto c_sigma = csv.header().require("sigma_m");
  const auto c_family = csv.header().find("family");
  const auto c_offset = csv.header().find("offset_m");
  const auto c_offset_sigma = csv.header().find("offset_sigma_m");
  if (c_offset_sigma && !c_offset) throw InputError(path, 1, "offset_sigma_m", "", "needs an offset_m column");
  SensorTable t;
  std::vector<std::string> f;
  const auto number = [&](std::size_t column, const char* field) {
    try {
      return parse_number(f[column]);
    } catch (const FieldError& e) {
      throw InputError(path, csv.line(), field, f[column], e.what());
    }
  };
  while (csv.next(f)) {
    if (f[c_sensor].empty()) throw InputError(path, csv.line(), "sensor", "", "empty sensor name");
    if (f[c_class].empty()) throw InputError(path, csv.line(), "class", "", "empty class name");
    const double sigma = number(c_sigma, "sigma_m");
    if (sigma <= 0) throw InputError(path, csv.line(), "sigma_m", f[c_sigma], "must be positive");
    if (t.lookup(f[c_sensor]))
      throw InputError(path, csv.line(), "sensor", f[c_sensor], "listed twice");
    t.add(f[c_sensor], f[c_class], sigma, c_family ? f[*c_family] : "");
    // An empty offset_m: no offset known for that sensor.
    if (c_offset && !f[*c_offset].empty()) {
      const double offset = number(*c_offset, "offset_m");
      if (std::abs(offset) > kMaxSensorOffset_m)
        throw InputError(path, csv.line(), "offset_m", f[*c_offset], "implausible offset (metres expected, at most 500)");
      double offset_sigma = std::numeric_limits<double>::quiet_NaN();
      if (c_offset_sigma && !f[*c_offset_sigma].empty()) {
        offset_sigma = number(*c_offset_sigma, "offset_sigma_m");
        if (offset_sigma < 0)
          throw InputError(path, csv.line(), "offset_sigma_m", f[*c_offset_sigma], "must not be negative");
      }
      t.set_offset(f[c_sensor], offset, offset_sigma);
    } else if (c_offset_sigma && !f[*c_offset_sigma].empty()) {
      throw InputError(path, csv.line(), "offset_sigma_m", f[*c_offset_sigma], "given without offset_m");
    }
  }
  return t;
}

}  // namespace strandline
