#include "server/io/transect_params_csv.h"

#include <fstream>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"

namespace strandline {

std::optional<std::string> slope_problem(double slope) {
  if (!(slope > 0)) return "slope must be positive (tan(beta), e.g. 0.08)";
  if (slope > 1) return "slope above 1 (tan(beta) > 45 degrees): give tan(beta), not degrees or percent";
  return std::nullopt;
}

TransectParams read_transect_params(std::istream& in, const std::string& file, bool require_slope) {
  CsvTable csv(in, file);
  const auto c_id = csv.header().require("transect_id");
  const auto c_slope = require_slope ? std::optional(csv.header().require("slope")) : csv.header().find("slope");
  const auto c_sigma = csv.header().find("slope_sigma");
  const auto c_zref = csv.header().find("z_ref_m");
  if (!c_slope && !c_zref)
    throw InputError(file, 1, "", "", "expected a slope or z_ref_m column beside transect_id");
  for (const auto& name : csv.header().names())
    if (name != "transect_id" && name != "slope" && name != "slope_sigma" && name != "z_ref_m")
      throw InputError(file, 1, "", "", "unknown column \"" + name + "\" (expected transect_id, slope, slope_sigma, z_ref_m)");
  TransectParams out;
  std::vector<std::string> f;
  std::unordered_map<std::string, std::int64_t> seen;
  while (csv.next(f)) {
    const std::string& id = f[c_id];
    if (id.empty()) throw InputError(file, csv.line(), "transect_id", id, "empty transect id");
    if (auto [it, fresh] = seen.emplace(id, csv.line()); !fresh)
      throw InputError(file, csv.line(), "transect_id", id, "listed twice (first on line " + std::to_string(it->second) + ")");
    auto number = [&](std::size_t col, const char* name) -> std::optional<double> {
      try {
        return parse_optional_number(f[col]);
      } catch (const FieldError& e) {
        throw InputError(file, csv.line(), name, f[col], e.what());
      }
    };
    if (c_slope) {
      auto slope = number(*c_slope, "slope");
      if (!slope && require_slope) throw InputError(file, csv.line(), "slope", "", "empty slope");
      if (slope) {
        if (auto why = slope_problem(*slope)) throw InputError(file, csv.line(), "slope", f[*c_slope], *why);
        SlopeValue v{*slope, kUnknown};
        if (c_sigma) {
          if (auto sigma = number(*c_sigma, "slope_sigma")) {
            if (*sigma < 0) throw InputError(file, csv.line(), "slope_sigma", f[*c_sigma], "must not be negative");
            v.slope_sigma = *sigma;
          }
        }
        out.slopes[id] = v;
      }
    }
    if (c_zref) {
      if (auto z = number(*c_zref, "z_ref_m")) {
        if (std::abs(*z) > 50) throw InputError(file, csv.line(), "z_ref_m", f[*c_zref], "implausible reference elevation (metres expected)");
        out.z_ref_m[id] = *z;
      }
    }
  }
  return out;
}

TransectParams read_transect_params_file(const std::string& path, bool require_slope) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, 0, "", "", "cannot open file");
  return read_transect_params(in, path, require_slope);
}

}  // namespace strandline
