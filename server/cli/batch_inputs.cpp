#include "server/cli/batch_inputs.h"

#include <fstream>

#include "corrections/core/errors.h"
#include "corrections/steps/slope_step.h"
#include "corrections/steps/water_level_step.h"
#include "corrections/tide/constituent_file.h"
#include "corrections/tide/harmonic_tide_source.h"
#include "corrections/water_level/blended_water_level_source.h"
#include "server/io/file_digest.h"
#include "server/io/slopes_json.h"
#include "server/io/transect_params_csv.h"
#include "server/io/water_level_csv.h"

namespace strandline::cli {

void BatchInputs::record_file(const std::string& role, const std::string& path) {
  input_files.push_back({{"role", role}, {"path", path}, {"sha256", sha256_hex_of_file(path)}});
}

namespace {

nlohmann::json read_config_file(const std::string& path) {
  std::ifstream in(path);
  if (!in) throw InputError(path, 0, "", "", "cannot open file");
  try {
    return nlohmann::json::parse(in);
  } catch (const nlohmann::json::parse_error& e) {
    throw InputError(path, 0, "", "", std::string("not valid JSON: ") + e.what());
  }
}

SlopeValue slope_option(Args& args, const std::string& name, const std::string& sigma_name) {
  const std::string text = args.require(name);
  SlopeValue v;
  v.slope = *args.number(name);
  if (auto why = slope_problem(v.slope)) throw UsageError("option --" + name + " \"" + text + "\": " + *why);
  if (auto sigma = args.number(sigma_name)) {
    if (*sigma < 0) throw UsageError("option --" + sigma_name + ": must not be negative");
    v.slope_sigma = *sigma;
  }
  return v;
}

// --slope-range MIN:MAX, the search range of the spectral estimate.
void read_slope_range(Args& args, SlopePlan& plan, nlohmann::json& parameters) {
  const auto text = args.get("slope-range");
  if (!text) return;
  if (!plan.estimate) throw UsageError("option --slope-range goes with --slope auto");
  const auto colon = text->find(':');
  if (colon == std::string::npos) throw UsageError("option --slope-range \"" + *text + "\": expected MIN:MAX, e.g. 0.01:0.2");
  try {
    plan.search_min = parse_number(text->substr(0, colon));
    plan.search_max = parse_number(text->substr(colon + 1));
  } catch (const FieldError& e) {
    throw UsageError("option --slope-range \"" + *text + "\": " + e.what());
  }
  for (double v : {plan.search_min, plan.search_max})
    if (auto why = slope_problem(v)) throw UsageError("option --slope-range \"" + *text + "\": " + *why);
  if (!(plan.search_min < plan.search_max))
    throw UsageError("option --slope-range \"" + *text + "\": MIN must be below MAX");
  parameters["slope_range"] = {plan.search_min, plan.search_max};
}

}  // namespace

std::string batch_options_help() {
  return "  --observations FILE        raw observations CSV (transect_id,time,chainage_m,sensor,image_id[,...])\n"
         "  --water-levels FILE        water-level record CSV (time,level_m) on the site datum\n"
         "  --tide-constituents FILE   harmonic constants JSON: predicted tide, alone or where the gauge has none\n"
         "  --reference-elevation M    reference contour z_ref in metres on the datum (default 0)\n"
         "  --slope VALUE|auto         tan(beta) for every transect, or estimate it (auto)\n"
         "  --slope-sigma VALUE        1-sigma of a --slope VALUE\n"
         "  --slope-range MIN:MAX      tan(beta) search range of --slope auto (default 0.01:0.2)\n"
         "  --slopes FILE              per-transect slopes (CSV transect_id,slope[,slope_sigma], or the\n"
         "                             .json of `strandline slope`); with auto, listed transects keep them\n"
         "  --transect-params FILE     per-transect slope, slope_sigma, z_ref_m (CSV)\n"
         "  --default-slope VALUE      slope for transects not listed (flagged default_slope)\n"
         "  --default-slope-sigma V    1-sigma of the default slope\n"
         "  --sensor-table FILE        sensor,class,sigma_m CSV replacing the built-in table\n"
         "  --config FILE              pipeline configuration JSON (steps and parameters)\n";
}

BatchInputs load_batch_inputs(Args& args, const BatchOptions& options) {
  BatchInputs b;
  // Configuration first: a bad config should fail before any large file is read.
  if (auto config = args.get("config")) {
    b.pipeline = Pipeline::from_config(read_config_file(*config));
    b.record_file("config", *config);
  }
  if (auto table = args.get("sensor-table")) {
    b.sensors = SensorTable::from_csv_file(*table);
    b.record_file("sensor_table", *table);
  } else {
    b.sensors = SensorTable::defaults();
  }
  b.inputs.sensors = &b.sensors;
  b.inputs.reference_elevation_m = args.number_or("reference-elevation", 0.0);
  if (std::abs(b.inputs.reference_elevation_m) > 50)
    throw UsageError("option --reference-elevation: implausible reference elevation (metres expected)");
  b.parameters["reference_elevation_m"] = b.inputs.reference_elevation_m;

  // ---- slopes
  SlopePlan& plan = b.inputs.slopes;
  const auto slope_text = args.get("slope");
  const bool slope_auto = slope_text && *slope_text == "auto";
  if (slope_auto) plan.estimate = true;
  read_slope_range(args, plan, b.parameters);
  if (slope_text && !slope_auto) {
    plan.all = slope_option(args, "slope", "slope-sigma");
    b.parameters["slope"] = plan.all->slope;
  } else if (args.get("slope-sigma")) {
    throw UsageError("option --slope-sigma needs --slope VALUE");
  }
  if (auto path = args.get("slopes")) {
    if (plan.all) throw UsageError("give either --slope VALUE (one slope for every transect) or --slopes FILE, not both");
    plan.per_transect = is_slopes_json_path(*path) ? read_slopes_json_file(*path)
                                                   : read_transect_params_file(*path, true).slopes;
    b.record_file("slopes", *path);
  }
  if (auto path = args.get("transect-params")) {
    TransectParams tp = read_transect_params_file(*path, false);
    for (auto& [id, v] : tp.slopes) {
      if (plan.per_transect.count(id))
        throw InputError(*path, 0, "transect_id", id, "slope given both here and in --slopes");
      plan.per_transect[id] = v;
    }
    b.inputs.z_ref_by_transect = std::move(tp.z_ref_m);
    b.record_file("transect_params", *path);
  }
  if (args.get("default-slope")) {
    plan.default_value = slope_option(args, "default-slope", "default-slope-sigma");
    b.parameters["default_slope"] = plan.default_value->slope;
  } else if (args.get("default-slope-sigma")) {
    throw UsageError("option --default-slope-sigma needs --default-slope VALUE");
  }

  // ---- water levels
  const auto* wl_step = dynamic_cast<const WaterLevelStep*>(b.pipeline.find("water_level"));
  const double gauge_sigma = wl_step ? wl_step->params().sigma_m : WaterLevelStep::Params{}.sigma_m;
  const GaugeSeries* gauge = nullptr;
  if (auto path = args.get("water-levels")) {
    b.water_level_sources.push_back(std::make_unique<GaugeSeries>(read_water_levels_file(*path, gauge_sigma)));
    gauge = static_cast<const GaugeSeries*>(b.water_level_sources.back().get());
    b.inputs.water_levels = gauge;
    b.record_file("water_levels", *path);
  }
  if (auto path = args.get("tide-constituents")) {  // alone, or where the gauge has no data
    b.water_level_sources.push_back(std::make_unique<tide::HarmonicTideSource>(tide::read_constituent_file(*path), *path));
    if (gauge) b.water_level_sources.push_back(std::make_unique<BlendedWaterLevelSource>(*gauge, *b.water_level_sources.back()));
    b.inputs.water_levels = b.water_level_sources.back().get();
    b.record_file("tide_constituents", *path);
  }
  if (!b.inputs.water_levels)
    throw UsageError("no water levels: give --water-levels FILE and/or --tide-constituents FILE");

  // ---- observations (largest file last, after every cheap check)
  b.observations_path = args.require("observations");
  ObservationReadOptions read_options;
  read_options.skip_invalid = options.skip_invalid;
  read_options.sensors = &b.sensors;
  b.observations = read_observations_file(b.observations_path, read_options);
  b.record_file("observations", b.observations_path);
  return b;
}

void check_slope_coverage(const BatchInputs& b) {
  const SlopePlan& plan = b.inputs.slopes;
  if (plan.all || plan.default_value || plan.estimate) return;
  std::vector<std::string> missing;
  for (const auto& t : b.observations.table.transects)
    if (!planned_slope(plan, t.id)) missing.push_back(t.id);
  if (missing.empty()) return;
  std::string list;
  for (std::size_t i = 0; i < missing.size() && i < 10; ++i) list += (i ? ", " : "") + missing[i];
  if (missing.size() > 10) list += ", ... (" + std::to_string(missing.size()) + " in all)";
  throw UsageError("no slope for transect(s) " + list + ": list them in --slopes/--transect-params, "
                   "or give --slope VALUE or --default-slope VALUE");
}

}  // namespace strandline::cli
