#include "server/io/slopes_json.h"

#include <fstream>

#include "corrections/core/errors.h"
#include "server/io/json_numbers.h"
#include "server/io/transect_params_csv.h"
#include "corrections/core/json_text.h"

namespace strandline {

namespace {

}  // namespace

nlohmann::json slopes_json(const SiteTable& table, const SlopePlan& plan) {
  nlohmann::json rows = nlohmann::json::array();
  for (const auto& t : table.transects) {
    nlohmann::json row = {
        {"transect_id", t.id},
        {"slope", number_or_null(t.slope)},
        {"slope_sigma", number_or_null(t.slope_sigma)},
        {"slope_ci95", known(t.slope_ci95_low) ? nlohmann::json::array({t.slope_ci95_low, t.slope_ci95_high})
                                               : nlohmann::json(nullptr)},
        {"slope_source", std::string(slope_source_name(t.slope_source))},
        {"slope_identifiable", t.slope_identifiable},
    };
    const nlohmann::json& d = t.slope_details;
    if (d.is_object()) {
      row["estimate"] = d.value("tan_beta", nlohmann::json(nullptr));
      row["verdict"] = d.value("verdict", "");
      row["reasons"] = d.value("reasons", nlohmann::json::array());
      row["n_images"] = d.value("n_images", 0);
      row["band"] = d.value("band", nlohmann::json(nullptr));
      row["energy_curve"] = d.value("energy_curve", nlohmann::json(nullptr));
      row["details"] = d;
    }
    rows.push_back(std::move(row));
  }
  return {{"schema", "strandline.slopes"},
          {"version", kSlopesJsonVersion},
          {"search_range", {plan.search_min, plan.search_max}},
          {"transects", std::move(rows)}};
}

std::unordered_map<std::string, SlopeValue> read_slopes_json(std::istream& in, const std::string& file) {
  const nlohmann::json doc = parse_json_stream(in, file);
  auto fail = [&](const std::string& pointer, const nlohmann::json& value, const std::string& reason) -> void {
    throw InputError(file, 0, pointer, value.is_string() ? value.get<std::string>() : value.dump(), reason);
  };
  if (!doc.is_object()) fail("/", doc, "expected a JSON object (a slopes file from `strandline slope`)");
  if (doc.value("schema", "") != "strandline.slopes")
    fail("/schema", doc.value("schema", nlohmann::json(nullptr)), "expected \"strandline.slopes\"");
  if (!doc.contains("version") || !doc["version"].is_number_integer() || doc["version"].get<int>() != kSlopesJsonVersion)
    fail("/version", doc.value("version", nlohmann::json(nullptr)),
         "unsupported version (this build reads " + std::to_string(kSlopesJsonVersion) + ")");
  if (!doc.contains("transects") || !doc["transects"].is_array())
    fail("/transects", doc.value("transects", nlohmann::json(nullptr)), "expected an array");
  std::unordered_map<std::string, SlopeValue> out;
  const auto& rows = doc["transects"];
  for (std::size_t i = 0; i < rows.size(); ++i) {
    const std::string at = "/transects/" + std::to_string(i);
    const auto& row = rows[i];
    if (!row.is_object()) fail(at, row, "expected an object");
    if (!row.contains("transect_id") || !row["transect_id"].is_string() || row["transect_id"].get<std::string>().empty())
      fail(at + "/transect_id", row.value("transect_id", nlohmann::json(nullptr)), "expected a non-empty string");
    const std::string id = row["transect_id"].get<std::string>();
    if (out.count(id)) fail(at + "/transect_id", row["transect_id"], "transect listed twice");
    const std::string source = row.value("slope_source", "");
    if (source != "estimated" && source != "fixed" && source != "default" && source != "none")
      fail(at + "/slope_source", row.value("slope_source", nlohmann::json(nullptr)),
           "expected \"estimated\", \"fixed\", \"default\" or \"none\"");
    if (!row.contains("slope_identifiable") || !row["slope_identifiable"].is_boolean())
      fail(at + "/slope_identifiable", row.value("slope_identifiable", nlohmann::json(nullptr)), "expected true or false");
    if (source == "default" || source == "none" || !row["slope_identifiable"].get<bool>()) continue;
    const auto& slope = row.value("slope", nlohmann::json(nullptr));
    if (!slope.is_number()) fail(at + "/slope", slope, "expected a number");
    SlopeValue v;
    v.slope = slope.get<double>();
    if (auto why = slope_problem(v.slope)) fail(at + "/slope", slope, *why);
    const auto& sigma = row.value("slope_sigma", nlohmann::json(nullptr));
    if (!sigma.is_null()) {
      if (!sigma.is_number() || !(sigma.get<double>() >= 0)) fail(at + "/slope_sigma", sigma, "expected a number >= 0 or null");
      v.slope_sigma = sigma.get<double>();
    }
    out[id] = v;
  }
  return out;
}

std::unordered_map<std::string, SlopeValue> read_slopes_json_file(const std::string& path) {
  std::ifstream in(path);
  if (!in) throw InputError(path, 0, "", "", "cannot open file");
  return read_slopes_json(in, path);
}

bool is_slopes_json_path(const std::string& path) {
  return path.size() >= 5 && path.compare(path.size() - 5, 5, ".json") == 0;
}

}  // namespace strandline
