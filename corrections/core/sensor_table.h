// Sensor name -> sensor class -> positional 1-sigma (metres). The defaults follow
// common practice for satellite-derived waterlines (~10-15 m for 10-30 m pixel
// sensors, ~4-5 m for 3-5 m small-satellite imagery); a user replaces them with
// a CSV file `sensor,class,sigma_m` (see the formats reference).
#pragma once

#include <optional>
#include <string>
#include <unordered_map>
#include <vector>

namespace strandline {

struct SensorClass {
  std::string name;
  double sigma_m;
};

class SensorTable {
 public:
  // The built-in table (formats reference lists it).
  static SensorTable defaults();
  // Reads `sensor,class,sigma_m`; errors name the file and line.
  static SensorTable from_csv_file(const std::string& path);

  void add(const std::string& sensor, const std::string& class_name, double sigma_m);

  // The class of a sensor name (case-sensitive), if listed.
  std::optional<SensorClass> lookup(const std::string& sensor) const;
  std::vector<std::string> sensor_names() const;  // sorted
  std::vector<std::pair<std::string, SensorClass>> entries() const;  // sorted by sensor

 private:
  std::unordered_map<std::string, SensorClass> by_sensor_;
};

}  // namespace strandline
