#include "server/io/observation_rules.h"

#include <algorithm>

#include "corrections/core/errors.h"
#include "corrections/core/time_utc.h"
#include "server/io/id_rules.h"

namespace strandline {

const InputColumns& observation_input_columns() {
  static const InputColumns columns{{{"transect_id", true},
                                     {"time", true},
                                     {"chainage_m", true},
                                     {"sensor", true},
                                     {"image_id", true},
                                     {"cloud_fraction", false},
                                     {"georef_rmse_m", false}},
                                    true};
  return columns;
}

ObservationColumns ObservationColumns::from_names(const std::vector<std::string>& names, const std::string& source) {
  for (const char* corrected : {"correction_m", "chainage_raw_m"})
    if (std::find(names.begin(), names.end(), corrected) != names.end())
      throw ColumnError(source, corrected,
                        "this looks like corrected output (it has a correction_m or chainage_raw_m column); "
                        "give the raw observations so nothing is corrected twice");
  const ResolvedColumns r = resolve_columns(names, observation_input_columns(), source);
  ObservationColumns c{};
  c.transect_id = *r.at[0];
  c.time = *r.at[1];
  c.chainage_m = *r.at[2];
  c.sensor = *r.at[3];
  c.image_id = *r.at[4];
  c.cloud_fraction = r.at[5];
  c.georef_rmse_m = r.at[6];
  c.extra = r.extra;
  return c;
}

ObservationColumns ObservationColumns::from_header(const CsvHeader& header, const std::string& source) {
  return from_names(header.names(), source);
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

std::string unknown_sensor_reason(const SensorTable& sensors) {
  std::string known;
  for (const auto& n : sensors.sensor_names()) known += (known.empty() ? "" : ", ") + n;
  return "sensor not in the sensor table (known: " + known + ")";
}

std::optional<RowProblem> validate_observation_row(const std::vector<std::string>& f, const ObservationColumns& c,
                                                   const SensorTable* sensors, ObservationRow& out) {
  out.transect_id = trimmed(f[c.transect_id]);
  if (auto why = id_problem(out.transect_id, "transect id", true))
    return problem("transect_id", printable_text(f[c.transect_id]), *why);
  out.image_id = trimmed(f[c.image_id]);
  if (auto why = id_problem(out.image_id, "image id")) return problem("image_id", printable_text(f[c.image_id]), *why);
  out.sensor = trimmed(f[c.sensor]);
  if (out.sensor.empty()) return problem("sensor", f[c.sensor], "empty sensor name");
  if (sensors && !sensors->lookup(out.sensor)) return problem("sensor", f[c.sensor], unknown_sensor_reason(*sensors));
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

std::string line_place(std::int64_t line) { return "line " + std::to_string(line); }

std::optional<RowProblem> ObservationFileRules::admit(std::uint32_t transect, std::uint32_t image, std::uint32_t sensor,
                                                      const ObservationRow& row, std::int64_t line) {
  if (image >= images_.size()) images_.resize(image + 1, ImageSeen{0, 0, 0});
  ImageSeen& seen = images_[image];
  if (seen.line == 0) {
    seen = {row.time_s, sensor, line};
  } else if (seen.time_s != row.time_s) {
    return problem("time", format_time_utc(row.time_s),
                   "image " + row.image_id + " has time " + format_time_utc(seen.time_s) + " on " + place_(seen.line) +
                       " (one image, one time and one sensor)");
  } else if (seen.sensor != sensor) {
    return problem("sensor", row.sensor,
                   "image " + row.image_id + " has another sensor on " + place_(seen.line) +
                       " (one image, one time and one sensor)");
  }
  const std::uint64_t key = (std::uint64_t{transect} << 32) | image;
  const auto [it, fresh] = rows_.emplace(key, line);
  if (!fresh)
    return problem("image_id", row.image_id,
                   "duplicate: transect " + row.transect_id + " already has an observation from this image (" +
                       place_(it->second) + ")");
  return std::nullopt;
}

std::optional<RowProblem> stored_image_problem(const ObservationRow& row, TimeS stored_time_s,
                                               const std::string& stored_sensor) {
  if (row.time_s != stored_time_s)
    return problem("time", format_time_utc(row.time_s),
                   "image " + row.image_id + " is stored for this site with time " + format_time_utc(stored_time_s) +
                       " (one image, one time and one sensor)");
  if (row.sensor != stored_sensor)
    return problem("sensor", row.sensor,
                   "image " + row.image_id + " is stored for this site with sensor " + stored_sensor +
                       " (one image, one time and one sensor)");
  return std::nullopt;
}

}  // namespace strandline
