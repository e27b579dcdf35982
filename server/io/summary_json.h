// The one JSON form of the run summaries (qc/summary.h): the batch `--summary`
// file, the service's per-transect summaries and, through geo's
// summary_plain_table, the GeoPackage transect layer. Keys: server/FORMATS.md,
// "Summary JSON". Unknown numbers and missing parts are written as null.
#pragma once

#include <nlohmann/json.hpp>

#include "qc/summary.h"

namespace strandline {

nlohmann::json transect_summary_json(const TransectSummary& summary);

// {"schema_version", "reference_elevation_m", "wave_correction", "transects": [...],
//  "cautions": [...]}; callers add "provenance".
nlohmann::json site_summary_json(const SiteSummary& summary);

// {"sensor_offsets", "sensor_noise"}: the site-wide keys of the above.
nlohmann::json site_level_summary_json(const SiteSummary& summary);

}  // namespace strandline
