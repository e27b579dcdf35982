#include "server/io/wave_csv.h"

#include <fstream>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"

namespace strandline {

namespace {

constexpr const char* kKnownColumns[] = {"time", "hs_m", "tp_s", "dir_deg", "depth_m"};

struct FieldReader {
  const CsvTable& table;
  const std::vector<std::string>& fields;

  [[noreturn]] void fail(const std::string& name, std::size_t column, const std::string& reason) const {
    throw InputError(table.file(), table.line(), name, fields[column], reason);
  }
  double number(const std::string& name, std::size_t column, double low, double high, const char* unit) const {
    double v = 0;
    try {
      v = parse_number(fields[column]);
    } catch (const FieldError& e) {
      fail(name, column, e.what());
    }
    if (v < low || v > high)
      fail(name, column, "outside [" + format(low) + ", " + format(high) + "] " + unit);
    return v;
  }
  static std::string format(double v) {
    std::string s = std::to_string(v);
    while (s.size() > 1 && s.back() == '0') s.pop_back();
    if (!s.empty() && s.back() == '.') s.pop_back();
    return s;
  }
};

}  // namespace

WaveRecord read_wave_csv(std::istream& in, const std::string& file) {
  CsvTable table(in, file);
  const CsvHeader& header = table.header();
  for (const auto& name : header.names()) {
    bool ok = false;
    for (const char* k : kKnownColumns) ok = ok || name == k;
    if (!ok)
      throw InputError(file, 1, "", "",
                       "unknown column \"" + name + "\" (expected time,hs_m,tp_s,dir_deg and optionally depth_m)");
  }
  const std::size_t c_time = header.require("time");
  const std::size_t c_hs = header.require("hs_m");
  const std::size_t c_tp = header.require("tp_s");
  const std::size_t c_dir = header.require("dir_deg");
  const auto c_depth = header.find("depth_m");

  std::vector<WaveSample> samples;
  std::vector<std::string> fields;
  std::int64_t previous_line = 0;
  while (table.next(fields)) {
    const FieldReader r{table, fields};
    WaveSample s;
    try {
      s.time_s = parse_time_utc(fields[c_time]);
    } catch (const FieldError& e) {
      r.fail("time", c_time, e.what());
    }
    if (!samples.empty() && !(s.time_s > samples.back().time_s))
      r.fail("time", c_time,
             "not after the previous row (line " + std::to_string(previous_line) + "): times must be strictly increasing");
    s.hs_m = r.number("hs_m", c_hs, 0.0, 30.0, "m");
    s.tp_s = r.number("tp_s", c_tp, 1.0, 40.0, "s");
    std::optional<double> dir;
    try {
      dir = parse_optional_number(fields[c_dir]);
    } catch (const FieldError& e) {
      r.fail("dir_deg", c_dir, e.what());
    }
    if (dir) s.dir_deg = r.number("dir_deg", c_dir, 0.0, 360.0, "degrees");
    if (c_depth) {
      double depth = r.number("depth_m", *c_depth, 0.0, 11000.0, "m");
      if (!(depth > 0)) r.fail("depth_m", *c_depth, "must be positive (the depth of the record)");
      s.depth_m = depth;
    }
    samples.push_back(s);
    previous_line = table.line();
  }
  if (samples.empty()) throw InputError(file, 0, "", "", "no wave rows after the header");
  return WaveRecord(std::move(samples));
}

WaveRecord read_wave_csv_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, 0, "", "", "cannot open the wave record");
  return read_wave_csv(in, path);
}

}  // namespace strandline
