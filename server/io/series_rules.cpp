#include "server/io/series_rules.h"

#include <algorithm>
#include <cmath>
#include <sstream>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"
#include "corrections/core/time_utc.h"

namespace strandline {

namespace {

RowProblem problem(std::string_view field, std::string_view value, std::string reason) {
  return RowProblem{0, std::string(field), std::string(value), std::move(reason)};
}

std::string number_text(double v) {
  std::ostringstream out;
  out.precision(15);
  out << v;
  return out.str();
}

// Parses a number into `out`; an empty cell gives kUnknown unless `required`.
std::optional<RowProblem> number(std::string_view field, std::string_view text, bool required, double& out) {
  try {
    if (required) {
      out = parse_number(text);
    } else {
      auto v = parse_optional_number(text);
      out = v ? *v : kUnknown;
    }
  } catch (const FieldError& e) {
    return problem(field, text, e.what());
  }
  return std::nullopt;
}

std::optional<RowProblem> time_field(std::string_view text, TimeS& out) {
  try {
    out = parse_time_utc(text);
  } catch (const FieldError& e) {
    return problem("time", text, e.what());
  }
  return std::nullopt;
}

}  // namespace

// ---- water levels ----

const InputColumns& water_level_input_columns() {
  static const InputColumns columns{{{"time", true}, {"level_m", true}}, false};
  return columns;
}

std::optional<RowProblem> water_level_row(std::string_view time_text, std::string_view level_text,
                                          WaterLevelSample& out) {
  if (auto p = time_field(time_text, out.time_s)) return p;
  return number("level_m", level_text, true, out.level_m);
}

std::optional<RowProblem> WaterLevelFileRules::admit(const WaterLevelSample& sample, std::string_view time_text,
                                                     std::int64_t line) {
  if (!samples_.empty() && !(sample.time_s > samples_.back().time_s))
    return problem("time", time_text,
                   sample.time_s == samples_.back().time_s
                       ? "repeats the time of " + place_(lines_.back())
                       : "earlier than " + place_(lines_.back()) + " (times must increase)");
  samples_.push_back(sample);
  lines_.push_back(line);
  return std::nullopt;
}

std::vector<RowProblem> WaterLevelFileRules::finish() const {
  if (samples_.size() < 2) return {problem("", "", "need at least two water-level samples")};
  std::vector<double> levels(samples_.size());
  for (std::size_t i = 0; i < samples_.size(); ++i) levels[i] = samples_[i].level_m;
  std::vector<double> sorted = levels;
  const std::size_t mid = sorted.size() / 2;
  std::nth_element(sorted.begin(), sorted.begin() + mid, sorted.end());
  double median = sorted[mid];
  if (sorted.size() % 2 == 0) median = 0.5 * (median + *std::max_element(sorted.begin(), sorted.begin() + mid));
  const std::string units_hint = ": give levels in metres (centimetres or millimetres?)";
  std::vector<RowProblem> out;
  for (std::size_t i = 0; i < levels.size(); ++i) {
    if (std::abs(levels[i] - median) <= kMaxWaterLevelSpread_m) continue;
    RowProblem p = problem("level_m", number_text(levels[i]),
                           number_text(std::abs(levels[i] - median)) + " m from the record's median level (" +
                               number_text(median) + " m), more than the " + number_text(kMaxWaterLevelSpread_m) +
                               " m a gauge record in metres spans" + units_hint);
    p.line = lines_[i];
    out.push_back(std::move(p));
  }
  const auto [low, high] = std::minmax_element(levels.begin(), levels.end());
  if (out.empty() && *high - *low > kMaxWaterLevelSpread_m)
    out.push_back(problem("", "", "the levels span " + number_text(*high - *low) + " m, more than the " +
                                      number_text(kMaxWaterLevelSpread_m) + " m a gauge record in metres spans" +
                                      units_hint));
  return out;
}

// ---- waves ----

const InputColumns& wave_input_columns() {
  static const InputColumns columns{
      {{"time", true}, {"hs_m", true}, {"tp_s", true}, {"dir_deg", false}, {"depth_m", false}}, false};
  return columns;
}

std::optional<RowProblem> wave_row(const WaveSampleText& t, WaveFields& out) {
  if (auto p = time_field(t.time, out.time_s)) return p;
  if (auto p = number("hs_m", t.hs_m, true, out.hs_m)) return p;
  if (out.hs_m < 0) return problem("hs_m", t.hs_m, "outside [0, 30] m");
  if (out.hs_m > 30)
    return problem("hs_m", t.hs_m, "outside [0, 30] m: give the significant wave height in metres (centimetres?)");
  if (auto p = number("tp_s", t.tp_s, true, out.tp_s)) return p;
  if (out.tp_s < 1) return problem("tp_s", t.tp_s, "outside [1, 40] s");
  if (out.tp_s > 40)
    return problem("tp_s", t.tp_s, "outside [1, 40] s: give the peak period in seconds (tenths of a second?)");
  if (auto p = number("dir_deg", t.dir_deg, false, out.dir_deg)) return p;
  if (known(out.dir_deg) && (out.dir_deg < 0 || out.dir_deg > 360))
    return problem("dir_deg", t.dir_deg, "outside [0, 360] degrees");
  if (auto p = number("depth_m", t.depth_m, false, out.depth_m)) return p;
  if (known(out.depth_m) && !(out.depth_m > 0))
    return problem("depth_m", t.depth_m, "must be positive (the depth of the record; empty for deep water)");
  if (known(out.depth_m) && out.depth_m > 11000) return problem("depth_m", t.depth_m, "outside (0, 11000] m");
  return std::nullopt;
}

std::optional<RowProblem> WaveFileRules::admit(const WaveFields& row, const WaveSampleText& text, std::int64_t line) {
  if (rows_ > 0 && !(row.time_s > last_time_s_))
    return problem("time", text.time,
                   "not after the previous row (" + place_(last_line_) + "): times must be strictly increasing");
  const bool has_depth = known(row.depth_m);
  if (rows_ == 0) {
    first_has_depth_ = has_depth;
    first_line_ = line;
  } else if (has_depth != first_has_depth_) {
    return problem("depth_m", text.depth_m,
                   std::string(first_has_depth_ ? "empty, but " : "given, but no depth on ") + place_(first_line_) +
                       (first_has_depth_ ? " has a depth" : "") +
                       ": one wave record has a depth on every row (nearshore) or on none (deep water)");
  }
  ++rows_;
  last_time_s_ = row.time_s;
  last_line_ = line;
  return std::nullopt;
}

std::optional<RowProblem> WaveFileRules::finish() const {
  if (rows_ == 0) return problem("", "", "no wave rows after the header");
  return std::nullopt;
}

// ---- slopes ----

const InputColumns& slope_input_columns(bool with_z_ref) {
  static const InputColumns slopes{{{"transect_id", true}, {"slope", true}, {"slope_sigma", false}}, false};
  static const InputColumns params{
      {{"transect_id", true}, {"slope", false}, {"slope_sigma", false}, {"z_ref_m", false}}, false};
  return with_z_ref ? params : slopes;
}

std::optional<std::string> slope_problem(double slope) {
  if (!(slope > 0)) return "slope must be positive (tan(beta), e.g. 0.08)";
  if (slope > 1) return "slope above 1 (tan(beta) > 45 degrees): give tan(beta), not degrees or percent";
  return std::nullopt;
}

std::optional<RowProblem> slope_row(std::string_view transect_id, std::string_view slope_text,
                                    std::string_view sigma_text, bool slope_required, SlopeFields& out) {
  out.transect_id = std::string(transect_id);
  if (out.transect_id.empty()) return problem("transect_id", transect_id, "empty transect id");
  if (auto p = number("slope", slope_text, false, out.slope)) return p;
  if (!known(out.slope)) {
    if (slope_required) return problem("slope", slope_text, "empty slope");
    out.slope_sigma = kUnknown;
    return std::nullopt;
  }
  if (auto why = slope_problem(out.slope)) return problem("slope", slope_text, *why);
  if (auto p = number("slope_sigma", sigma_text, false, out.slope_sigma)) return p;
  if (known(out.slope_sigma) && out.slope_sigma < 0) return problem("slope_sigma", sigma_text, "must not be negative");
  return std::nullopt;
}

std::optional<RowProblem> SlopeFileRules::admit(const std::string& transect_id, std::int64_t line) {
  const auto [it, fresh] = seen_.emplace(transect_id, line);
  if (!fresh) return problem("transect_id", transect_id, "listed twice (first on " + place_(it->second) + ")");
  return std::nullopt;
}

}  // namespace strandline
