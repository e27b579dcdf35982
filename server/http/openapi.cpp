#include "server/http/openapi.h"

#include <map>
#include <stdexcept>
#include <string>
#include <vector>

#include "server/http/problem.h"

namespace strandline::http {

namespace {

using nlohmann::json;

json ref(const std::string& name) { return {{"$ref", "#/components/schemas/" + name}}; }

json problem_response(const std::string& description) {
  return {{"description", description}, {"content", {{kProblemContentType, {{"schema", ref("Problem")}}}}}};
}

json json_response(const std::string& description, const std::string& schema) {
  return {{"description", description}, {"content", {{"application/json", {{"schema", ref(schema)}}}}}};
}

json path_param(const std::string& name, const std::string& description) {
  return {{"name", name}, {"in", "path"}, {"required", true}, {"description", description}, {"schema", {{"type", "string"}}}};
}

json query_param(const std::string& name, const std::string& description, json schema = {{"type", "string"}}) {
  return {{"name", name}, {"in", "query"}, {"required", false}, {"description", description}, {"schema", schema}};
}

json errors(std::initializer_list<int> codes) {
  json r = json::object();
  for (int code : codes) {
    static const std::map<int, std::string> text = {
        {304, "Not modified (If-None-Match matched the ETag)"},
        {400, "Bad request: malformed or too deeply nested JSON, a path or query parameter that is not text, conflicting framing headers"},
        {401, "Missing, unknown, revoked or expired API key"},
        {403, "Read-only key used for a write, or a site-scoped key outside its site"},
        {404, "Unknown site, transect, upload or run"},
        {409, "Conflict with stored data; nothing stored"},
        {413, "Body larger than the configured limit"},
        {415, "Unsupported Content-Type or a Content-Encoding other than identity"},
        {422, "Schema violation or invalid rows (every bad row listed); nothing stored"},
        {503, "Over the concurrent-request limit or run queue full; see Retry-After"},
        {507, "The store is full; nothing of the request was stored"}};
    r[std::to_string(code)] = code == 304 ? json{{"description", text.at(code)}} : problem_response(text.at(code));
  }
  return r;
}

json merge(json a, const json& b) {
  for (auto it = b.begin(); it != b.end(); ++it) a[it.key()] = it.value();
  return a;
}

json upload_body(const std::string& schema) {
  return {{"required", true},
          {"content",
           {{"text/csv", {{"schema", {{"type", "string"}}}}},
            {"application/json", {{"schema", ref(schema)}}}}}};
}

json upload_operation(const std::string& summary, const std::string& schema) {
  return {{"summary", summary},
          {"security", json::array({{{"bearer", json::array()}}})},
          {"parameters", json::array({path_param("site", "site id"),
                                      query_param("on_invalid", "reject (default): any bad row stores nothing; skip: store the valid rows",
                                                  {{"type", "string"}, {"enum", {"reject", "skip"}}})})},
          {"requestBody", upload_body(schema)},
          {"responses", merge({{"201", json_response("Stored (or reported as duplicates)", "UploadReport")}},
                              errors({400, 401, 403, 404, 409, 413, 415, 422, 503, 507}))}};
}

json rows_schema(const std::string& key, json properties, json required) {
  json row = {{"type", "object"}, {"properties", properties}, {"required", required}, {"additionalProperties", false}};
  return {{"oneOf", json::array({{{"type", "array"}, {"items", row}},
                                 {{"type", "object"},
                                  {"properties", {{key, {{"type", "array"}, {"items", row}}}}},
                                  {"required", {key}}}})}};
}

// One operationId per operation (the names code generators give their methods).
const std::map<std::string, std::string>& operation_ids() {
  static const std::map<std::string, std::string> ids = {
      {"get /healthz", "getHealth"},
      {"get /metrics", "getMetrics"},
      {"get /v1/openapi.json", "getOpenApiDocument"},
      {"post /v1/sites", "createSite"},
      {"get /v1/sites", "listSites"},
      {"get /v1/sites/{site}", "getSite"},
      {"put /v1/sites/{site}/transects", "replaceTransects"},
      {"get /v1/sites/{site}/transects", "getTransects"},
      {"post /v1/sites/{site}/observations", "uploadObservations"},
      {"post /v1/sites/{site}/water-levels", "uploadWaterLevels"},
      {"post /v1/sites/{site}/waves", "uploadWaves"},
      {"post /v1/sites/{site}/slopes", "uploadSlopes"},
      {"post /v1/sites/{site}/tide-constituents", "uploadTideConstituents"},
      {"post /v1/sites/{site}/shorelines", "uploadShorelines"},
      {"get /v1/sites/{site}/uploads", "listUploads"},
      {"get /v1/sites/{site}/uploads/{upload}", "getUpload"},
      {"delete /v1/sites/{site}/uploads/{upload}", "retractUpload"},
      {"post /v1/sites/{site}/purge", "purgeRetractedRows"},
      {"post /v1/sites/{site}/runs", "startRun"},
      {"get /v1/sites/{site}/runs", "listRuns"},
      {"get /v1/runs/{run}", "getRun"},
      {"get /v1/sites/{site}/transects/{transect}/series", "getSeries"},
      {"get /v1/sites/{site}/summary", "getSummary"},
      {"get /v1/sites/{site}/changes", "listChanges"},
      {"get /v1/sites/{site}/export", "exportSite"},
  };
  return ids;
}

json build() {
  const json str = {{"type", "string"}};
  const json num = {{"type", "number"}};
  const json num_or_null = {{"type", "number"}, {"nullable", true}};
  const json integer = {{"type", "integer"}};
  const json read_security = json::array({json::object(), {{"bearer", json::array()}}});
  const json write_security = json::array({{{"bearer", json::array()}}});
  const json site = path_param("site", "site id");
  const json paging = json::array({query_param("limit", "page size", integer), query_param("cursor", "next_cursor of the previous page")});

  json paths;
  paths["/healthz"]["get"] = {{"summary", "Liveness and store check"}, {"security", json::array({json::object()})},
                              {"responses", {{"200", json_response("Healthy", "Health")}, {"503", problem_response("Store unavailable")}}}};
  paths["/metrics"]["get"] = {{"summary", "Prometheus text exposition (requests, latencies, rows stored, runs)"},
                              {"security", json::array({json::object()})},
                              {"responses", {{"200", {{"description", "Metrics"}, {"content", {{"text/plain", {{"schema", str}}}}}}}}}};
  paths["/v1/openapi.json"]["get"] = {{"summary", "This document"}, {"security", json::array({json::object()})},
                                      {"responses", {{"200", {{"description", "OpenAPI 3.0 document"}}}}}};
  paths["/v1/sites"]["post"] = {{"summary", "Create a site"}, {"security", write_security},
                                {"requestBody", {{"required", true}, {"content", {{"application/json", {{"schema", ref("SiteCreate")}}}}}}},
                                {"responses", merge({{"201", json_response("Created", "Site")}}, errors({400, 401, 403, 409, 415, 422, 503, 507}))}};
  paths["/v1/sites"]["get"] = {{"summary", "List sites (paged by id)"}, {"security", read_security}, {"parameters", paging},
                               {"responses", merge({{"200", json_response("A page of sites", "SitePage")}}, errors({400, 401, 503}))}};
  paths["/v1/sites/{site}"]["get"] = {{"summary", "One site"}, {"security", read_security}, {"parameters", json::array({site})},
                                      {"responses", merge({{"200", json_response("The site", "Site")}}, errors({304, 401, 404, 503}))}};
  paths["/v1/sites/{site}/transects"]["put"] = {
      {"summary", "Replace the transects: GeoJSON FeatureCollection of lines (origin first) or origin points with azimuth_deg and length_m"},
      {"security", write_security}, {"parameters", json::array({site})},
      {"requestBody", {{"required", true}, {"content", {{"application/json", {{"schema", ref("FeatureCollection")}}}}}}},
      {"responses", merge({{"200", json_response("Transects stored (in the site CRS)", "FeatureCollection")}},
                          errors({400, 401, 403, 404, 413, 415, 422, 503, 507}))}};
  paths["/v1/sites/{site}/transects"]["get"] = {{"summary", "The transects of a site"}, {"security", read_security},
                                                {"parameters", json::array({site})},
                                                {"responses", merge({{"200", json_response("Transects", "FeatureCollection")}}, errors({304, 401, 404, 503}))}};
  paths["/v1/sites/{site}/observations"]["post"] =
      upload_operation("Upload raw positions (CSV batch columns or JSON rows); idempotent by (transect, image id)", "ObservationRows");
  paths["/v1/sites/{site}/water-levels"]["post"] = upload_operation("Upload a water-level record; idempotent by time", "WaterLevelRows");
  paths["/v1/sites/{site}/waves"]["post"] = upload_operation("Upload a wave record; idempotent by time", "WaveRows");
  paths["/v1/sites/{site}/slopes"]["post"] = upload_operation("Upload per-transect slopes; idempotent by transect", "SlopeRows");
  paths["/v1/sites/{site}/tide-constituents"]["post"] = {
      {"summary", "Upload a tide constituent file (JSON); idempotent by content hash"}, {"security", write_security},
      {"parameters", json::array({site})},
      {"requestBody", {{"required", true}, {"content", {{"application/json", {{"schema", {{"type", "object"}}}}}}}}},
      {"responses", merge({{"201", json_response("Stored", "UploadReport")}, {"200", json_response("Already stored (same content)", "UploadReport")}},
                          errors({400, 401, 403, 404, 413, 415, 422, 503, 507}))}};
  paths["/v1/sites/{site}/uploads"]["get"] = {{"summary", "Uploads, newest first (paged)"}, {"security", read_security},
                                              {"parameters", json::array({site, paging[0], paging[1]})},
                                              {"responses", merge({{"200", json_response("A page of uploads", "UploadPage")}}, errors({304, 400, 401, 404, 503}))}};
  const json upload_params = json::array({site, path_param("upload", "upload id")});
  paths["/v1/sites/{site}/uploads/{upload}"]["get"] = {{"summary", "One upload"}, {"security", read_security}, {"parameters", upload_params},
                                                       {"responses", merge({{"200", json_response("The upload", "Upload")}}, errors({304, 401, 404, 503}))}};
  paths["/v1/sites/{site}/uploads/{upload}"]["delete"] = {
      {"summary", "Retract an upload: its rows leave future runs; who, when and why are recorded; nothing is erased until a purge"},
      {"security", write_security},
      {"parameters", json::array({site, path_param("upload", "upload id"), query_param("reason", "why (or a JSON body {\"reason\": ...})")})},
      {"responses", merge({{"200", json_response("Retracted", "Upload")}}, errors({400, 401, 403, 404, 409, 415, 422, 503, 507}))}};
  paths["/v1/sites/{site}/purge"]["post"] = {{"summary", "Physically erase the rows of retracted uploads"}, {"security", write_security},
                                             {"parameters", json::array({site})},
                                             {"responses", merge({{"200", json_response("Rows erased", "PurgeReport")}}, errors({401, 403, 404, 503, 507}))}};
  paths["/v1/sites/{site}/runs"]["post"] = {
      {"summary", "Start a run (body: the batch --config JSON; empty = the site's processing defaults)"},
      {"security", write_security},
      {"parameters", json::array({site, query_param("transects", "changed (default): only transects with new inputs since the last finished run; all",
                                                    {{"type", "string"}, {"enum", {"changed", "all"}}})})},
      {"requestBody", {{"required", false}, {"content", {{"application/json", {{"schema", {{"type", "object"}}}}}}}}},
      {"responses", merge({{"202", json_response("Queued; poll the Location", "Run")}}, errors({400, 401, 403, 404, 415, 422, 503, 507}))}};
  paths["/v1/sites/{site}/runs"]["get"] = {{"summary", "Runs of a site, newest first (paged)"}, {"security", read_security},
                                           {"parameters", json::array({site, paging[0], paging[1]})},
                                           {"responses", merge({{"200", json_response("A page of runs", "RunPage")}}, errors({304, 400, 401, 404, 503}))}};
  paths["/v1/runs/{run}"]["get"] = {{"summary", "State, progress, timings and provenance of a run"}, {"security", read_security},
                                    {"parameters", json::array({path_param("run", "run id")})},
                                    {"responses", merge({{"200", json_response("The run", "Run")}}, errors({304, 401, 404, 503}))}};
  paths["/v1/sites/{site}/transects/{transect}/series"]["get"] = {
      {"summary", "Cleaned rows of one transect from the latest finished run or a given run"}, {"security", read_security},
      {"parameters", json::array({site, path_param("transect", "transect id"),
                                  query_param("run", "latest (default) or a run id"),
                                  query_param("format", "json (default) or csv", {{"type", "string"}, {"enum", {"json", "csv"}}})})},
      {"responses", merge({{"200", {{"description", "The series (ETag for revalidation). With Accept-Encoding gzip, the "
                                                    "gzip member stored by the run (Content-Encoding: gzip, ETag \"<etag>.gz\")"},
                                    {"headers", {{"ETag", {{"schema", str}}}, {"Vary", {{"schema", str}}},
                                                 {"Content-Encoding", {{"schema", str}}}, {"X-Run-Id", {{"schema", str}}}}},
                                    {"content", {{"application/json", {{"schema", ref("Series")}}}, {"text/csv", {{"schema", str}}}}}}}},
                          errors({304, 400, 401, 404, 503}))}};
  paths["/v1/sites/{site}/summary"]["get"] = {{"summary", "Latest per-transect summaries"}, {"security", read_security},
                                              {"parameters", json::array({site})},
                                              {"responses", merge({{"200", json_response("Summary", "Summary")}}, errors({304, 401, 404, 503}))}};
  paths["/v1/sites/{site}/changes"]["get"] = {
      {"summary", "Transects whose results changed since a cursor"}, {"security", read_security},
      {"parameters", json::array({site, query_param("since", "cursor returned by the previous call (0 = from the start)"),
                                  query_param("limit", "at most this many items", integer)})},
      {"responses", merge({{"200", json_response("Changes and the next cursor", "Changes")}}, errors({400, 401, 404, 503}))}};
  paths["/v1/sites/{site}/export"]["get"] = {
      {"summary", "Cleaned points and the transect layer with summaries: GeoPackage (site CRS, both layers) or GeoJSON (WGS 84 lon/lat, one layer)"},
      {"security", read_security},
      {"parameters", json::array({site,
                                  query_param("format", "gpkg (default) or geojson", {{"type", "string"}, {"enum", {"gpkg", "geojson"}}}),
                                  query_param("run", "latest (default: each transect's latest result) or a run id"),
                                  query_param("layer", "geojson only: points (default) or transects",
                                              {{"type", "string"}, {"enum", {"points", "transects"}}})})},
      {"responses", merge({{"200", {{"description", "The layers as a file"},
                                    {"content", {{"application/geopackage+sqlite3", {{"schema", {{"type", "string"}, {"format", "binary"}}}}},
                                                 {"application/geo+json", {{"schema", ref("FeatureCollection")}}}}}}}},
                          errors({400, 401, 404, 503}))}};
  {
    json shorelines = upload_operation(
        "Upload shoreline polylines (GeoJSON; attributes time, sensor, image_id[, cloud_fraction, georef_rmse_m]); "
        "intersected with the site's transects and stored as observations, idempotent by (transect, image id)",
        "FeatureCollection");
    shorelines["requestBody"] = {{"required", true},
                                 {"content", {{"application/geo+json", {{"schema", ref("FeatureCollection")}}},
                                              {"application/json", {{"schema", ref("FeatureCollection")}}}}}};
    paths["/v1/sites/{site}/shorelines"]["post"] = shorelines;
  }

  // Every operation named: a route added without a name fails here (and in the unit test).
  for (auto& [path, operations] : paths.items())
    for (auto& [method, operation] : operations.items()) {
      const auto it = operation_ids().find(method + " " + path);
      if (it == operation_ids().end()) throw std::logic_error("OpenAPI: no operationId for " + method + " " + path);
      operation["operationId"] = it->second;
    }

  json schemas;
  schemas["Problem"] = {{"type", "object"},
                        {"description", "RFC 7807 problem details; `type` is stable per kind of error; uploads add `rows`"},
                        {"properties", {{"type", str}, {"title", str}, {"status", integer}, {"detail", str}, {"instance", str},
                                        {"pointer", str}, {"rows", {{"type", "array"}, {"items", ref("RowIssue")}}}}},
                        {"required", {"type", "title", "status", "detail"}}};
  schemas["RowIssue"] = {{"type", "object"},
                         {"properties", {{"line", integer}, {"pointer", str}, {"key", str}, {"field", str}, {"value", str}, {"reason", str}}},
                         {"required", {"reason"}}};
  schemas["Health"] = {{"type", "object"}, {"properties", {{"status", str}, {"version", str}, {"runs_active", integer}}}};
  schemas["SiteCreate"] = {{"type", "object"},
                           {"properties", {{"id", str}, {"name", str}, {"crs", str}, {"reference_elevation_m", num},
                                           {"default_slope", num_or_null}, {"processing_defaults", {{"type", "object"}}}}},
                           {"required", {"id", "name", "crs"}}, {"additionalProperties", false}};
  schemas["Site"] = merge(schemas["SiteCreate"], {{"properties", merge(schemas["SiteCreate"]["properties"], {{"created_at", str}})}});
  schemas["SitePage"] = {{"type", "object"}, {"properties", {{"items", {{"type", "array"}, {"items", ref("Site")}}}, {"next_cursor", {{"type", "string"}, {"nullable", true}}}}}};
  schemas["FeatureCollection"] = {{"type", "object"}, {"description", "GeoJSON (RFC 7946) FeatureCollection"},
                                  {"properties", {{"type", {{"type", "string"}, {"enum", {"FeatureCollection"}}}}, {"features", {{"type", "array"}, {"items", {{"type", "object"}}}}}}},
                                  {"required", {"type", "features"}}};
  schemas["ObservationRows"] = rows_schema("observations",
                                           {{"transect_id", str}, {"time", str}, {"chainage_m", num}, {"sensor", str}, {"image_id", str},
                                            {"cloud_fraction", num_or_null}, {"georef_rmse_m", num_or_null}},
                                           {"transect_id", "time", "chainage_m", "sensor", "image_id"});
  schemas["WaterLevelRows"] = rows_schema("water_levels", {{"time", str}, {"level_m", num}}, {"time", "level_m"});
  schemas["WaveRows"] = rows_schema("waves", {{"time", str}, {"hs_m", num}, {"tp_s", num}, {"dir_deg", num_or_null}, {"depth_m", num_or_null}},
                                    {"time", "hs_m", "tp_s"});
  schemas["SlopeRows"] = rows_schema("slopes", {{"transect_id", str}, {"slope", num}, {"slope_sigma", num_or_null}}, {"transect_id", "slope"});
  schemas["UploadReport"] = {{"type", "object"},
                             {"properties", {{"upload_id", integer}, {"kind", str}, {"received", integer}, {"inserted", integer},
                                             {"duplicates", integer}, {"duplicate_rows", {{"type", "array"}, {"items", ref("RowIssue")}}},
                                             {"rejected", integer}, {"rejected_rows", {{"type", "array"}, {"items", ref("RowIssue")}}}}}};
  schemas["Upload"] = {{"type", "object"},
                       {"properties", {{"upload_id", integer}, {"kind", str}, {"received_at", str}, {"uploaded_by", str},
                                       {"content_type", str}, {"sha256", str}, {"received", integer}, {"inserted", integer},
                                       {"duplicates", integer}, {"rejected", integer},
                                       {"retraction", {{"type", "object"}, {"nullable", true}, {"properties", {{"at", str}, {"by", str}, {"reason", str}}}}},
                                       {"purged_at", {{"type", "string"}, {"nullable", true}}}, {"href", str},
                                       {"rejected_rows", {{"type", "array"}, {"items", {{"type", "object"}}}}}}}};
  schemas["UploadPage"] = {{"type", "object"}, {"properties", {{"items", {{"type", "array"}, {"items", ref("Upload")}}}, {"next_cursor", {{"type", "string"}, {"nullable", true}}}}}};
  schemas["PurgeReport"] = {{"type", "object"}, {"properties", {{"site", str}, {"rows_erased", integer}}}};
  schemas["Run"] = {{"type", "object"},
                    {"properties", {{"run_id", integer}, {"site", str},
                                    {"state", {{"type", "string"}, {"enum", {"queued", "running", "done", "failed"}}}},
                                    {"reason", {{"type", "string"}, {"nullable", true}}}, {"scope", str},
                                    {"progress", {{"type", "object"}, {"properties", {{"transects_done", integer}, {"transects_total", integer},
                                                                                 {"stage", str}, {"stage_index", integer}, {"stage_count", integer},
                                                                                 {"fraction", {{"type", "number"}, {"nullable", true}}}}}}},
                                    {"timings", {{"type", "object"},
                                                 {"properties", {{"created_at", str},
                                                                 {"started_at", {{"type", "string"}, {"nullable", true}}},
                                                                 {"finished_at", {{"type", "string"}, {"nullable", true}}}}}}},
                                    {"requested_by", str}, {"options", {{"type", "object"}}}, {"provenance", {{"type", "object"}}}, {"href", str}}}};
  schemas["RunPage"] = {{"type", "object"}, {"properties", {{"items", {{"type", "array"}, {"items", ref("Run")}}}, {"next_cursor", {{"type", "string"}, {"nullable", true}}}}}};
  schemas["Series"] = {{"type", "object"},
                       {"properties", {{"site", str}, {"transect_id", str}, {"run_id", integer},
                                       {"rows", {{"type", "array"}, {"items", {{"type", "object"}, {"description", "cleaned row (formats reference)"}}}}}}}};
  schemas["Summary"] = {{"type", "object"},
                        {"properties", {{"site", str}, {"latest_run", {{"type", "integer"}, {"nullable", true}}},
                                        {"transects", {{"type", "array"}, {"items", {{"type", "object"}}}}},
                                        {"sensor_offsets", {{"type", "object"}, {"nullable", true},
                                                            {"description", "site-wide sensor offsets of the latest run"}}},
                                        {"sensor_noise", {{"type", "array"}, {"nullable", true}, {"items", {{"type", "object"}}}}},
                                        {"cautions", {{"type", "array"}, {"items", str}}}}}};
  schemas["Changes"] = {{"type", "object"},
                        {"properties", {{"site", str}, {"cursor", str}, {"more", {{"type", "boolean"}}},
                                        {"items", {{"type", "array"}, {"items", {{"type", "object"}, {"properties", {{"transect_id", str}, {"run_id", integer}, {"etag", str}, {"series", str}}}}}}}}}};

  return {{"openapi", "3.0.3"},
          {"info", {{"title", "Strandline service"}, {"version", STRANDLINE_VERSION},
                    {"description", "Raw satellite-derived shoreline positions in; corrected, quality-controlled series out."}}},
          {"servers", json::array({{{"url", "/"}, {"description", "the host serving this document"}}})},
          {"paths", paths},
          {"components", {{"schemas", schemas}, {"securitySchemes", {{"bearer", {{"type", "http"}, {"scheme", "bearer"}}}}}}}};
}

}  // namespace

const nlohmann::json& openapi_document() {
  static const nlohmann::json document = build();
  return document;
}

}  // namespace strandline::http
