#include "server/io/transect_params_csv.h"

#include <cmath>
#include <fstream>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"

namespace strandline {

TransectParams read_transect_params(std::istream& in, const std::string& file, bool require_slope) {
  CsvTable csv(in, file);
  // The slope columns of an upload plus z_ref_m; --slopes (require_slope) needs the slope column.
  const ResolvedColumns c = resolve_columns(csv.header().names(), slope_input_columns(true), file);
  if (require_slope) csv.header().require("slope");
  const std::optional<std::size_t> c_slope = c.at[1], c_sigma = c.at[2], c_zref = c.at[3];
  if (!c_slope && !c_zref) throw InputError(file, 1, "", "", "expected a slope or z_ref_m column beside transect_id");
  TransectParams out;
  SlopeFileRules rules;
  std::vector<std::string> f;
  auto cell = [&](std::optional<std::size_t> col) { return col ? std::string_view(f[*col]) : std::string_view(); };
  auto fail = [&](const RowProblem& p) { throw InputError(file, csv.line(), p.field, p.value, p.reason); };
  SlopeFields row;
  while (csv.next(f)) {
    if (auto p = slope_row(f[*c.at[0]], cell(c_slope), cell(c_sigma), require_slope, row)) fail(*p);
    if (auto p = rules.admit(row.transect_id, csv.line())) fail(*p);
    if (known(row.slope)) out.slopes[row.transect_id] = SlopeValue{row.slope, row.slope_sigma};
    if (c_zref) {
      std::optional<double> z;
      try {
        z = parse_optional_number(f[*c_zref]);
      } catch (const FieldError& e) {
        throw InputError(file, csv.line(), "z_ref_m", f[*c_zref], e.what());
      }
      if (z) {
        if (std::abs(*z) > 50)
          throw InputError(file, csv.line(), "z_ref_m", f[*c_zref], "implausible reference elevation (metres expected)");
        out.z_ref_m[row.transect_id] = *z;
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
