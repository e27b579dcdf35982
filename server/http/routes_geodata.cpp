// Geodata over HTTP: a run's cleaned points and per-transect summaries as a
// GeoPackage or GeoJSON download, and shoreline polylines uploaded as GeoJSON,
// intersected with the site's transects and stored as observation rows. The
// geometry work is the geodata library's (server/geo); GDAL reads and writes
// files, so bodies pass through a private temporary folder.
#include <stdlib.h>

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iomanip>
#include <regex>
#include <set>
#include <sstream>

#include "corrections/core/errors.h"
#include "corrections/core/sensor_table.h"
#include "corrections/core/time_utc.h"
#include "server/geo/crs.h"
#include "server/app/exports.h"
#include "server/geo/plain_table_io.h"
#include "server/geo/result_writer.h"
#include "server/geo/shoreline_intersect.h"
#include "server/http/service_internal.h"
#include "server/app/uploads.h"
#include "server/http/upload_rows.h"
#include "server/store/api_keys.h"
#include "corrections/core/json_text.h"

namespace strandline::http {

namespace {

namespace fs = std::filesystem;

// A folder only this request uses, removed with everything in it.
class ScratchFolder {
 public:
  ScratchFolder() {
    std::string pattern = (fs::temp_directory_path() / "strandline-geodata-XXXXXX").string();
    if (!mkdtemp(pattern.data())) throw std::runtime_error("cannot create a temporary folder");
    path_ = pattern;
  }
  ~ScratchFolder() {
    std::error_code ignored;
    fs::remove_all(path_, ignored);
  }
  ScratchFolder(const ScratchFolder&) = delete;
  ScratchFolder& operator=(const ScratchFolder&) = delete;
  std::string file(const std::string& name) const { return (path_ / name).string(); }

 private:
  fs::path path_;
};

void write_text(const std::string& path, const std::string& text) {
  std::ofstream out(path, std::ios::binary);
  out << text;
  if (!out) throw std::runtime_error("cannot write " + path);
}

std::string read_bytes(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream out;
  out << in.rdbuf();
  return out.str();
}

// Library messages name the scratch file; the client knows it as the body.
std::string without_path(std::string message, const std::string& path, const std::string& name) {
  for (auto at = message.find(path); at != std::string::npos; at = message.find(path, at + name.size()))
    message.replace(at, path.size(), name);
  return message;
}

// The stored transects with the site CRS as the work CRS.
geo::TransectSet site_transects(Context& c, const store::Site& site) {
  geo::TransectSet set;
  const geo::CrsInfo crs = geo::parse_crs(site.crs, "site " + site.id + " crs");
  set.crs = {crs.definition, crs.name, crs.authority, "site CRS"};
  set.source = "site " + site.id;
  std::int64_t fid = 0;
  for (auto& t : c.service.store.transects(site.id)) set.transects.push_back({t.id, t.geometry, fid++});
  return set;
}

struct ExportRequest {
  geo::GeoFormat format = geo::GeoFormat::geopackage;
  bool transect_layer = false;  // GeoJSON: the transects instead of the points
  std::int64_t run_id = 0;      // 0: each transect's latest result
};

ExportRequest export_request(const Context& c) {
  ExportRequest r;
  const auto format = c.query("format").value_or("gpkg");
  if (format == "geojson") r.format = geo::GeoFormat::geojson;
  else if (format != "gpkg")
    throw Problem(400, problem_type::bad_request, "Bad query parameter", "format must be \"gpkg\" or \"geojson\"",
                  {{"parameter", "format"}});
  const auto layer = c.query("layer").value_or("points");
  if (layer == "transects") r.transect_layer = true;
  else if (layer != "points")
    throw Problem(400, problem_type::bad_request, "Bad query parameter", "layer must be \"points\" or \"transects\"",
                  {{"parameter", "layer"}});
  if (r.transect_layer && r.format != geo::GeoFormat::geojson)
    throw Problem(400, problem_type::bad_request, "Bad query parameter",
                  "layer applies to format=geojson only (a GeoPackage holds both layers)", {{"parameter", "layer"}});
  const auto run = c.query("run").value_or("latest");
  if (run != "latest") {
    std::size_t used = 0;
    try {
      r.run_id = std::stoll(run, &used);
    } catch (...) {
    }
    if (used != run.size() || r.run_id <= 0)
      throw Problem(400, problem_type::bad_request, "Bad query parameter", "run must be \"latest\" or a run id",
                    {{"parameter", "run"}});
  }
  return r;
}

void get_export(Context& c) {
  const auto site = c.site_or_404(c.path_param(0));
  const ExportRequest request = export_request(c);
  if (request.run_id) {
    const auto run = c.service.store.run(request.run_id);
    if (!run || run->site_id != site.id)
      throw Problem(404, problem_type::not_found, "Not found",
                    "run " + std::to_string(request.run_id) + " not found for site \"" + site.id + "\"");
    if (run->state != "done")
      throw Problem(404, problem_type::not_found, "No result",
                    "run " + std::to_string(request.run_id) + " is " + run->state + ", not done");
  } else if (!c.service.store.latest_done_run(site.id)) {
    throw Problem(404, problem_type::not_found, "No result", "site \"" + site.id + "\" has no finished run");
  }

  const geo::TransectSet transects = site_transects(c, site);
  const ScratchFolder scratch;
  geo::PlainTable points;
  nlohmann::json summary = {{"transects", nlohmann::json::array()}};
  std::int64_t newest_run = 0;
  for (const auto& t : transects.transects) {
    const auto result = c.service.store.result(site.id, t.id, request.run_id, {true, true});
    if (!result) continue;
    newest_run = std::max(newest_run, result->run_id);
    app::append_result_points(points, result->rows);
    nlohmann::json s = result->summary;
    if (s.is_object()) {
      s["transect_id"] = t.id;
      s["run_id"] = result->run_id;
      summary["transects"].push_back(std::move(s));
    }
  }
  if (points.columns.empty() && summary["transects"].empty())
    throw Problem(404, problem_type::not_found, "No result",
                  request.run_id ? "run " + std::to_string(request.run_id) + " has no transect results"
                                 : "site \"" + site.id + "\" has no transect results");

  const bool gpkg = request.format == geo::GeoFormat::geopackage;
  const std::string out = scratch.file(gpkg ? "export.gpkg" : "export.geojson");
  const geo::PlainTable per_transect = geo::summary_plain_table(summary, "summary");
  geo::GeoLayers layers;
  layers.points = points.columns.empty() ? nullptr : &points;
  layers.transect_summary = &per_transect;
  geo::write_geo_layers(out, transects, layers);

  std::string file = out;
  if (!gpkg && request.transect_layer && layers.points) file = geo::geojson_transects_path(out);
  else if (!gpkg && !request.transect_layer && !layers.points)
    throw Problem(404, problem_type::not_found, "No result", "the run has no cleaned points (try layer=transects)");
  const std::string name = site.id + (request.run_id ? "-run" + std::to_string(request.run_id) : "-latest") +
                           (request.transect_layer ? "-transects" : "") + (gpkg ? ".gpkg" : ".geojson");
  c.res.set_header("Content-Disposition", "attachment; filename=\"" + name + "\"");
  c.res.set_header("X-Run-Id", std::to_string(request.run_id ? request.run_id : newest_run));
  c.reply_text(200, read_bytes(file), gpkg ? "application/geopackage+sqlite3" : "application/geo+json");
}

std::string media_type_of(const std::string& header) {
  std::string t = header.substr(0, header.find(';'));
  while (!t.empty() && t.back() == ' ') t.pop_back();
  for (auto& ch : t) ch = static_cast<char>(std::tolower(static_cast<unsigned char>(ch)));
  return t;
}

// The FeatureCollection as GDAL will read it, with feature ids dropped so that
// GDAL numbers features by position and its messages name the feature index.
std::string shoreline_collection(const Context& c) {
  const std::string type = media_type_of(c.req.get_header_value("Content-Type"));
  if (type != "application/geo+json" && type != "application/json")
    throw Problem(415, problem_type::unsupported_media_type, "Unsupported media type",
                  "expected Content-Type application/geo+json or application/json, got \"" +
                      c.req.get_header_value("Content-Type") + "\"");
  nlohmann::json body;
  try {
    body = parse_json_text(c.req.body, "body");
  } catch (const JsonTextError& e) {
    throw Problem(400, problem_type::bad_json, "Malformed JSON", e.what());
  }
  if (!body.is_object() || body.value("type", "") != "FeatureCollection" || !body.contains("features") ||
      !body["features"].is_array())
    throw Problem(422, problem_type::invalid_body, "Invalid shorelines", "expected a GeoJSON FeatureCollection",
                  {{"pointer", "/type"}});
  if (body["features"].empty())
    throw Problem(422, problem_type::invalid_body, "Invalid shorelines", "the FeatureCollection has no features",
                  {{"pointer", "/features"}});
  for (std::size_t i = 0; i < body["features"].size(); ++i) {
    auto& f = body["features"][i];
    if (!f.is_object())
      throw Problem(422, problem_type::invalid_body, "Invalid shorelines", "feature " + std::to_string(i) + " is not an object",
                    {{"pointer", "/features/" + std::to_string(i)}});
    f.erase("id");
  }
  return body.dump();
}

std::string number_text(double v) {
  if (!known(v)) return "";
  std::ostringstream out;
  out << std::setprecision(15) << v;
  return out.str();
}

// The crossings as an observations upload body (the observation CSV columns).
std::string observation_csv(const std::vector<geo::CrossingRow>& rows) {
  std::ostringstream out;
  out << "transect_id,time,chainage_m,sensor,image_id,cloud_fraction,georef_rmse_m\n";
  for (const auto& r : rows)
    out << r.transect_id << ',' << format_time_utc(r.time_s) << ',' << number_text(r.chainage_m) << ',' << r.sensor
        << ',' << r.image_id << ',' << number_text(r.cloud_fraction) << ',' << number_text(r.georef_rmse_m) << '\n';
  return out.str();
}

// A row issue of the derived rows, with the crossing it came from.
nlohmann::json crossing_issue(const store::RowIssue& issue, const std::vector<geo::CrossingRow>& rows) {
  nlohmann::json j = row_issue_json(issue, BodyFormat::csv, "observations");
  const auto index = issue.line - 2;  // CSV line 2 is crossing 0
  j.erase("line");
  j["crossing"] = index;
  if (index >= 0 && index < static_cast<std::int64_t>(rows.size())) {
    j["transect_id"] = rows[index].transect_id;
    j["image_id"] = rows[index].image_id;
  }
  return j;
}

nlohmann::json crossing_issues(const std::vector<store::RowIssue>& issues, const std::vector<geo::CrossingRow>& rows) {
  nlohmann::json out = nlohmann::json::array();
  for (const auto& i : issues) out.push_back(crossing_issue(i, rows));
  return out;
}

void post_shorelines(Context& c) {
  const auto site = c.site_or_404(c.path_param(0));
  const auto mode = c.query("on_invalid").value_or("reject");
  if (mode != "reject" && mode != "skip")
    throw Problem(400, problem_type::bad_request, "Bad query parameter", "on_invalid must be \"reject\" or \"skip\"",
                  {{"parameter", "on_invalid"}});
  const std::string collection = shoreline_collection(c);
  const geo::TransectSet transects = site_transects(c, site);
  if (transects.transects.empty())
    throw Problem(422, problem_type::invalid_body, "No transects", "site \"" + site.id + "\" has no transects to intersect");

  const ScratchFolder scratch;
  const std::string path = scratch.file("shorelines.geojson");
  write_text(path, collection);
  geo::IntersectResult crossings;
  try {
    geo::IntersectOptions options;
    options.drivers = {"GeoJSON"};
    crossings = geo::intersect_shorelines(path, transects, options);
  } catch (const InputError& e) {
    // GDAL numbers the features of a GeoJSON body from 0 (ids were dropped), so FID n is /features/n.
    const std::string message = without_path(e.what(), path, "body");
    std::smatch fid;
    nlohmann::json extra = nlohmann::json::object();
    if (std::regex_search(message, fid, std::regex("FID ([0-9]+)"))) extra["pointer"] = "/features/" + fid[1].str();
    throw Problem(422, problem_type::invalid_body, "Invalid shorelines", message, extra);
  }

  // From here on the rows take the observation upload path: the same rules,
  // then one store transaction.
  app::UploadRequest request;
  const std::string body = observation_csv(crossings.rows);
  request.body = body;
  request.format = BodyFormat::csv;
  request.on_invalid = mode == "skip" ? app::OnInvalid::skip : app::OnInvalid::reject;
  request.meta.content_type = "application/geo+json";
  request.meta.sha256 = store::sha256_hex(c.req.body);
  request.meta.uploaded_by = c.key_name;
  static const SensorTable sensors = SensorTable::defaults();
  store::UploadResult r;
  try {
    r = app::upload_observations(c.service.store, site.id, std::move(request), sensors).result;
  } catch (const app::InvalidRows& e) {
    throw Problem(422, problem_type::invalid_rows, "Invalid rows",
                  std::to_string(e.rows.size()) + " of " + std::to_string(e.received) +
                      " crossing rows are invalid; nothing was stored (add ?on_invalid=skip to store the valid rows)",
                  {{"rows", crossing_issues(e.rows, crossings.rows)}});
  } catch (const store::ConflictError& e) {
    throw Problem(409, problem_type::conflict, "Conflict",
                  "crossings contradict stored observations (same transect and image id, other values); nothing was stored",
                  {{"rows", crossing_issues(e.rows, crossings.rows)}});
  }
  c.service.metrics.count_rows("observations", r.inserted);
  const auto& report = crossings.report;
  c.res.set_header("Location", "/v1/sites/" + site.id + "/uploads/" + std::to_string(r.upload_id));
  c.reply(201, {{"upload_id", r.upload_id},
                {"kind", "observations"},
                {"received", r.received},
                {"inserted", r.inserted},
                {"duplicates", r.duplicates},
                {"duplicate_rows", crossing_issues(r.duplicate_rows, crossings.rows)},
                {"rejected", r.rejected.size()},
                {"rejected_rows", crossing_issues(r.rejected, crossings.rows)},
                {"intersection",
                 {{"features", report.features},
                  {"images", report.images},
                  {"crossing_rows", report.rows},
                  {"ambiguous_pairs", report.ambiguous_pairs},
                  {"uncrossed_pairs", report.uncrossed_pairs},
                  {"never_crossed", report.never_crossed},
                  {"shoreline_crs", report.shoreline_crs}}}});
}

}  // namespace

std::vector<Route> geodata_routes() {
  return {
      {{"GET", "/v1/sites/{site}/export"}, Access::read, get_export},
      {{"POST", "/v1/sites/{site}/shorelines"}, Access::write, post_shorelines},
  };
}

}  // namespace strandline::http
