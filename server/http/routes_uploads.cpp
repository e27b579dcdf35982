// Uploads of observations and site inputs, their listing and retraction.
#include "corrections/core/errors.h"
#include "corrections/tide/constituent_file.h"
#include "server/http/service_internal.h"
#include "server/http/upload_rows.h"
#include "server/store/api_keys.h"

namespace strandline::http {

namespace {

enum class OnInvalid { reject, skip };

OnInvalid on_invalid(const Context& c) {
  const auto v = c.query("on_invalid").value_or("reject");
  if (v == "reject") return OnInvalid::reject;
  if (v == "skip") return OnInvalid::skip;
  throw Problem(400, problem_type::bad_request, "Bad query parameter", "on_invalid must be \"reject\" or \"skip\"",
                {{"parameter", "on_invalid"}});
}

std::set<std::string> transect_ids(Context& c, const std::string& site) {
  std::set<std::string> ids;
  for (const auto& t : c.service.store.transects(site)) ids.insert(t.id);
  return ids;
}

nlohmann::json issues_json(const std::vector<store::RowIssue>& rows, BodyFormat format, const std::string& key) {
  nlohmann::json out = nlohmann::json::array();
  for (const auto& r : rows) out.push_back(row_issue_json(r, format, key));
  return out;
}

// Shared flow: parse → (422 unless skipping) → one store transaction → report.
template <class Row, class Parse, class Store>
void upload(Context& c, const std::string& kind, const std::string& array_key, Parse parse, Store store_rows) {
  const auto site = c.site_or_404(c.path_param(0));
  const auto format = body_format_of(c.req.get_header_value("Content-Type"));
  const auto mode = on_invalid(c);
  ParsedUpload<Row> parsed = parse(site, format);
  if (!parsed.invalid.empty() && mode == OnInvalid::reject)
    throw Problem(422, problem_type::invalid_rows, "Invalid rows",
                  std::to_string(parsed.invalid.size()) + " of " + std::to_string(parsed.received) +
                      " rows are invalid; nothing was stored (add ?on_invalid=skip to store the valid rows)",
                  {{"rows", issues_json(parsed.invalid, format, array_key)}});
  store::UploadMeta meta;
  meta.content_type = format == BodyFormat::csv ? "text/csv" : "application/json";
  meta.sha256 = store::sha256_hex(c.req.body);
  meta.uploaded_by = c.key_name;
  meta.received = parsed.received;
  meta.rejected = parsed.invalid;
  const store::UploadResult r = store_rows(site, meta, parsed.rows);
  c.service.metrics.count_rows(kind, r.inserted);
  c.res.set_header("Location", "/v1/sites/" + site.id + "/uploads/" + std::to_string(r.upload_id));
  c.reply(201, {{"upload_id", r.upload_id},
                {"kind", kind},
                {"received", r.received},
                {"inserted", r.inserted},
                {"duplicates", r.duplicates},
                {"duplicate_rows", issues_json(r.duplicate_rows, format, array_key)},
                {"rejected", r.rejected.size()},
                {"rejected_rows", issues_json(r.rejected, format, array_key)}});
}

void post_observations(Context& c) {
  const SensorTable sensors = SensorTable::defaults();
  upload<store::ObservationRow>(
      c, "observations", "observations",
      [&](const store::Site& site, BodyFormat f) {
        return parse_observation_upload(c.req.body, f, transect_ids(c, site.id), sensors);
      },
      [&](const store::Site& site, const store::UploadMeta& m, const auto& rows) {
        return c.service.store.add_observations(site.id, m, rows);
      });
}

void post_water_levels(Context& c) {
  upload<store::WaterLevelRow>(
      c, "water_levels", "water_levels",
      [&](const store::Site&, BodyFormat f) { return parse_water_level_upload(c.req.body, f); },
      [&](const store::Site& site, const store::UploadMeta& m, const auto& rows) {
        return c.service.store.add_water_levels(site.id, m, rows);
      });
}

void post_waves(Context& c) {
  upload<store::WaveRow>(
      c, "waves", "waves", [&](const store::Site&, BodyFormat f) { return parse_wave_upload(c.req.body, f); },
      [&](const store::Site& site, const store::UploadMeta& m, const auto& rows) {
        return c.service.store.add_waves(site.id, m, rows);
      });
}

void post_slopes(Context& c) {
  upload<store::SlopeRow>(
      c, "slopes", "slopes",
      [&](const store::Site& site, BodyFormat f) { return parse_slope_upload(c.req.body, f, transect_ids(c, site.id)); },
      [&](const store::Site& site, const store::UploadMeta& m, const auto& rows) {
        return c.service.store.add_slopes(site.id, m, rows);
      });
}

// A whole constituent file (JSON): checked by the tide reader, idempotent by content hash.
void post_tide_constituents(Context& c) {
  const auto site = c.site_or_404(c.path_param(0));
  const auto body = c.json_body();
  try {
    tide::parse_constituent_json(body, "body");
  } catch (const InputError& e) {
    throw Problem(422, problem_type::invalid_body, "Invalid tide constituents", e.what());
  }
  store::UploadMeta meta;
  meta.content_type = "application/json";
  meta.sha256 = store::sha256_hex(c.req.body);
  meta.uploaded_by = c.key_name;
  meta.received = 1;
  const auto r = c.service.store.add_document(site.id, "tide_constituents", meta, c.req.body);
  c.service.metrics.count_rows("tide_constituents", r.inserted);
  c.res.set_header("Location", "/v1/sites/" + site.id + "/uploads/" + std::to_string(r.upload_id));
  c.reply(r.replay ? 200 : 201, {{"upload_id", r.upload_id},
                                 {"kind", "tide_constituents"},
                                 {"received", 1},
                                 {"inserted", r.inserted},
                                 {"duplicates", r.duplicates},
                                 {"rejected", 0}});
}

nlohmann::json upload_json(const std::string& site, const store::UploadInfo& u) {
  nlohmann::json j = {{"upload_id", u.id},
                      {"kind", u.kind},
                      {"received_at", u.received_at},
                      {"uploaded_by", u.uploaded_by},
                      {"content_type", u.content_type},
                      {"sha256", u.sha256},
                      {"received", u.received},
                      {"inserted", u.inserted},
                      {"duplicates", u.duplicates},
                      {"rejected", u.rejected},
                      {"retraction", nullptr},
                      {"purged_at", u.purged_at ? nlohmann::json(*u.purged_at) : nlohmann::json()},
                      {"href", "/v1/sites/" + site + "/uploads/" + std::to_string(u.id)}};
  if (u.retraction)
    j["retraction"] = {{"at", u.retraction->at}, {"by", u.retraction->by}, {"reason", u.retraction->reason}};
  return j;
}

std::int64_t upload_id_param(const Context& c) {
  const std::string text = c.path_param(1);
  std::size_t used = 0;
  std::int64_t id = 0;
  try {
    id = std::stoll(text, &used);
  } catch (...) {
  }
  if (used != text.size() || id <= 0)
    throw Problem(404, problem_type::not_found, "Not found", "upload \"" + text + "\" not found");
  return id;
}

void list_uploads(Context& c) {
  const auto site = c.site_or_404(c.path_param(0));
  const auto limit = c.query_integer("limit", 100, 1000);
  const auto before = c.query_integer("cursor", 0, INT64_MAX);
  const auto uploads = c.service.store.uploads(site.id, before, static_cast<int>(limit));
  nlohmann::json items = nlohmann::json::array();
  for (const auto& u : uploads) items.push_back(upload_json(site.id, u));
  const bool full = static_cast<std::int64_t>(uploads.size()) == limit && limit > 0;
  c.reply(200, {{"items", items}, {"next_cursor", full ? nlohmann::json(std::to_string(uploads.back().id)) : nlohmann::json()}});
}

void get_upload(Context& c) {
  const auto site = c.site_or_404(c.path_param(0));
  const auto id = upload_id_param(c);
  auto u = c.service.store.upload(site.id, id);
  if (!u) throw Problem(404, problem_type::not_found, "Not found", "upload " + std::to_string(id) + " not found");
  c.reply(200, upload_json(site.id, *u));
}

// DELETE records a retraction; the reason comes from ?reason= or a JSON body {"reason": "..."}.
void retract_upload(Context& c) {
  const auto site = c.site_or_404(c.path_param(0));
  const auto id = upload_id_param(c);
  std::string reason = c.query("reason").value_or("");
  if (!c.req.body.empty()) {
    const auto body = c.json_body();
    if (!body.is_object() || (body.contains("reason") && !body["reason"].is_string()))
      throw Problem(422, problem_type::invalid_body, "Invalid body", "expected {\"reason\": \"...\"}",
                    {{"pointer", "/reason"}});
    reason = body.value("reason", reason);
  }
  if (reason.empty())
    throw Problem(422, problem_type::invalid_body, "Reason required",
                  "a retraction records why: give ?reason=... or {\"reason\": \"...\"}", {{"pointer", "/reason"}});
  if (!c.service.store.retract_upload(site.id, id, {store::now_utc_text(), c.key_name, reason}))
    throw Problem(409, problem_type::conflict, "Already retracted", "upload " + std::to_string(id) + " is already retracted");
  c.reply(200, upload_json(site.id, *c.service.store.upload(site.id, id)));
}

void purge(Context& c) {
  const auto site = c.site_or_404(c.path_param(0));
  const auto erased = c.service.store.purge_retracted(site.id);
  c.reply(200, {{"site", site.id}, {"rows_erased", erased}});
}

}  // namespace

std::vector<Route> upload_routes() {
  return {
      {{"POST", "/v1/sites/{site}/observations"}, Access::write, post_observations},
      {{"POST", "/v1/sites/{site}/water-levels"}, Access::write, post_water_levels},
      {{"POST", "/v1/sites/{site}/waves"}, Access::write, post_waves},
      {{"POST", "/v1/sites/{site}/slopes"}, Access::write, post_slopes},
      {{"POST", "/v1/sites/{site}/tide-constituents"}, Access::write, post_tide_constituents},
      {{"GET", "/v1/sites/{site}/uploads"}, Access::read, list_uploads},
      {{"GET", "/v1/sites/{site}/uploads/{upload}"}, Access::read, get_upload},
      {{"DELETE", "/v1/sites/{site}/uploads/{upload}"}, Access::write, retract_upload},
      {{"POST", "/v1/sites/{site}/purge"}, Access::write, purge},
  };
}

}  // namespace strandline::http
