// Uploads of observations and site inputs, their listing and retraction.
#include "corrections/core/errors.h"
#include "server/app/uploads.h"
#include "server/http/service_internal.h"
#include "server/http/upload_rows.h"
#include "server/store/api_keys.h"

namespace strandline::http {

namespace {

app::OnInvalid on_invalid(const Context& c) {
  const auto v = c.query("on_invalid").value_or("reject");
  if (v == "reject") return app::OnInvalid::reject;
  if (v == "skip") return app::OnInvalid::skip;
  throw Problem(400, problem_type::bad_request, "Bad query parameter", "on_invalid must be \"reject\" or \"skip\"",
                {{"parameter", "on_invalid"}});
}

// Shared flow: request → app::upload_* (rules and store) → 201 report, or the problem.
template <class Upload>
void upload(Context& c, const std::string& kind, const std::string& array_key, Upload run_upload) {
  const auto site = c.site_or_404(c.path_param(0));
  app::UploadRequest request;
  request.body = c.req.body;
  request.format = body_format_of(c.req.get_header_value("Content-Type"));
  request.on_invalid = on_invalid(c);
  request.meta.content_type = request.format == BodyFormat::csv ? "text/csv" : "application/json";
  request.meta.sha256 = store::sha256_hex(c.req.body);
  request.meta.uploaded_by = c.key_name;
  const auto format = request.format;
  app::UploadReport report;
  try {
    report = refusing_bad_bodies([&] { return run_upload(site, std::move(request)); });
  } catch (const app::InvalidRows& e) {
    throw Problem(422, problem_type::invalid_rows, "Invalid rows",
                  std::string(e.what()) + " (add ?on_invalid=skip to store the valid rows)",
                  {{"rows", row_issues_json(e.rows, format, array_key)}, {"row_count", e.rows.size()}});
  }
  const store::UploadResult& r = report.result;
  c.service.metrics.count_rows(kind, r.inserted);
  c.res.set_header("Location", "/v1/sites/" + site.id + "/uploads/" + std::to_string(r.upload_id));
  c.reply(201, {{"upload_id", r.upload_id},
                {"kind", kind},
                {"received", r.received},
                {"inserted", r.inserted},
                {"duplicates", r.duplicates},
                {"duplicate_rows", row_issues_json(r.duplicate_rows, format, array_key)},
                {"rejected", r.rejected.size()},
                {"rejected_rows", row_issues_json(r.rejected, format, array_key)},
                {"ignored_columns", report.ignored_columns}});
}

void post_observations(Context& c) {
  static const SensorTable sensors = SensorTable::defaults();
  upload(c, "observations", "observations", [&](const store::Site& site, app::UploadRequest request) {
    return app::upload_observations(c.service.store, site.id, std::move(request), sensors);
  });
}

void post_water_levels(Context& c) {
  upload(c, "water_levels", "water_levels", [&](const store::Site& site, app::UploadRequest request) {
    return app::upload_water_levels(c.service.store, site.id, std::move(request));
  });
}

void post_waves(Context& c) {
  upload(c, "waves", "waves", [&](const store::Site& site, app::UploadRequest request) {
    return app::upload_waves(c.service.store, site.id, std::move(request));
  });
}

void post_slopes(Context& c) {
  upload(c, "slopes", "slopes", [&](const store::Site& site, app::UploadRequest request) {
    return app::upload_slopes(c.service.store, site.id, std::move(request));
  });
}

// A whole constituent file (JSON): checked by the tide reader, idempotent by content hash.
void post_tide_constituents(Context& c) {
  const auto site = c.site_or_404(c.path_param(0));
  if (body_format_of(c.req.get_header_value("Content-Type")) != BodyFormat::json)
    throw Problem(415, problem_type::unsupported_media_type, "Unsupported media type",
                  "a constituent file is application/json");
  store::UploadMeta meta;
  meta.content_type = "application/json";
  meta.sha256 = store::sha256_hex(c.req.body);
  meta.uploaded_by = c.key_name;
  const auto r = refusing_bad_bodies(
      [&] { return app::upload_tide_constituents(c.service.store, site.id, c.req.body, meta); });
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

// One upload with the rows it refused, named as its report named them (CSV line or JSON pointer).
nlohmann::json upload_with_rows_json(const std::string& site, const store::UploadInfo& u) {
  nlohmann::json j = upload_json(site, u);
  const BodyFormat format = u.content_type == "application/json" ? BodyFormat::json : BodyFormat::csv;
  j["rejected_rows"] = row_issues_json(u.rejected_rows, format, u.kind);
  return j;
}

void get_upload(Context& c) {
  const auto site = c.site_or_404(c.path_param(0));
  const auto id = upload_id_param(c);
  auto u = c.service.store.upload(site.id, id);
  if (!u) throw Problem(404, problem_type::not_found, "Not found", "upload " + std::to_string(id) + " not found");
  c.reply(200, upload_with_rows_json(site.id, *u));
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
  c.reply(200, upload_with_rows_json(site.id, *c.service.store.upload(site.id, id)));
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
