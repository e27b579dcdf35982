#include "server/geo/crossing_csv.h"

#include <cstdio>

#include "corrections/core/csv_reader.h"

namespace strandline::geo {

namespace {

std::string fixed(double v, int decimals) {
  if (!known(v)) return "";
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.*f", decimals, v);
  return buf;
}

std::string general(double v) {
  if (!known(v)) return "";
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.10g", v);
  return buf;
}

}  // namespace

void write_crossing_csv(std::ostream& out, const IntersectResult& result) {
  const bool cloud = result.report.has_cloud_fraction, rmse = result.report.has_georef_rmse;
  out << "transect_id,time,chainage_m,sensor,image_id";
  if (cloud) out << ",cloud_fraction";
  if (rmse) out << ",georef_rmse_m";
  out << ",crossings\n";
  for (const CrossingRow& r : result.rows) {
    // 0.1 mm: finer than any image-derived position, coarse enough to read.
    out << csv_escape(r.transect_id) << ',' << format_time_utc(r.time_s) << ',' << fixed(r.chainage_m, 4) << ','
        << csv_escape(r.sensor) << ',' << csv_escape(r.image_id);
    if (cloud) out << ',' << general(r.cloud_fraction);
    if (rmse) out << ',' << general(r.georef_rmse_m);
    out << ',' << r.crossings << '\n';
  }
}

}  // namespace strandline::geo
