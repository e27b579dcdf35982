// Sensor name -> sensor class, family and positional 1-sigma (metres). The
// defaults follow common practice for satellite-derived waterlines (~10-15 m for
// 10-30 m pixel sensors, ~4-5 m for 3-5 m small-satellite imagery); a user
// replaces them with a CSV file `sensor,class,sigma_m[,family][,offset_m][,offset_sigma_m]`
// (see the formats reference).
//
// A class groups sensors of one precision; a family groups sensors that share a
// processing chain and so may share a systematic offset (e.g. every Landsat).
// An offset is "satellite minus truth", positive seaward; the sensor_offsets
// step subtracts it when the run uses the table's offsets.
#pragma once

#include <cmath>
#include <limits>
#include <optional>
#include <string>
#include <unordered_map>
#include <vector>

namespace strandline {

struct SensorClass {
  std::string name;
  double sigma_m;
  std::string family;
  double offset_m = std::numeric_limits<double>::quiet_NaN();        // NaN: none given
  double offset_sigma_m = std::numeric_limits<double>::quiet_NaN();  // NaN: unknown
};

class SensorTable {
 public:
  // The built-in table (formats reference lists it).
  static SensorTable defaults();
  // Reads the CSV; errors name the file, line and field.
  static SensorTable from_csv_file(const std::string& path);

  // An empty `family` takes the built-in family of the sensor name, else the name itself.
  void add(const std::string& sensor, const std::string& class_name, double sigma_m, const std::string& family = "");
  // Sets the offset of a listed sensor (false when the sensor is not listed).
  bool set_offset(const std::string& sensor, double offset_m, double offset_sigma_m);

  // The class of a sensor name (case-sensitive), if listed.
  std::optional<SensorClass> lookup(const std::string& sensor) const;
  std::vector<std::string> sensor_names() const;  // sorted
  std::vector<std::pair<std::string, SensorClass>> entries() const;  // sorted by sensor
  bool has_offsets() const;  // some sensor carries an offset_m

 private:
  std::unordered_map<std::string, SensorClass> by_sensor_;
};

// The built-in family of a sensor name ("landsat", "sentinel2", "smallsat"), empty when none.
std::string builtin_sensor_family(const std::string& sensor);

}  // namespace strandline
