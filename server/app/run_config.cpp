#include "server/app/run_config.h"

#include <cmath>

#include "corrections/core/errors.h"
#include "corrections/core/param_reader.h"
#include "corrections/core/time_utc.h"
#include "corrections/steps/wave_terms_step.h"
#include "server/app/steps/step_list.h"
#include "server/io/json_numbers.h"
#include "server/io/transect_params_csv.h"

namespace strandline::app {

namespace {

constexpr double kMaxReferenceElevation_m = 50.0;


// Reads `key` and `key`_sigma (both may be null); `fallback` when absent.
SlopeValue read_slope_value(ParamReader& r, const std::string& key, const SlopeValue& fallback) {
  SlopeValue v = fallback;
  if (const auto* value = r.raw(key); value && !value->is_null()) {
    if (!value->is_number()) r.fail(key, "expected a number (tan(beta)) or null");
    v = {value->get<double>(), kUnknown};
    if (auto why = slope_problem(v.slope)) r.fail(key, *why);
  }
  const std::string sigma_key = key + "_sigma";
  if (const auto* sigma = r.raw(sigma_key); sigma && !sigma->is_null()) {
    if (!sigma->is_number() || !(sigma->get<double>() >= 0)) r.fail(sigma_key, "expected a non-negative number");
    if (!known(v.slope)) r.fail(sigma_key, "needs \"" + key + "\"");
    v.slope_sigma = sigma->get<double>();
  }
  return v;
}

void read_slope(const nlohmann::json* object, RunSettings& s, const RunDefaults& defaults) {
  s.estimate_slopes = defaults.estimate_slopes;
  SlopeValue fallback = defaults.default_slope.value_or(SlopeValue{});
  if (!object) {
    if (known(fallback.slope)) s.default_slope = fallback;
    return;
  }
  if (!object->is_object()) throw ConfigError("/slope", "expected a JSON object");
  ParamReader r(*object, "/slope");
  r.boolean("estimate", s.estimate_slopes);
  if (const auto* range = r.raw("search_range")) {
    if (!range->is_array() || range->size() != 2 || !(*range)[0].is_number() || !(*range)[1].is_number())
      r.fail("search_range", "expected [min, max] (tan(beta))");
    s.search_min = (*range)[0].get<double>();
    s.search_max = (*range)[1].get<double>();
    for (double v : {s.search_min, s.search_max})
      if (auto why = slope_problem(v)) r.fail("search_range", *why);
    if (!(s.search_min < s.search_max)) r.fail("search_range", "min must be below max");
  }
  if (const SlopeValue fixed = read_slope_value(r, "fixed", {}); known(fixed.slope)) s.fixed_slope = fixed;
  if (s.fixed_slope && s.estimate_slopes && object->contains("estimate"))
    r.fail("fixed", "one slope for every transect and estimation exclude each other");
  if (s.fixed_slope) s.estimate_slopes = false;
  if (const SlopeValue value = read_slope_value(r, "default", fallback); known(value.slope)) s.default_slope = value;
  r.finish();
}

void read_trend_window(const nlohmann::json* object, SummaryOptions& summary) {
  if (!object) return;
  if (!object->is_object()) throw ConfigError("/trend_window", "expected a JSON object");
  ParamReader r(*object, "/trend_window");
  for (auto [key, field] : {std::pair{"from", &summary.trend_from_s}, {"to", &summary.trend_to_s}}) {
    const auto* value = r.raw(key);
    if (!value || value->is_null()) continue;
    if (!value->is_string()) r.fail(key, "expected a time (RFC 3339 with a zone) or null");
    try {
      *field = parse_time_utc(value->get<std::string>());
    } catch (const FieldError& e) {
      r.fail(key, e.what());
    }
  }
  r.finish();
  if (known(summary.trend_from_s) && known(summary.trend_to_s) && !(summary.trend_from_s < summary.trend_to_s))
    throw ConfigError("/trend_window", "\"from\" must be before \"to\"");
}

nlohmann::json settings_json(const RunSettings& s) {
  const auto time_or_null = [](TimeS t) { return known(t) ? nlohmann::json(format_time_utc(t)) : nlohmann::json(); };
  return {{"reference_elevation_m", s.reference_elevation_m},
          {"wave_correction", std::string(wave_correction_name(s.wave_correction))},
          {"slope",
           {{"fixed", s.fixed_slope ? number_or_null(s.fixed_slope->slope) : nlohmann::json()},
            {"fixed_sigma", s.fixed_slope ? number_or_null(s.fixed_slope->slope_sigma) : nlohmann::json()},
            {"estimate", s.estimate_slopes},
            {"search_range", {s.search_min, s.search_max}},
            {"default", s.default_slope ? number_or_null(s.default_slope->slope) : nlohmann::json()},
            {"default_sigma", s.default_slope ? number_or_null(s.default_slope->slope_sigma) : nlohmann::json()}}},
          {"trend_window", {{"from", time_or_null(s.summary.trend_from_s)}, {"to", time_or_null(s.summary.trend_to_s)}}},
          {"sensor_offsets", std::string(sensor_offset_mode_name(s.sensor_offsets))}};
}

}  // namespace

RunConfig read_run_config(const nlohmann::json& config, const RunDefaults& defaults) {
  if (!config.is_null() && !config.is_object()) throw ConfigError("", "expected a JSON object");
  nlohmann::json pipeline_part = config.is_null() ? nlohmann::json::object() : config;
  RunSettings s;
  s.reference_elevation_m = defaults.reference_elevation_m;
  ParamReader top(config, "");
  top.number("reference_elevation_m", s.reference_elevation_m);
  if (std::abs(s.reference_elevation_m) > kMaxReferenceElevation_m)
    top.fail("reference_elevation_m", "implausible reference elevation (metres on the site datum expected)");
  std::string wave_correction = std::string(wave_correction_name(s.wave_correction));
  top.text("wave_correction", wave_correction);
  if (auto parsed = wave_correction_from_name(wave_correction))
    s.wave_correction = *parsed;
  else
    top.fail("wave_correction", "expected \"none\", \"setup\" or \"runup\"");
  std::string offsets = std::string(sensor_offset_mode_name(s.sensor_offsets));
  top.text("sensor_offsets", offsets);
  if (auto parsed = sensor_offset_mode_from_name(offsets))
    s.sensor_offsets = *parsed;
  else
    top.fail("sensor_offsets", "expected \"estimate\", \"none\" or \"given\"");
  read_slope(top.raw("slope"), s, defaults);
  read_trend_window(top.raw("trend_window"), s.summary);
  for (const char* key : {"reference_elevation_m", "wave_correction", "slope", "trend_window", "sensor_offsets"}) pipeline_part.erase(key);

  RunConfig out{configured_pipeline(pipeline_part), s, nullptr};
  out.effective = out.pipeline.config();
  const nlohmann::json settings = settings_json(s);
  for (const auto& [key, value] : settings.items()) out.effective[key] = value;
  return out;
}

}  // namespace strandline::app
