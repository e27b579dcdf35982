#include "server/app/uploads.h"

#include <algorithm>
#include <set>
#include <unordered_map>

#include <nlohmann/json.hpp>

#include "corrections/core/errors.h"
#include "corrections/core/json_text.h"
#include "corrections/tide/constituent_file.h"
#include "server/app/upload_rows.h"
#include "server/io/observation_rules.h"

namespace strandline::app {

namespace {

std::set<std::string> transect_ids(store::Store& store, const std::string& site_id) {
  std::set<std::string> ids;
  for (const auto& t : store.transects(site_id)) ids.insert(t.id);
  return ids;
}

// One image, one time and one sensor also across uploads: rows naming an image
// stored (on any transect) with another time or sensor are invalid.
void check_against_stored_images(store::Store& store, const std::string& site_id,
                                 ParsedUpload<store::ObservationRow>& parsed) {
  std::vector<std::string> images;
  {
    std::set<std::string_view> seen;
    for (const auto& r : parsed.rows)
      if (seen.insert(r.image_id).second) images.push_back(r.image_id);
  }
  const auto stored = store.stored_images(site_id, images);
  if (stored.empty()) return;
  std::unordered_map<std::string, const store::StoredImage*> by_id;
  for (const auto& s : stored) by_id.emplace(s.image_id, &s);
  ObservationRow row;
  std::vector<store::ObservationRow> kept;
  kept.reserve(parsed.rows.size());
  bool refused = false;
  for (auto& r : parsed.rows) {
    const auto it = by_id.find(r.image_id);
    if (it != by_id.end()) {
      row.image_id = r.image_id;
      row.time_s = r.time_s;
      row.sensor = r.sensor;
      if (auto p = stored_image_problem(row, it->second->time_s, it->second->sensor)) {
        parsed.invalid.push_back({r.line, "", p->field, p->value, p->reason});
        refused = true;
        continue;
      }
    }
    kept.push_back(std::move(r));
  }
  parsed.rows = std::move(kept);
  if (refused)
    std::stable_sort(parsed.invalid.begin(), parsed.invalid.end(),
                     [](const auto& a, const auto& b) { return a.line < b.line; });
}

// The shared tail: refuse (reject mode) or keep the invalid rows, then store.
template <class Row, class Store>
UploadReport finish(ParsedUpload<Row>& parsed, UploadRequest& request, Store store_rows) {
  // An upload without rows would be recorded as an event that changed nothing.
  if (parsed.received == 0) throw InputError("body", 0, "", "", "no data rows: an upload holds at least one row");
  if (!parsed.invalid.empty() && request.on_invalid == OnInvalid::reject)
    throw InvalidRows(std::move(parsed.invalid), parsed.received);
  if (parsed.record_problem) throw InputError("body", 0, "", "", *parsed.record_problem);
  request.meta.received = parsed.received;
  request.meta.rejected = std::move(parsed.invalid);
  UploadReport report;
  report.result = store_rows(request.meta, parsed.rows);
  report.ignored_columns = std::move(parsed.ignored_columns);
  return report;
}

}  // namespace

UploadReport upload_observations(store::Store& store, const std::string& site_id, UploadRequest request,
                                 const SensorTable& sensors) {
  auto parsed = parse_observation_upload(request.body, request.format, transect_ids(store, site_id), sensors);
  check_against_stored_images(store, site_id, parsed);
  return finish(parsed, request, [&](const store::UploadMeta& m, const auto& rows) {
    return store.add_observations(site_id, m, rows);
  });
}

UploadReport upload_water_levels(store::Store& store, const std::string& site_id, UploadRequest request) {
  auto parsed = parse_water_level_upload(request.body, request.format);
  return finish(parsed, request, [&](const store::UploadMeta& m, const auto& rows) {
    return store.add_water_levels(site_id, m, rows);
  });
}

UploadReport upload_waves(store::Store& store, const std::string& site_id, UploadRequest request) {
  auto parsed = parse_wave_upload(request.body, request.format);
  return finish(parsed, request,
                [&](const store::UploadMeta& m, const auto& rows) { return store.add_waves(site_id, m, rows); });
}

UploadReport upload_slopes(store::Store& store, const std::string& site_id, UploadRequest request) {
  auto parsed = parse_slope_upload(request.body, request.format, transect_ids(store, site_id));
  return finish(parsed, request,
                [&](const store::UploadMeta& m, const auto& rows) { return store.add_slopes(site_id, m, rows); });
}

store::UploadResult upload_tide_constituents(store::Store& store, const std::string& site_id,
                                             const std::string& body, store::UploadMeta meta) {
  nlohmann::json document;
  try {
    document = parse_json_text(body, "body");
  } catch (const JsonTextError& e) {
    throw BodyError(e.what(), "", true);
  }
  tide::parse_constituent_json(document, "body");
  meta.received = 1;
  return store.add_document(site_id, "tide_constituents", meta, body);
}

}  // namespace strandline::app
