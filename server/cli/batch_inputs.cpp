#include "server/cli/batch_inputs.h"

#include <cmath>
#include <cstdio>
#include <fstream>
#include <optional>

#include "corrections/core/errors.h"
#include "corrections/core/time_utc.h"
#include "corrections/tide/constituent_file.h"
#include "server/io/file_digest.h"
#include "server/io/slopes_json.h"
#include "server/io/transect_params_csv.h"
#include "server/io/water_level_csv.h"
#include "server/io/wave_csv.h"
#include "corrections/core/json_text.h"

namespace strandline::cli {

namespace {

nlohmann::json read_config_file(const std::string& path) {
  std::ifstream in(path);
  if (!in) throw InputError(path, 0, "", "", "cannot open file");
  return parse_json_stream(in, path);
}

void record_file(app::RunMaterial& material, const std::string& role, const std::string& path) {
  material.inputs.push_back({{"role", role}, {"path", path}, {"sha256", sha256_hex_of_file(path)}});
}

// A slope written as a percentage or a ratio is the commonest slip: name the
// tan(beta) it stands for instead of a bare "not a number".
void refuse_slope_notation(const std::string& name, const std::string& text) {
  std::optional<double> meant;
  try {
    if (!text.empty() && text.back() == '%') {
      meant = parse_number(text.substr(0, text.size() - 1)) / 100.0;
    } else if (auto colon = text.find(':'); colon != std::string::npos) {
      meant = parse_number(text.substr(0, colon)) / parse_number(text.substr(colon + 1));
    }
  } catch (const FieldError&) {
  }
  if (!text.empty() && (text.back() == '%' || text.find(':') != std::string::npos)) {
    std::string hint = "give tan(beta): ";
    if (meant && std::isfinite(*meant)) {
      char value[32];
      std::snprintf(value, sizeof value, "%.3g", *meant);
      hint += text + " is " + value;
    } else {
      hint += "8% is 0.08, 1:12 is 0.0833";
    }
    throw UsageError("option --" + name + " \"" + text + "\": " + hint);
  }
}

// A slope option's value, checked with the option's name in the message.
double slope_option(const Args& args, const std::string& name) {
  const std::string text = args.require(name);
  refuse_slope_notation(name, text);
  const double v = *args.number(name);
  if (auto why = slope_problem(v)) throw UsageError("option --" + name + " \"" + text + "\": " + *why);
  return v;
}

double sigma_option(const Args& args, const std::string& name) {
  const double v = *args.number(name);
  if (v < 0) throw UsageError("option --" + name + ": must not be negative");
  return v;
}

// --slope-range MIN:MAX, the search range of the spectral estimate.
nlohmann::json slope_range_option(const std::string& text) {
  const auto colon = text.find(':');
  if (colon == std::string::npos) throw UsageError("option --slope-range \"" + text + "\": expected MIN:MAX, e.g. 0.01:0.2");
  double low = 0, high = 0;
  try {
    low = parse_number(text.substr(0, colon));
    high = parse_number(text.substr(colon + 1));
  } catch (const FieldError& e) {
    throw UsageError("option --slope-range \"" + text + "\": " + e.what());
  }
  for (double v : {low, high})
    if (auto why = slope_problem(v)) throw UsageError("option --slope-range \"" + text + "\": " + *why);
  if (!(low < high)) throw UsageError("option --slope-range \"" + text + "\": MIN must be below MAX");
  return {low, high};
}

// Command-line options written into the run configuration: they override the
// same keys of a --config file.
void apply_options(const Args& args, const BatchOptions& options, nlohmann::json& config) {
  if (!config.is_object()) throw ConfigError("", "expected a JSON object");
  if (args.get("reference-elevation")) config["reference_elevation_m"] = *args.number("reference-elevation");
  nlohmann::json& slope = config["slope"];
  if (slope.is_null()) slope = nlohmann::json::object();
  const auto slope_text = args.get("slope");
  const bool slope_auto = options.estimate_slopes || (slope_text && *slope_text == "auto");
  if (slope_auto) slope["estimate"] = true;
  if (auto range = args.get("slope-range")) {
    if (!slope_auto) throw UsageError("option --slope-range goes with --slope auto");
    slope["search_range"] = slope_range_option(*range);
  }
  if (slope_text && !slope_auto) {
    slope["fixed"] = slope_option(args, "slope");
    if (args.get("slope-sigma")) slope["fixed_sigma"] = sigma_option(args, "slope-sigma");
  } else if (!options.estimate_slopes && args.get("slope-sigma")) {
    throw UsageError("option --slope-sigma needs --slope VALUE");
  }
  if (args.get("default-slope")) {
    slope["default"] = slope_option(args, "default-slope");
    if (args.get("default-slope-sigma")) slope["default_sigma"] = sigma_option(args, "default-slope-sigma");
  } else if (args.get("default-slope-sigma")) {
    throw UsageError("option --default-slope-sigma needs --default-slope VALUE");
  }
  if (slope.empty()) config.erase("slope");
  if (options.trend_window) {
    for (const char* name : {"trend-from", "trend-to"}) {
      const auto given = args.get(name);
      if (!given) continue;
      const std::string text = expand_date_only(*given);
      try {
        parse_time_utc(text);
      } catch (const FieldError& e) {
        throw UsageError(std::string("--") + name + " \"" + *given + "\": " + e.what());
      }
      config["trend_window"][name == std::string("trend-from") ? "from" : "to"] = text;
    }
  }
  if (auto mode = args.get("wave-correction")) {
    if (!args.get("waves")) throw UsageError("option --wave-correction needs --waves FILE");
    if (*mode != "none" && *mode != "setup" && *mode != "runup")
      throw UsageError("option --wave-correction \"" + *mode + "\": expected none, setup or runup");
    config["wave_correction"] = *mode;
  }
  // estimate | none name the mode; anything else is a sensor table whose offsets are applied.
  if (auto offsets = args.get("sensor-offsets")) {
    const bool mode = *offsets == "estimate" || *offsets == "none";
    if (!mode && !std::ifstream(*offsets))
      throw UsageError("option --sensor-offsets \"" + *offsets +
                       "\": expected estimate, none or a sensor table FILE (cannot open it)");
    config["sensor_offsets"] = mode ? *offsets : "given";
  }
}

// The offset_m (and offset_sigma_m) of each sensor of `path` onto the run's table;
// a sensor the run's table lacks is added with the file's class and sigma.
void read_sensor_offsets(const std::string& path, app::RunMaterial& material) {
  const SensorTable given = SensorTable::from_csv_file(path);
  if (!given.has_offsets()) throw InputError(path, 0, "offset_m", "", "no sensor has an offset_m");
  for (const auto& [sensor, c] : given.entries()) {
    if (!material.sensors.lookup(sensor)) material.sensors.add(sensor, c.name, c.sigma_m, c.family);
    if (!std::isnan(c.offset_m)) material.sensors.set_offset(sensor, c.offset_m, c.offset_sigma_m);
  }
  record_file(material, "sensor_offsets", path);
}

void read_water_level_inputs(const Args& args, app::RunMaterial& material) {
  if (auto path = args.get("water-levels")) {
    const GaugeSeries gauge = read_water_levels_file(*path, kUnknown);
    material.gauge_times_s = gauge.times();
    material.gauge_levels_m = gauge.levels();
    record_file(material, "water_levels", *path);
  }
  if (auto path = args.get("tide-constituents")) {  // alone, or where the gauge has no data
    material.tide = tide::read_constituent_file(*path);
    material.tide_label = *path;
    record_file(material, "tide_constituents", *path);
  }
  if (material.gauge_times_s.empty() && !material.tide)
    throw UsageError("no water levels: give --water-levels FILE and/or --tide-constituents FILE");
}

void read_slope_inputs(const Args& args, bool fixed_slope, app::RunMaterial& material) {
  if (auto path = args.get("slopes")) {
    if (fixed_slope)
      throw UsageError("give either --slope VALUE (one slope for every transect) or --slopes FILE, not both");
    material.listed_slopes = is_slopes_json_path(*path) ? read_slopes_json_file(*path)
                                                        : read_transect_params_file(*path, true).slopes;
    record_file(material, "slopes", *path);
  }
  if (auto path = args.get("transect-params")) {
    TransectParams tp = read_transect_params_file(*path, false);
    for (auto& [id, v] : tp.slopes) {
      if (material.listed_slopes.count(id))
        throw InputError(*path, 0, "transect_id", id, "slope given both here and in --slopes");
      material.listed_slopes[id] = v;
    }
    material.z_ref_by_transect = std::move(tp.z_ref_m);
    record_file(material, "transect_params", *path);
  }
}

}  // namespace

void add_batch_options(Args& args, const BatchOptions& options) {
  args.add_value("observations", "FILE", "raw observations CSV (transect_id,time,chainage_m,sensor,image_id[,...])")
      .add_value("water-levels", "FILE", "water-level record CSV (time,level_m) on the site datum")
      .add_value("tide-constituents", "FILE", "harmonic constants JSON: predicted tide, alone or where the gauge has none")
      .add_value("reference-elevation", "M", "reference contour z_ref in metres on the datum (default 0)");
  if (options.estimate_slopes) {
    // Only "auto" is accepted: a fixed slope is refused with a pointer to `correct`.
    args.add_value("slope", "auto", "estimate every slope (implied; a fixed VALUE belongs to `strandline correct`)");
  } else {
    args.add_value("slope", "VALUE|auto", "tan(beta) for every transect (e.g. 0.08, not 8% or 1:12), or estimate it (auto)")
        .add_value("slope-sigma", "VALUE", "1-sigma of a --slope VALUE");
  }
  args.add_value("slope-range", "MIN:MAX",
                 options.estimate_slopes ? "tan(beta) search range of the estimate (default 0.01:0.2)"
                                         : "tan(beta) search range of --slope auto (default 0.01:0.2)")
      .add_value("slopes", "FILE",
                 "per-transect slopes (CSV transect_id,slope[,slope_sigma], or the\n"
                 ".json of `strandline slope`); listed transects keep them when estimating")
      .add_value("transect-params", "FILE", "per-transect slope, slope_sigma, z_ref_m (CSV)")
      .add_value("default-slope", "VALUE", "slope for transects not listed (flagged default_slope)")
      .add_value("default-slope-sigma", "V", "1-sigma of the default slope")
      .add_value("sensor-table", "FILE", "sensor,class,sigma_m[,family] CSV replacing the built-in table")
      .add_value("sensor-offsets", "MODE|FILE",
                 "offsets between sensor families: estimate (default: report, correct the\n"
                 "significant ones), none (report only) or a sensor table with offset_m to apply")
      .add_value("waves", "FILE",
                 "wave record CSV (time,hs_m,tp_s[,dir_deg][,depth_m]); Hs deshoaled to deep\n"
                 "water when depth_m is given")
      .add_value("wave-correction", "MODE", "none | setup | runup (Stockdon et al. 2006; default setup with --waves)")
      .add_value("config", "FILE",
                 "run configuration JSON (processing choices, steps and parameters;\n"
                 "the options above override its keys)");
  if (options.trend_window)
    args.add_value("trend-from", "TIME", "start of the summary's trend and seasonal fit (UTC time, or a date:\n"
                                         "2010-01-01 is midnight UTC)")
        .add_value("trend-to", "TIME", "end of that window (UTC time or date)");
  args.add_switch("skip-invalid", "skip bad observation rows (default: stop at the first)");
}

BatchInputs load_batch_inputs(const Args& args, const BatchOptions& options) {
  BatchInputs b;
  app::RunMaterial material;
  // Configuration first: a bad configuration fails before any large file is read.
  nlohmann::json config = nlohmann::json::object();
  if (auto path = args.get("config")) {
    config = read_config_file(*path);
    record_file(material, "config", *path);
  }
  apply_options(args, options, config);
  app::RunConfig run_config = app::read_run_config(config, app::RunDefaults{});

  if (auto table = args.get("sensor-table")) {
    material.sensors = SensorTable::from_csv_file(*table);
    record_file(material, "sensor_table", *table);
  }
  if (auto offsets = args.get("sensor-offsets"); offsets && *offsets != "estimate" && *offsets != "none")
    read_sensor_offsets(*offsets, material);
  read_slope_inputs(args, run_config.settings.fixed_slope.has_value(), material);
  read_water_level_inputs(args, material);
  if (auto path = args.get("waves")) {
    material.waves = read_wave_csv_file(*path).samples();
    record_file(material, "waves", *path);
  }

  // Observations last (the largest file), after every cheap check.
  b.observations_path = args.require("observations");
  ObservationReadOptions read_options;
  read_options.skip_invalid = options.skip_invalid;
  read_options.sensors = &material.sensors;
  read_options.unknown_sensor_hint = "add it with --sensor-table FILE";
  b.observations = read_observations_file(b.observations_path, read_options);
  record_file(material, "observations", b.observations_path);
  b.run = std::make_unique<app::PreparedRun>(std::move(run_config), std::move(material));
  return b;
}

void check_slope_coverage(const BatchInputs& b) {
  const auto missing = b.run->transects_without_slope(b.observations.table, 11);
  if (missing.empty()) return;
  std::string list;
  for (std::size_t i = 0; i < missing.size() && i < 10; ++i) list += (i ? ", " : "") + missing[i];
  if (missing.size() > 10) list += ", ...";
  throw UsageError("no slope for transect(s) " + list + ": list them in --slopes/--transect-params, "
                   "or give --slope VALUE or --default-slope VALUE");
}

}  // namespace strandline::cli
