// Per-transect and per-site summaries of a finished run (the summary JSON of the
// batch CLI and GET /v1/sites/{site}/summary share it).
#pragma once

#include <nlohmann/json.hpp>

#include "corrections/core/run_inputs.h"
#include "corrections/core/site_table.h"

namespace strandline {

inline constexpr int kSummarySchemaVersion = 1;

struct SummaryOptions {
  TimeS trend_from_s = kUnknown;  // optional window for trends
  TimeS trend_to_s = kUnknown;
};

nlohmann::json transect_summary(const SiteTable& table, std::size_t transect, const RunInputs& inputs,
                                const SummaryOptions& options);
// The same without the run's inputs (the slope-bound re-evaluation then assumes a
// slope-free wave term, exact for `none` and `setup`).
nlohmann::json transect_summary(const SiteTable& table, std::size_t transect, const SummaryOptions& options);

// {"schema_version", "transects": [...], "cautions": [...]}; callers add "provenance".
nlohmann::json site_summary(const SiteTable& table, const RunInputs& inputs, const SummaryOptions& options);

}  // namespace strandline
