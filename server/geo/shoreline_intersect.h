// Intersects image-derived shoreline polylines with transects: one raw chainage
// per transect crossed per image. All polylines of one image (same image id) are
// treated together; they are transformed with PROJ into the work CRS (vertex by
// vertex, segments straight in the work CRS) and intersected with OGR/GEOS.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "corrections/core/time_utc.h"
#include "server/geo/geo_types.h"

namespace strandline::geo {

enum class CrossingRule {
  outermost,  // several crossings: keep the largest chainage (the most seaward)
  innermost,  // keep the smallest (the most landward)
  omit,       // keep none: the pair is left out and reported
};
// "outermost", "innermost", "omit"; throws ArgumentError otherwise.
CrossingRule crossing_rule_from_name(const std::string& name);

struct ShorelineFields {
  std::string time = "time";
  std::string sensor = "sensor";
  std::string image = "image_id";
  std::string cloud_fraction = "cloud_fraction";  // optional attribute
  std::string georef_rmse = "georef_rmse_m";      // optional attribute
  bool cloud_fraction_required = false;           // set when the user named the field
  bool georef_rmse_required = false;
};

struct IntersectOptions {
  std::optional<std::string> layer;
  ShorelineFields fields;
  CrossingRule rule = CrossingRule::outermost;
  std::vector<std::string> drivers;  // GDAL drivers allowed to open the file; empty: any
};

struct CrossingRow {
  std::string transect_id;
  TimeS time_s = 0;
  double chainage_m = kUnknown;  // from the transect origin, positive seaward
  std::string sensor;
  std::string image_id;
  double cloud_fraction = kUnknown;
  double georef_rmse_m = kUnknown;
  int crossings = 0;  // how many times the image's shoreline crossed the transect
};

struct IntersectReport {
  std::size_t features = 0;
  std::size_t images = 0;
  std::size_t rows = 0;
  std::size_t ambiguous_pairs = 0;        // transect-image pairs with several crossings
  std::size_t left_out_ambiguous = 0;     // of those, not written (omit)
  std::size_t uncrossed_pairs = 0;        // transect-image pairs without a crossing
  std::vector<std::string> never_crossed;  // transects no image crossed
  bool has_cloud_fraction = false;
  bool has_georef_rmse = false;
  std::string shoreline_crs;  // name of the shorelines' CRS
};

struct IntersectResult {
  std::vector<CrossingRow> rows;  // by transect (input order), then time, then image id
  IntersectReport report;
};

// Throws InputError naming the layer and feature FID for bad geometry, missing
// attributes, inconsistent image attributes, a missing or untransformable CRS.
IntersectResult intersect_shorelines(const std::string& path, const TransectSet& transects,
                                     const IntersectOptions& options);

}  // namespace strandline::geo
