#include "server/io/observations_csv.h"

#include <fstream>

#include "corrections/core/errors.h"

namespace strandline {

ObservationColumns ObservationColumns::from_header(const CsvHeader& header, const std::string& file) {
  if (header.find("correction_m") || header.find("chainage_raw_m"))
    throw InputError(file, 1, "", "",
                     "this looks like corrected output (it has a correction_m or chainage_raw_m column); "
                     "give the raw observations so nothing is corrected twice");
  ObservationColumns c{};
  c.transect_id = header.require("transect_id");
  c.time = header.require("time");
  c.chainage_m = header.require("chainage_m");
  c.sensor = header.require("sensor");
  c.image_id = header.require("image_id");
  c.cloud_fraction = header.find("cloud_fraction");
  c.georef_rmse_m = header.find("georef_rmse_m");
  for (std::size_t i = 0; i < header.names().size(); ++i) {
    if (i == c.transect_id || i == c.time || i == c.chainage_m || i == c.sensor || i == c.image_id) continue;
    if ((c.cloud_fraction && i == *c.cloud_fraction) || (c.georef_rmse_m && i == *c.georef_rmse_m)) continue;
    c.extra.push_back(i);
  }
  return c;
}

namespace {

std::string trimmed(const std::string& s) {
  std::size_t a = 0, b = s.size();
  while (a < b && (s[a] == ' ' || s[a] == '\t')) ++a;
  while (b > a && (s[b - 1] == ' ' || s[b - 1] == '\t')) --b;
  return s.substr(a, b - a);
}

RowProblem problem(const std::string& field, const std::string& value, const std::string& reason) {
  return RowProblem{0, field, value, reason};
}

}  // namespace

std::optional<RowProblem> validate_observation_row(const std::vector<std::string>& f, const ObservationColumns& c,
                                                   const SensorTable* sensors, ObservationRow& out) {
  out.transect_id = trimmed(f[c.transect_id]);
  if (out.transect_id.empty()) return problem("transect_id", f[c.transect_id], "empty transect id");
  out.image_id = trimmed(f[c.image_id]);
  if (out.image_id.empty()) return problem("image_id", f[c.image_id], "empty image id");
  out.sensor = trimmed(f[c.sensor]);
  if (out.sensor.empty()) return problem("sensor", f[c.sensor], "empty sensor name");
  if (sensors && !sensors->lookup(out.sensor)) {
    std::string known;
    for (const auto& n : sensors->sensor_names()) known += (known.empty() ? "" : ", ") + n;
    return problem("sensor", f[c.sensor],
                   "sensor not in the sensor table (known: " + known + "; give --sensor-table FILE to add it)");
  }
  try {
    out.time_s = parse_time_utc(f[c.time]);
  } catch (const FieldError& e) {
    return problem("time", f[c.time], e.what());
  }
  try {
    out.chainage_raw_m = parse_number(f[c.chainage_m]);
  } catch (const FieldError& e) {
    return problem("chainage_m", f[c.chainage_m], e.what());
  }
  out.cloud_fraction = kUnknown;
  if (c.cloud_fraction) {
    try {
      if (auto v = parse_optional_number(f[*c.cloud_fraction])) out.cloud_fraction = *v;
    } catch (const FieldError& e) {
      return problem("cloud_fraction", f[*c.cloud_fraction], e.what());
    }
    if (known(out.cloud_fraction) && (out.cloud_fraction < 0 || out.cloud_fraction > 1))
      return problem("cloud_fraction", f[*c.cloud_fraction], "must lie between 0 and 1 (a fraction, not a percentage)");
  }
  out.georef_rmse_m = kUnknown;
  if (c.georef_rmse_m) {
    try {
      if (auto v = parse_optional_number(f[*c.georef_rmse_m])) out.georef_rmse_m = *v;
    } catch (const FieldError& e) {
      return problem("georef_rmse_m", f[*c.georef_rmse_m], e.what());
    }
    if (known(out.georef_rmse_m) && out.georef_rmse_m < 0)
      return problem("georef_rmse_m", f[*c.georef_rmse_m], "must not be negative");
  }
  return std::nullopt;
}

ObservationFile read_observations(std::istream& in, const std::string& file, const ObservationReadOptions& options) {
  CsvTable csv(in, file);
  ObservationFile result;
  result.header = csv.header().names();
  result.columns = ObservationColumns::from_header(csv.header(), file);
  SiteTableBuilder builder;
  std::vector<std::string> fields;
  ObservationRow row;
  std::uint32_t data_row = 0;
  // One image has one acquisition time and one sensor on every transect.
  struct ImageSeen {
    TimeS time_s;
    std::uint16_t sensor;
    std::uint32_t data_row;
  };
  std::vector<ImageSeen> images_seen;
  auto reject = [&](RowProblem p) {
    p.line = csv.line();
    if (!options.skip_invalid) throw InputError(file, p.line, p.field, p.value, p.reason);
    result.rejected.push_back({data_row, std::move(p)});
  };
  while (true) {
    try {
      if (!csv.next(fields)) break;
    } catch (const InputError& e) {
      // A record with the wrong field count is a bad row like any other.
      if (!options.skip_invalid) throw;
      result.rejected.push_back({data_row, RowProblem{e.line, "", "", e.reason}});
      ++data_row;
      continue;
    }
    if (auto p = validate_observation_row(fields, result.columns, options.sensors, row)) {
      reject(std::move(*p));
      ++data_row;
      continue;
    }
    const auto t = builder.transect_index(row.transect_id);
    const auto im = builder.image_index(row.image_id);
    const auto s = builder.sensor_index(row.sensor);
    if (im == images_seen.size()) images_seen.push_back({row.time_s, s, data_row});
    const ImageSeen& seen = images_seen[im];
    if (seen.time_s != row.time_s || seen.sensor != s) {
      const bool time_differs = seen.time_s != row.time_s;
      reject(RowProblem{0, time_differs ? "time" : "sensor", time_differs ? fields[result.columns.time] : row.sensor,
                        "image " + row.image_id + " has a different " + (time_differs ? "time" : "sensor") +
                            " in data row " + std::to_string(seen.data_row + 1) + " (one image, one time and sensor)"});
      ++data_row;
      continue;
    }
    SiteTableBuilder::Point point{data_row, row.time_s, row.chainage_raw_m, row.cloud_fraction, row.georef_rmse_m};
    if (!builder.add(t, im, s, point)) {
      reject(RowProblem{0, "image_id", row.image_id,
                        "duplicate: transect " + row.transect_id + " already has an observation from this image (data row " +
                            std::to_string(builder.first_row_of(t, im) + 1) + ")"});
    }
    ++data_row;
  }
  result.data_rows = data_row;
  result.table = std::move(builder).build();
  return result;
}

ObservationFile read_observations_file(const std::string& path, const ObservationReadOptions& options) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, 0, "", "", "cannot open file");
  return read_observations(in, path, options);
}

}  // namespace strandline
