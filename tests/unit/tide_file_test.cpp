// The constituent file: round trip through JSON and clear errors naming the
// file and the JSON pointer of the bad entry.
#include <gtest/gtest.h>

#include <cmath>
#include <sstream>

#include "corrections/core/errors.h"
#include "corrections/tide/constituent_file.h"
#include "corrections/tide/tide_predictor.h"

namespace strandline::tide {
namespace {

ConstituentSet parse(const std::string& text) {
  std::istringstream in(text);
  return read_constituent_file(in, "site_tide.json");
}

std::string error_of(const std::string& text) {
  try {
    parse(text);
  } catch (const InputError& e) {
    return e.what();
  }
  return "(no error)";
}

TEST(TideFile, ReadsTheDocumentedExample) {
  const ConstituentSet s = parse(R"({"datum": "MSL", "z0_m": 0.1, "z0_rate_m_per_yr": 0.003,
      "z0_epoch": "2000-01-01T00:00:00Z",
      "constituents": [{"name": "M2", "amplitude_m": 0.62, "phase_deg": 40.0},
                       {"name": "k1", "amplitude_m": 0.2, "phase_deg": 350.0}]})");
  EXPECT_EQ(s.datum, "MSL");
  EXPECT_DOUBLE_EQ(s.z0_m, 0.1);
  EXPECT_DOUBLE_EQ(s.z0_rate_m_per_yr, 0.003);
  EXPECT_DOUBLE_EQ(s.z0_epoch_s, kDefaultZ0Epoch);
  ASSERT_EQ(s.constituents.size(), 2u);
  EXPECT_EQ(s.constituents[1].name, "K1");  // canonical spelling
  EXPECT_FALSE(known(s.residual_std_m));
}

TEST(TideFile, RoundTripKeepsFitFields) {
  ConstituentSet s;
  s.z0_m = -0.02;
  s.residual_std_m = 0.071;
  s.record = {{"samples", 100}};
  s.constituents.push_back({"M2", 0.5, 12.5, 0.001, 0.2, true});
  s.constituents.push_back({"S2", 0.2, 40.0, kUnknown, kUnknown, std::nullopt});
  const ConstituentSet r = parse_constituent_json(nlohmann::json::parse(constituent_json(s).dump()), "x.json");
  EXPECT_DOUBLE_EQ(r.residual_std_m, 0.071);
  EXPECT_EQ(r.record["samples"], 100);
  EXPECT_DOUBLE_EQ(r.constituents[0].amplitude_se_m, 0.001);
  EXPECT_EQ(r.constituents[0].resolvable, std::optional<bool>(true));
  EXPECT_FALSE(r.constituents[1].resolvable.has_value());
  EXPECT_FALSE(known(r.constituents[1].phase_se_deg));
  EXPECT_DOUBLE_EQ(TidePredictor(r).level_m(1.6e9), TidePredictor(s).level_m(1.6e9));
}

TEST(TideFile, ErrorsNameFileAndEntry) {
  EXPECT_EQ(error_of(R"({"constituents": [{"name": "M2", "amplitude_m": 1, "phase_deg": 0},
                                           {"name": "X9", "amplitude_m": 1, "phase_deg": 0}]})")
                .rfind("site_tide.json: /constituents/1/name \"X9\": unknown constituent", 0),
            0u);
  EXPECT_EQ(error_of(R"({"constituents": [{"name": "M2", "phase_deg": 0}]})"),
            "site_tide.json: /constituents/0/amplitude_m \"\": missing required field");
  EXPECT_EQ(error_of(R"({"constituents": [{"name": "M2", "amplitude_m": "big", "phase_deg": 0}]})"),
            "site_tide.json: /constituents/0/amplitude_m \"\"big\"\": expected a number");
  EXPECT_NE(error_of(R"({"constituents": [{"name": "M2", "amplitude_m": 1e999, "phase_deg": 0}]})")
                .find("site_tide.json: line 1, column 49: not valid JSON: number overflow"),
            std::string::npos);
  // Documents built in code (e.g. from an HTTP body) may carry non-finite numbers.
  nlohmann::json doc = {{"constituents", {{{"name", "M2"}, {"amplitude_m", 1.0}, {"phase_deg", NAN}}}}};
  try {
    parse_constituent_json(doc, "body");
    ADD_FAILURE() << "expected an error";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("body: /constituents/0/phase_deg"), std::string::npos) << e.what();
  }
  EXPECT_NE(error_of(R"({"constituents": [{"name": "M2", "amplitude_m": -1, "phase_deg": 0}]})").find("negative"),
            std::string::npos);
  EXPECT_NE(error_of(R"({"constituents": [{"name": "M2", "amplitude_m": 1, "phase_deg": 0},
                                           {"name": "m2", "amplitude_m": 1, "phase_deg": 0}]})")
                .find("listed twice"),
            std::string::npos);
  EXPECT_NE(error_of(R"({"z0_epoch": "2000-01-01T00:00", "constituents": []})").find("/z0_epoch"), std::string::npos);
  EXPECT_NE(error_of(R"({"z0_m": 0})").find("/constituents \"\": missing required field"), std::string::npos);
  EXPECT_NE(error_of(R"({"constituents": [], "amplitude": 1})").find("/amplitude"), std::string::npos);
  EXPECT_NE(error_of(R"({"constituents": [{"name": "M2", "amplitude_m": 1, "phase_deg": 0, "speed_deg_per_h": 28.0}]})")
                .find("does not match"),
            std::string::npos);
  EXPECT_NE(error_of("{not json").find("site_tide.json: line 1, column 3: not valid JSON"), std::string::npos);
}

TEST(TideFile, PredictionIsTheHarmonicSum) {
  // With a single solar constituent (f = 1, u = 0) the prediction is Z0 + rate t + H cos(V - g)
  // with V = 2T, T = 180 deg at 00:00 UT: at 03:00 UT, V = 2 * 225 = 90 deg.
  ConstituentSet s;
  s.z0_m = 0.5;
  s.z0_rate_m_per_yr = 0.01;
  s.z0_epoch_s = 1577836800.0;  // 2020-01-01T00:00Z
  s.constituents.push_back({"S2", 1.0, 30.0, kUnknown, kUnknown, std::nullopt});
  const double t = 1577836800.0 + 3 * 3600.0;
  const double expected = 0.5 + 0.01 * 3 * 3600.0 / kSecondsPerJulianYear + std::cos((90.0 - 30.0) * M_PI / 180.0);
  EXPECT_NEAR(predict_tide_level_m(s, t), expected, 1e-12);
}

}  // namespace
}  // namespace strandline::tide
