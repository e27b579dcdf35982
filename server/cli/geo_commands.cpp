// Geodata subcommands: `intersect` (shoreline polylines x transects -> batch
// observation CSV), `transects` (shore-normal transects along a baseline),
// `polylines` (observations -> shoreline polylines, the inverse of intersect)
// and `geoexport` (a cleaned CSV + summary -> GeoPackage/GeoJSON layers).
#include <fstream>
#include <sstream>
#include <iostream>

#include "corrections/core/errors.h"
#include "server/cli/args.h"
#include "server/cli/commands.h"
#include "server/geo/baseline_transects.h"
#include "server/geo/crossing_csv.h"
#include "server/geo/observation_polylines.h"
#include "server/geo/plain_table_io.h"
#include "server/geo/shoreline_intersect.h"
#include "server/geo/transect_reader.h"
#include "server/io/observations_csv.h"
#include "server/geo/result_writer.h"
#include "corrections/core/json_text.h"

namespace strandline::cli {

namespace {

// The transect-file options shared by intersect, polylines and geoexport.
void add_transect_options(Args& args) {
  args.add_value("transects-layer", "NAME", "layer of the transects file when it has several")
      .add_value("transect-id-field", "N", "transect id attribute (default transect_id)")
      .add_value("azimuth-field", "N", "point transects: azimuth attribute (default azimuth_deg)")
      .add_value("length-field", "N", "point transects: length attribute (default length_m)")
      .add_value("crs", "CRS",
                 "work CRS when the transects are not projected\n"
                 "(EPSG code, WKT or PROJ string); default: UTM zone\n"
                 "of the transects' centroid");
}

geo::TransectReadOptions transect_options(const Args& args) {
  geo::TransectReadOptions o;
  o.layer = args.get("transects-layer");
  o.id_field = args.get("transect-id-field").value_or(o.id_field);
  o.azimuth_field = args.get("azimuth-field").value_or(o.azimuth_field);
  o.length_field = args.get("length-field").value_or(o.length_field);
  o.crs = args.get("crs");
  return o;
}

void report_work_crs(const geo::WorkCrs& crs) {
  std::cerr << "work CRS: " << crs.name;
  if (!crs.authority.empty()) std::cerr << " (" << crs.authority << ")";
  std::cerr << " - " << crs.choice << "\n";
}

}  // namespace

int run_intersect(const CommandArgs& argv) {
  Args args("strandline intersect --shorelines FILE --transects FILE --out obs.csv [options]",
            "Intersects shoreline polylines (one or more per image) with transects and writes\n"
            "the batch observation CSV: one row per transect crossed per image.");
  args.add_value("shorelines", "FILE", "polylines (GeoPackage, GeoJSON, Shapefile, FlatGeobuf, ...)")
      .add_value("shorelines-layer", "NAME", "layer of FILE when it has several")
      .add_value("transects", "FILE",
                 "transect lines (origin = first vertex) or points with\n"
                 "azimuth and length attributes")
      .add_value("out", "FILE", "observation CSV (\"-\" for standard output)")
      .add_value("crossing", "RULE",
                 "several crossings: outermost (the most seaward; default),\n"
                 "innermost (the most landward), or omit (leave the pair out)");
  add_transect_options(args);
  args.add_value("time-field", "N", "shoreline time attribute (default time)")
      .add_value("sensor-field", "N", "shoreline sensor attribute (default sensor)")
      .add_value("image-field", "N", "shoreline image attribute (default image_id)")
      .add_value("cloud-field", "N", "optional cloud fraction attribute (cloud_fraction)")
      .add_value("rmse-field", "N", "optional georeferencing RMSE attribute (georef_rmse_m)")
      .add_epilogue("A report (work CRS, images, crossings, uncrossed transects) goes to standard error.\n");
  if (!args.parse(argv)) return kExitOk;
  const std::string shorelines = args.require("shorelines");
  const std::string transects_path = args.require("transects");
  const std::string out_path = args.require("out");
  geo::TransectReadOptions topt = transect_options(args);
  geo::IntersectOptions iopt;
  iopt.layer = args.get("shorelines-layer");
  iopt.rule = geo::crossing_rule_from_name(args.get("crossing").value_or("outermost"));
  auto& fields = iopt.fields;
  fields.time = args.get("time-field").value_or(fields.time);
  fields.sensor = args.get("sensor-field").value_or(fields.sensor);
  fields.image = args.get("image-field").value_or(fields.image);
  if (auto v = args.get("cloud-field")) fields.cloud_fraction = *v, fields.cloud_fraction_required = true;
  if (auto v = args.get("rmse-field")) fields.georef_rmse = *v, fields.georef_rmse_required = true;

  const geo::TransectSet transects = geo::read_transects(transects_path, topt);
  report_work_crs(transects.crs);
  const geo::IntersectResult result = geo::intersect_shorelines(shorelines, transects, iopt);

  if (out_path == "-") {
    geo::write_crossing_csv(std::cout, result);
  } else {
    std::ofstream out(out_path, std::ios::binary);
    if (!out) throw InputError(out_path + ": cannot open for writing");
    geo::write_crossing_csv(out, result);
    out.close();
    if (!out) throw InputError(out_path + ": write failed");
  }
  const auto& r = result.report;
  std::cerr << "shorelines: " << r.features << " features, " << r.images << " images (CRS " << r.shoreline_crs
            << ")\n"
            << "transects: " << transects.transects.size() << "; rows written: " << r.rows << "\n"
            << "transect-image pairs with several crossings: " << r.ambiguous_pairs;
  if (r.left_out_ambiguous) std::cerr << " (" << r.left_out_ambiguous << " left out, --crossing omit)";
  std::cerr << "\ntransect-image pairs not crossed: " << r.uncrossed_pairs << "\n"
            << "transects crossed by no image: " << r.never_crossed.size();
  for (std::size_t i = 0; i < r.never_crossed.size() && i < 20; ++i)
    std::cerr << (i ? ", " : " (") << r.never_crossed[i];
  if (!r.never_crossed.empty()) std::cerr << (r.never_crossed.size() > 20 ? ", ...)" : ")");
  std::cerr << "\n";
  return kExitOk;
}

int run_transects(const CommandArgs& argv) {
  Args args("strandline transects --baseline FILE --spacing M --length M --sea-side left|right --out FILE [options]",
            "Generates shore-normal transects along a baseline polyline (one or more lines):\n"
            "one every --spacing metres of baseline from each line's first vertex, normal to\n"
            "the baseline's direction averaged over --direction-window metres, pointing seaward.");
  args.add_value("baseline", "FILE", "baseline lines (any OGR vector format)")
      .add_value("baseline-layer", "NAME", "layer of FILE when it has several")
      .add_value("spacing", "M", "metres between transects along the baseline")
      .add_value("length", "M", "transect length in metres")
      .add_value("sea-side", "SIDE", "the sea lies left or right walking along the baseline")
      .add_value("landward", "M", "start each transect M metres landward of the baseline (0)")
      .add_value("direction-window", "M", "window for the baseline direction (default: spacing)")
      .add_value("id-prefix", "TEXT", "transect ids TEXT0001, TEXT0002, ... (default T)")
      .add_value("crs", "CRS", "work CRS when the baseline is not projected")
      .add_value("out", "FILE", ".gpkg (work CRS) or .geojson (WGS 84 lon/lat)");
  if (!args.parse(argv)) return kExitOk;
  geo::BaselineOptions o;
  const std::string baseline = args.require("baseline");
  const std::string out_path = args.require("out");
  o.layer = args.get("baseline-layer");
  o.crs = args.get("crs");
  args.require("spacing");
  args.require("length");
  o.spacing_m = *args.number("spacing");
  o.length_m = *args.number("length");
  o.sea_side = geo::sea_side_from_name(args.require("sea-side"));
  o.landward_m = args.number_or("landward", 0.0);
  o.direction_window_m = args.number_or("direction-window", kUnknown);
  o.id_prefix = args.get("id-prefix").value_or(o.id_prefix);
  if (!geo::geo_format_for(out_path)) throw UsageError("--out " + out_path + ": use a .gpkg or .geojson file");

  const geo::BaselineTransects made = geo::transects_from_baseline(baseline, o);
  report_work_crs(made.set.crs);
  const geo::GeoWriteReport written = geo::write_geo_layers(out_path, made.set, {});
  std::cerr << "transects written: " << written.transects << " to " << out_path << "\n";
  if (made.crossing_neighbours)
    std::cerr << "warning: " << made.crossing_neighbours
              << " pairs of neighbouring transects cross each other (baseline bends sharply for this length;"
                 " increase --direction-window or --spacing, or shorten --length)\n";
  return kExitOk;
}

int run_polylines(const CommandArgs& argv) {
  Args args("strandline polylines --observations obs.csv --transects FILE --out lines.gpkg [options]",
            "Draws the per-transect positions of each image (batch observation CSV) as\n"
            "shoreline polylines: per image, a line through the positions on consecutive\n"
            "transects (transect file order), broken where a transect has no position; an\n"
            "isolated position becomes a short tick across its transect. `intersect` on the\n"
            "result gives the positions back.");
  args.add_value("observations", "FILE", "batch observation CSV (chainage_m = raw position)")
      .add_value("transects", "FILE", "transects (see `strandline intersect --help`)");
  add_transect_options(args);
  args.add_value("tick", "M", "half length of a tick in metres (default 5)")
      .add_value("out", "FILE", ".gpkg (work CRS) or .geojson (WGS 84 lon/lat); layer `shorelines`");
  if (!args.parse(argv)) return kExitOk;
  const std::string obs_path = args.require("observations");
  const std::string transects_path = args.require("transects");
  const std::string out_path = args.require("out");
  geo::TransectReadOptions topt = transect_options(args);
  const double tick_m = args.number_or("tick", 5.0);
  if (!geo::geo_format_for(out_path)) throw UsageError("--out " + out_path + ": use a .gpkg or .geojson file");
  if (!(tick_m > 0)) throw UsageError("--tick must be positive");

  const geo::TransectSet transects = geo::read_transects(transects_path, topt);
  report_work_crs(transects.crs);
  const ObservationFile obs = read_observations_file(obs_path, {});
  const SiteTable& t = obs.table;
  std::vector<geo::ImagePosition> positions(t.size());
  for (std::size_t i = 0; i < t.size(); ++i)
    positions[i] = {t.transects[t.transect[i]].id, t.image_ids[t.image[i]], t.time_s[i], t.sensor_names[t.sensor[i]],
                    t.chainage_raw_m[i], t.cloud_fraction[i], t.georef_rmse_m[i]};
  const auto r = geo::write_position_polylines(out_path, transects, positions, tick_m);
  std::cerr << "images: " << r.images << "; polylines written: " << r.features << " (" << r.ticks
            << " ticks for isolated positions) to " << out_path << "\n";
  if (r.unknown_transects)
    std::cerr << "warning: " << r.unknown_transects << " positions on transects not in " << transects_path
              << " were left out\n";
  return kExitOk;
}

int run_geoexport(const CommandArgs& argv) {
  Args args("strandline geoexport --points cleaned.csv --transects FILE --out cleaned.gpkg [options]",
            "Writes corrected shoreline points as geometry (transect origin + chainage along\n"
            "the azimuth) with every column of the CSV, and the transects as lines carrying\n"
            "the per-transect summary.");
  args.add_value("points", "FILE", "CSV with transect_id and a chainage column (e.g. cleaned.csv)")
      .add_value("chainage-column", "NAME", "position placed on the transect (default chainage_m)")
      .add_value("summary", "FILE", "summary JSON of `strandline correct` (per-transect columns)")
      .add_value("transects", "FILE", "transects (see `strandline intersect --help`)");
  add_transect_options(args);
  args.add_value("out", "FILE",
                 ".gpkg: layers shoreline_points and transects in the work CRS;\n"
                 ".geojson: WGS 84 lon/lat, transects in FILE_transects.geojson");
  if (!args.parse(argv)) return kExitOk;
  const std::string points_path = args.require("points");
  const std::string transects_path = args.require("transects");
  const std::string out_path = args.require("out");
  const auto summary_path = args.get("summary");
  geo::GeoLayers layers;
  layers.chainage_column = args.get("chainage-column").value_or(layers.chainage_column);
  geo::TransectReadOptions topt = transect_options(args);
  if (!geo::geo_format_for(out_path)) throw UsageError("--out " + out_path + ": use a .gpkg or .geojson file");

  const geo::TransectSet transects = geo::read_transects(transects_path, topt);
  report_work_crs(transects.crs);
  const geo::PlainTable points = geo::read_csv_plain_table(points_path);
  if (!points.column(layers.transect_id_column) || !points.column(layers.chainage_column))
    throw InputError(points_path + ": needs columns " + layers.transect_id_column + " and " + layers.chainage_column);
  std::optional<geo::PlainTable> summary;
  if (summary_path) {
    std::ifstream in(*summary_path);
    if (!in) throw InputError(*summary_path + ": cannot open");
    const nlohmann::json j = parse_json_stream(in, *summary_path);
    summary = geo::summary_plain_table(j, *summary_path);
  }
  layers.points = &points;
  layers.transect_summary = summary ? &*summary : nullptr;
  const auto r = geo::write_geo_layers(out_path, transects, layers);
  std::cerr << "points: " << r.points << " (" << r.points_without_geometry
            << " without geometry: unknown position or transect); transects: " << r.transects << "\nwritten:";
  for (const auto& f : r.files) std::cerr << " " << f;
  std::cerr << "\n";
  return kExitOk;
}

}  // namespace strandline::cli
