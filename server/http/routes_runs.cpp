// Runs and their results: series, summary, changes.
#include "corrections/core/errors.h"
#include "qc/cautions.h"
#include "server/io/cleaned_rows.h"
#include "server/io/gzip_document.h"
#include "server/app/run_executor.h"
#include "server/http/service_internal.h"
#include "server/store/api_keys.h"

namespace strandline::http {

namespace {

std::int64_t positive_id(const std::string& text, const std::string& what) {
  std::size_t used = 0;
  std::int64_t id = 0;
  try {
    id = std::stoll(text, &used);
  } catch (...) {
  }
  if (used != text.size() || id <= 0)
    throw Problem(404, problem_type::not_found, "Not found", what + " \"" + text + "\" not found");
  return id;
}

nlohmann::json run_json(Context& c, const store::RunInfo& r, bool with_provenance) {
  const app::RunStatus status = app::run_status(r, c.service.runs.progress(r.id));
  nlohmann::json j = {{"run_id", r.id},
                      {"site", r.site_id},
                      {"state", status.state},
                      {"reason", r.state == "failed" ? nlohmann::json(r.reason) : nlohmann::json()},
                      {"scope", r.scope},
                      {"progress", status.progress},
                      {"timings",
                       {{"created_at", r.created_at},
                        {"started_at", r.started_at.empty() ? nlohmann::json() : nlohmann::json(r.started_at)},
                        {"finished_at", r.finished_at.empty() ? nlohmann::json() : nlohmann::json(r.finished_at)}}},
                      {"requested_by", r.requested_by},
                      {"options", r.options},
                      {"href", "/v1/runs/" + std::to_string(r.id)}};
  if (with_provenance) j["provenance"] = r.provenance;
  return j;
}

void start_run(Context& c) {
  const auto site = c.site_or_404(c.path_param(0));
  nlohmann::json options = nlohmann::json::object();
  if (!c.req.body.empty()) options = c.json_body();
  if (!options.is_object()) throw Problem(422, problem_type::invalid_config, "Invalid run options",
                                          "expected a JSON object (the batch --config shape)", {{"pointer", ""}});
  app::run_config_for(site, options);  // ConfigError -> 422 naming the pointer, before anything is queued
  const std::string scope = c.query("transects").value_or("changed");
  if (scope != "changed" && scope != "all")
    throw Problem(400, problem_type::bad_request, "Bad query parameter", "transects must be \"changed\" or \"all\"",
                  {{"parameter", "transects"}});
  store::RunInfo run;
  run.site_id = site.id;
  run.options = options;
  run.scope = scope;
  run.input_seq = c.service.store.input_seq(site.id);
  run.requested_by = c.key_name;
  if (c.service.runs.active() >= c.service.options.max_queued_runs) {
    c.res.set_header("Retry-After", std::to_string(c.service.options.retry_after_s * 10));
    throw Problem(503, problem_type::overloaded, "Run queue full", "too many runs queued; retry later");
  }
  run.id = c.service.store.create_run(run);
  if (!c.service.runs.enqueue(run.id)) {
    c.service.store.mark_run_failed(run.id, "the run queue was full");
    c.res.set_header("Retry-After", std::to_string(c.service.options.retry_after_s * 10));
    throw Problem(503, problem_type::overloaded, "Run queue full", "too many runs queued; retry later");
  }
  c.res.set_header("Location", "/v1/runs/" + std::to_string(run.id));
  c.reply(202, run_json(c, *c.service.store.run(run.id), false));
}

void get_run(Context& c) {
  const auto id = positive_id(c.path_param(0), "run");
  auto run = c.service.store.run(id);
  if (!run) throw Problem(404, problem_type::not_found, "Not found", "run " + std::to_string(id) + " not found");
  c.reply(200, run_json(c, *run, true));
}

void list_runs(Context& c) {
  const auto site = c.site_or_404(c.path_param(0));
  const auto limit = c.query_integer("limit", 50, 1000);
  const auto before = c.query_integer("cursor", 0, INT64_MAX);
  auto runs = c.service.store.runs(site.id, before, static_cast<int>(limit));
  nlohmann::json items = nlohmann::json::array();
  for (const auto& r : runs) items.push_back(run_json(c, r, false));
  const bool full = static_cast<std::int64_t>(runs.size()) == limit && limit > 0;
  c.reply(200, {{"items", items}, {"next_cursor", full ? nlohmann::json(std::to_string(runs.back().id)) : nlohmann::json()}});
}

void get_series(Context& c) {
  const auto site = c.site_or_404(c.path_param(0));
  const std::string transect = c.path_param(1);
  const std::string format = c.query("format").value_or("json");
  if (format != "json" && format != "csv")
    throw Problem(400, problem_type::bad_request, "Bad query parameter", "format must be \"json\" or \"csv\"",
                  {{"parameter", "format"}});
  const std::string run_text = c.query("run").value_or("latest");
  const std::int64_t run_id = run_text == "latest" ? 0 : positive_id(run_text, "run");
  const bool gzip = accepts_gzip(c.req.get_header_value("Accept-Encoding"));
  const auto head = c.service.store.result(site.id, transect, run_id, {false, false});
  if (!head) {
    bool defined = false;
    for (const auto& t : c.service.store.transects(site.id)) defined = defined || t.id == transect;
    const std::string what = !defined ? "transect \"" + transect + "\" not found in site \"" + site.id + "\""
                             : run_id ? "run " + run_text + " has no result for transect \"" + transect + "\""
                                      : "transect \"" + transect + "\" has no finished run yet";
    throw Problem(404, problem_type::not_found, "Not found", what);
  }
  c.res.set_header("X-Run-Id", std::to_string(head->run_id));
  const std::string etag = head->sha256 + "-" + format;
  if (not_modified(c, etag)) return;
  auto document = series_document(c.service, site.id, transect, head->run_id, format, gzip);
  reply_document(c, etag, std::move(document), format == "csv" ? "text/csv" : "application/json", gzip);
}

void get_summary(Context& c) {
  const auto site = c.site_or_404(c.path_param(0));
  nlohmann::json transects = nlohmann::json::array();
  std::string hashes;
  for (const auto& r : c.service.store.latest_summaries(site.id)) {
    transects.push_back({{"transect_id", r.transect_id}, {"run_id", r.run_id}, {"summary", r.summary}});
    hashes += r.sha256;
  }
  const auto latest = c.service.store.latest_done_run(site.id);
  nlohmann::json body = {{"site", site.id},
                         {"latest_run", latest ? nlohmann::json(latest->id) : nlohmann::json()},
                         {"transects", transects},
                         {"sensor_offsets", nullptr},
                         {"sensor_noise", nullptr},
                         {"cautions", standard_cautions()}};
  // The site-wide parts come from the latest finished run (over the transects it processed).
  if (latest && latest->provenance.contains("site_summary"))
    for (const char* key : {"sensor_offsets", "sensor_noise"}) body[key] = latest->provenance["site_summary"].value(key, nlohmann::json());
  std::string text = body.dump();
  // The tag is taken before the text is handed over (an argument moved from
  // in the same call would leave the hash of whatever remained).
  const std::string etag = store::sha256_hex(text).substr(0, 32);
  reply_with_etag(c, etag, std::move(text), "application/json");
}

// The cursor is the last change sequence number seen: opaque to clients.
void get_changes(Context& c) {
  const auto site = c.site_or_404(c.path_param(0));
  const auto since = c.query_integer("since", 0, INT64_MAX);
  const auto limit = c.query_integer("limit", 1000, 10000);
  auto changes = c.service.store.changes(site.id, since, static_cast<int>(limit));
  nlohmann::json items = nlohmann::json::array();
  std::int64_t cursor = since;
  for (const auto& r : changes) {
    items.push_back({{"transect_id", r.transect_id},
                     {"run_id", r.run_id},
                     {"etag", "\"" + r.sha256 + "-json\""},
                     {"series", "/v1/sites/" + site.id + "/transects/" + r.transect_id + "/series?run=" +
                                    std::to_string(r.run_id)}});
    cursor = r.seq;
  }
  const bool more = static_cast<std::int64_t>(changes.size()) == limit;
  c.reply(200, {{"site", site.id}, {"items", items}, {"cursor", std::to_string(cursor)}, {"more", more}});
}

}  // namespace

RenderedSeriesCache::Document series_document(Service::Impl& service, const std::string& site_id,
                                              const std::string& transect, std::int64_t run_id,
                                              const std::string& format, bool gzip) {
  // A run's result never changes: the rendered reply is cached by run, transect and form.
  const std::string key = std::to_string(run_id) + "\n" + site_id + "\n" + transect + "\n" + format +
                          (gzip ? "\ngzip" : "");
  return service.series_cache.get_or_render(key, [&] {
    auto result = service.store.result(site_id, transect, run_id, {true, false});
    if (!result) throw Problem(404, problem_type::not_found, "Not found", "the result was removed");
    std::string text = format == "csv" ? cleaned_rows_csv(result->rows)
                                       : nlohmann::json({{"site", site_id},
                                                         {"transect_id", transect},
                                                         {"run_id", result->run_id},
                                                         {"rows", cleaned_rows_json(result->rows)}})
                                             .dump();
    return gzip ? gzip_compress(text) : text;
  });
}

void warm_series_cache(Service::Impl& service, const app::RunManager::RunEnded& run) {
  // The gzip documents a browser asks for (~0.1 MB a transect), rendered on the
  // run's worker thread (lower priority) so that readers after a run do not wait
  // for them, while they fit well within the cache. Warming the identity forms
  // too (~1 MB each) was measured: the renders took the CPU the reads needed
  // (gzip p99 21 -> 151 ms), so those are rendered on first read.
  constexpr std::size_t kMaxWarmTransects = 200;
  if (run.state != "done" || run.transects.size() > kMaxWarmTransects) return;
  for (const auto& transect : run.transects)
    for (const char* format : {"json", "csv"}) series_document(service, run.site_id, transect, run.run_id, format, true);
}

std::vector<Route> run_routes() {
  return {
      {{"POST", "/v1/sites/{site}/runs"}, Access::write, start_run},
      {{"GET", "/v1/sites/{site}/runs"}, Access::read, list_runs},
      {{"GET", "/v1/runs/{run}"}, Access::read, get_run},
      {{"GET", "/v1/sites/{site}/transects/{transect}/series"}, Access::read, get_series},
      {{"GET", "/v1/sites/{site}/summary"}, Access::read, get_summary},
      {{"GET", "/v1/sites/{site}/changes"}, Access::read, get_changes},
  };
}

}  // namespace strandline::http
