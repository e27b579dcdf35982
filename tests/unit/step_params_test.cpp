// Step parameters are declared once per step (corrections/core/param_fields.h):
// the facility reads strictly and checks every kind of bound, the effective
// parameters keep the keys and values provenance has always recorded, and the
// tables of server/FORMATS.md are the ones the field lists generate.
#include <gtest/gtest.h>

#include <cmath>
#include <fstream>
#include <sstream>

#include "corrections/core/errors.h"
#include "corrections/core/param_fields.h"
#include "qc/hampel_step.h"
#include "server/app/steps/step_list.h"

using namespace strandline;

namespace {

constexpr std::string_view kModes[] = {"none", "setup", "runup"};

// One field of every member type and every bound kind.
struct Probe {
  double gap_s = 10800.0;        // > 0
  double sigma_m = 0.0;          // >= 0, default on the bound
  long long count = 5;           // [3, 9]
  double share = 0.25;           // (0, 1]
  double step = 1e-4;            // < 1
  double ratio = 2.0;            // <= 2, default on the bound
  long long images = 8;          // >= 8
  double level = 1.5;            // > 1.5: the default breaks its own bound (defaults are checked)
  bool seasonal = true;
  std::string mode = "setup";    // one of kModes
  std::string label = "site";    // any text
  long long lower_count = 2;     // rule between fields: at most `count`

  static const ParamList<Probe>& fields() {
    static const ParamList<Probe> list = {
        {.name = "gap_s", .member = member_of<&Probe::gap_s>, .unit = "s", .lower = greater_than(0),
         .meaning = "longest gap"},
        {.name = "sigma_m", .member = member_of<&Probe::sigma_m>, .unit = "m", .lower = at_least(0),
         .meaning = "1σ"},
        {.name = "count", .member = member_of<&Probe::count>, .lower = at_least(3), .upper = at_most(9),
         .meaning = "points"},
        {.name = "share", .member = member_of<&Probe::share>, .lower = greater_than(0), .upper = at_most(1),
         .meaning = "a share"},
        {.name = "step", .member = member_of<&Probe::step>, .upper = less_than(1), .meaning = "a step"},
        {.name = "ratio", .member = member_of<&Probe::ratio>, .upper = at_most(2), .meaning = "a ratio"},
        {.name = "images", .member = member_of<&Probe::images>, .lower = at_least(8), .meaning = "images | needed"},
        {.name = "level", .member = member_of<&Probe::level>, .lower = greater_than(1.5), .meaning = "a level"},
        {.name = "seasonal", .member = member_of<&Probe::seasonal>, .meaning = "remove seasons"},
        {.name = "mode", .member = member_of<&Probe::mode>, .meaning = "wave term", .choices = kModes},
        {.name = "label", .member = member_of<&Probe::label>, .meaning = "free text"},
        {.name = "lower_count", .member = member_of<&Probe::lower_count>, .lower = at_least(0),
         .meaning = "at most `count`"},
    };
    return list;
  }
  void validate(const std::string& pointer) const {
    if (lower_count > count) throw ConfigError(pointer + "/lower_count", "expected at most `count`");
  }
};

// The default `level` sits outside its own bound on purpose: defaults are checked too.
Probe read_probe(const nlohmann::json& object) {
  nlohmann::json with_level = object.is_null() ? nlohmann::json::object() : object;
  if (with_level.is_object() && !with_level.contains("level")) with_level["level"] = 2.0;
  return read_params(Probe::fields(), with_level, "/steps/probe");
}

// The ConfigError text of reading `object`, or "" when it is accepted.
std::string error_of(const nlohmann::json& object) {
  try {
    read_probe(object);
    return "";
  } catch (const ConfigError& e) {
    return e.what();
  }
}

double just_above(double v) { return std::nextafter(v, HUGE_VAL); }
double just_below(double v) { return std::nextafter(v, -HUGE_VAL); }

}  // namespace

TEST(ParamFields, EmptyObjectGivesTheDefaults) {
  const auto expected = nlohmann::json::parse(R"({"gap_s": 10800.0, "sigma_m": 0.0, "count": 5, "share": 0.25,
      "step": 0.0001, "ratio": 2.0, "images": 8, "level": 2.0, "seasonal": true, "mode": "setup", "label": "site",
      "lower_count": 2})");
  EXPECT_EQ(params_json(Probe::fields(), read_probe(nlohmann::json::object())).dump(), expected.dump());
  EXPECT_EQ(params_json(Probe::fields(), read_probe(nullptr)).dump(), expected.dump());
}

TEST(ParamFields, EveryFieldReadsIntoItsOwnMember) {
  const auto given = nlohmann::json::parse(R"({"gap_s": 60.0, "sigma_m": 0.5, "count": 9, "share": 1.0,
      "step": -3.0, "ratio": 1.0, "images": 40, "level": 7.0, "seasonal": false, "mode": "runup", "label": "x",
      "lower_count": 9})");
  EXPECT_EQ(params_json(Probe::fields(), read_probe(given)).dump(), given.dump());
}

TEST(ParamFields, UnknownKeyNamesItsPointer) {
  try {
    read_probe({{"gap_hours", 3}});
    FAIL() << "unknown key accepted";
  } catch (const ConfigError& e) {
    EXPECT_EQ(e.pointer, "/steps/probe/gap_hours");
    EXPECT_STREQ(e.what(), "/steps/probe/gap_hours: unknown key");
  }
}

TEST(ParamFields, WrongTypesAreRefused) {
  EXPECT_EQ(error_of({{"gap_s", "10"}}), "/steps/probe/gap_s: expected a number");
  EXPECT_EQ(error_of({{"count", 4.5}}), "/steps/probe/count: expected an integer");
  EXPECT_EQ(error_of({{"seasonal", 1}}), "/steps/probe/seasonal: expected true or false");
  EXPECT_EQ(error_of({{"mode", 3}}), "/steps/probe/mode: expected a string");
  EXPECT_EQ(error_of(nlohmann::json::array()), "/steps/probe: expected a JSON object");
}

TEST(ParamFields, ExclusiveLowerBound) {
  EXPECT_EQ(error_of({{"gap_s", just_above(0.0)}}), "");
  EXPECT_EQ(error_of({{"gap_s", 0.0}}), "/steps/probe/gap_s: expected a positive number (s)");
  EXPECT_EQ(error_of({{"level", just_above(1.5)}}), "");
  EXPECT_EQ(error_of({{"level", 1.5}}), "/steps/probe/level: expected a number > 1.5");
}

TEST(ParamFields, InclusiveLowerBound) {
  EXPECT_EQ(error_of({{"sigma_m", 0.0}}), "");
  EXPECT_EQ(error_of({{"sigma_m", just_below(0.0)}}), "/steps/probe/sigma_m: expected a non-negative number (m)");
  EXPECT_EQ(error_of({{"images", 8}}), "");
  EXPECT_EQ(error_of({{"images", 7}}), "/steps/probe/images: expected an integer >= 8");
}

TEST(ParamFields, ExclusiveUpperBound) {
  EXPECT_EQ(error_of({{"step", just_below(1.0)}}), "");
  EXPECT_EQ(error_of({{"step", 1.0}}), "/steps/probe/step: expected a number < 1");
}

TEST(ParamFields, InclusiveUpperBound) {
  EXPECT_EQ(error_of({{"ratio", 2.0}}), "");
  EXPECT_EQ(error_of({{"ratio", just_above(2.0)}}), "/steps/probe/ratio: expected a number <= 2");
}

TEST(ParamFields, IntervalBounds) {
  EXPECT_EQ(error_of({{"count", 3}}), "");
  EXPECT_EQ(error_of({{"count", 9}}), "");
  EXPECT_EQ(error_of({{"count", 2}}), "/steps/probe/count: expected an integer in [3, 9]");
  EXPECT_EQ(error_of({{"count", 10}}), "/steps/probe/count: expected an integer in [3, 9]");
  EXPECT_EQ(error_of({{"share", just_above(0.0)}}), "");
  EXPECT_EQ(error_of({{"share", 1.0}}), "");
  EXPECT_EQ(error_of({{"share", 0.0}}), "/steps/probe/share: expected a number in (0, 1]");
  EXPECT_EQ(error_of({{"share", just_above(1.0)}}), "/steps/probe/share: expected a number in (0, 1]");
}

TEST(ParamFields, TextChoices) {
  EXPECT_EQ(error_of({{"mode", "runup"}}), "");
  EXPECT_EQ(error_of({{"mode", "Runup"}}), R"(/steps/probe/mode: expected one of "none", "setup", "runup")");
  EXPECT_EQ(error_of({{"label", "anything at all"}}), "");
}

TEST(ParamFields, DefaultsAreCheckedToo) {
  EXPECT_THROW(read_params(Probe::fields(), nlohmann::json::object(), "/steps/probe"), ConfigError);
}

TEST(ParamFields, RuleBetweenFieldsRunsAfterTheRanges) {
  EXPECT_EQ(error_of({{"lower_count", 6}}), "/steps/probe/lower_count: expected at most `count`");
  EXPECT_EQ(error_of({{"lower_count", 6}, {"count", 6}}), "");
  // A range error is reported before the rule between fields.
  EXPECT_EQ(error_of({{"lower_count", 6}, {"count", 2}}), "/steps/probe/count: expected an integer in [3, 9]");
}

TEST(ParamFields, MarkdownTable) {
  const Probe defaults;
  const ParamList<Probe> some(Probe::fields().begin(), Probe::fields().begin() + 3);
  ParamList<Probe> text_and_more = {Probe::fields()[4], Probe::fields()[6], Probe::fields()[8], Probe::fields()[9]};
  EXPECT_EQ(params_markdown_table(some, defaults),
            "| parameter | type | default | unit | allowed | meaning |\n"
            "| --- | --- | --- | --- | --- | --- |\n"
            "| `gap_s` | number | 10800 | s | positive | longest gap |\n"
            "| `sigma_m` | number | 0 | m | non-negative | 1σ |\n"
            "| `count` | integer | 5 |  | [3, 9] | points |\n");
  EXPECT_EQ(params_markdown_table(text_and_more, defaults),
            "| parameter | type | default | unit | allowed | meaning |\n"
            "| --- | --- | --- | --- | --- | --- |\n"
            "| `step` | number | 1e-4 |  | < 1 | a step |\n"
            "| `images` | integer | 8 |  | >= 8 | images \\| needed |\n"
            "| `seasonal` | boolean | true |  | true or false | remove seasons |\n"
            "| `mode` | text | `setup` |  | one of none, setup, runup | wave term |\n");
  EXPECT_EQ(params_markdown_table(ParamList<Probe>{}, defaults), "No parameters.\n");
}

TEST(StepParams, MessagesNameTheJsonPointer) {
  try {
    HampelStep::make({{"k", 0}}, "/steps/hampel");
    FAIL() << "k = 0 accepted";
  } catch (const ConfigError& e) {
    EXPECT_STREQ(e.what(), "/steps/hampel/k: expected a positive number");
  }
  try {
    configured_pipeline({{"steps", {{"alongshore", {{"neighbours", 2}, {"min_neighbours", 5}}}}}});
    FAIL() << "min_neighbours above twice neighbours accepted";
  } catch (const ConfigError& e) {
    EXPECT_EQ(e.pointer, "/steps/alongshore/min_neighbours");
  }
  try {
    configured_pipeline({{"steps", {{"slope", {{"f_min_cpd", 0.2}, {"f_max_cpd", 0.1}}}}}});
    FAIL() << "f_max_cpd below f_min_cpd accepted";
  } catch (const ConfigError& e) {
    EXPECT_EQ(e.pointer, "/steps/slope/f_max_cpd");
  }
}

// The effective parameters of every step, as provenance has recorded them (keys,
// values and number types: 45.0 stays a float, 7 an integer).
TEST(StepParams, EffectiveDefaultsKeepTheirProvenanceShape) {
  const auto expected = nlohmann::json::parse(R"({
    "water_level": {"coarse_interval_s": 3600.0, "max_gap_s": 10800.0, "sigma_m": 0.1},
    "wave_conditions": {"max_gap_s": 10800.0},
    "slope": {"f_min_cpd": 0.0025, "f_max_cpd": 0.1, "n_frequencies": 4000, "band_half_width_cpd": 0.000864,
              "min_peak_to_median": 20.0, "min_images": 40, "min_excursion_m": 10.0, "bootstrap_count": 200,
              "seed": 20261202, "screen_k": 3.5, "screen_half_window": 5, "screen_passes": 2,
              "remove_seasonal": true, "curve_step": 0.0025},
    "wave_terms": {"runup_sigma_m": 0.38, "setup_sigma_m": 0.38},
    "correct": {},
    "image_quality": {"cloud_fraction_max": 0.75, "georef_rmse_max_m": 15.0},
    "sensor_offsets": {"bin_days": 30.0, "min_bins": 10, "reference_family": ""},
    "storm_response": {"hs_threshold_m": 0.0, "hs_quantile": 0.99, "hs_min_m": 2.5, "scan_step_s": 10800.0,
                       "max_gap_s": 21600.0, "merge_gap_days": 2.0, "pre_window_days": 45.0, "min_pre_points": 3,
                       "jump_min_m": 10.0, "jump_noise_k": 2.0, "persist_points": 3, "persist_days": 60.0,
                       "consistency_k": 3.0, "max_response_days": 365.0},
    "despike": {"k": 4.0, "min_jump_m": 20.0, "max_gap_days": 60.0},
    "hampel": {"half_window_days": 45.0, "min_points": 7, "k": 3.0, "min_threshold_m": 10.0},
    "implausible_rate": {"max_rate_m_per_day": 1.0, "k": 4.0, "max_consecutive": 2},
    "image_misregistration": {"min_transects": 5, "alpha": 0.0001, "min_shift_m": 20.0, "inlier_k": 3.0,
                              "use_geometry": true, "min_azimuth_spread_deg": 3.0, "level_half_window_days": 45.0,
                              "storm_share_max": 0.25},
    "alongshore": {"neighbours": 3, "min_neighbours": 3, "k": 4.0, "min_threshold_m": 20.0,
                   "level_half_window_days": 45.0},
    "sparse_period": {"half_window_days": 60.0, "min_points": 3},
    "uncertainty": {}
  })");
  ASSERT_EQ(step_list().size(), expected.size());
  for (const auto& entry : step_list()) {
    ASSERT_TRUE(expected.contains(entry.name)) << entry.name;
    EXPECT_EQ(entry.make(nullptr, "/steps/" + entry.name)->parameters().dump(), expected[entry.name].dump())
        << entry.name;
  }
}

namespace {

std::string formats_text() {
  std::ifstream in(std::string(STRANDLINE_SOURCE_DIR) + "/server/FORMATS.md");
  std::stringstream s;
  s << in.rdbuf();
  return s.str();
}

}  // namespace

TEST(StepParams, FormatsTablesAreGeneratedFromTheFieldLists) {
  const std::string text = formats_text();
  ASSERT_FALSE(text.empty());
  for (const auto& entry : step_list()) {
    const std::string begin = "<!-- params:" + entry.name + " -->\n", end = "<!-- /params:" + entry.name + " -->";
    const std::string expected = entry.parameter_docs();
    const auto b = text.find(begin);
    const auto e = b == std::string::npos ? std::string::npos : text.find(end, b);
    if (b == std::string::npos || e == std::string::npos) {
      ADD_FAILURE() << "server/FORMATS.md lacks the parameters of step " << entry.name << "; add:\n"
                    << begin << expected << end;
      continue;
    }
    const std::string found = text.substr(b + begin.size(), e - b - begin.size());
    EXPECT_EQ(found, expected) << "server/FORMATS.md: the parameters of step " << entry.name
                               << " differ from its field list; expected:\n"
                               << begin << expected << end;
  }
  // No table of a step that is gone.
  for (auto at = text.find("<!-- params:"); at != std::string::npos; at = text.find("<!-- params:", at + 1)) {
    const auto name_end = text.find(" -->", at);
    const std::string name = text.substr(at + 12, name_end - at - 12);
    bool listed = false;
    for (const auto& entry : step_list()) listed = listed || entry.name == name;
    EXPECT_TRUE(listed) << "server/FORMATS.md documents parameters of an unknown step: " << name;
  }
}
