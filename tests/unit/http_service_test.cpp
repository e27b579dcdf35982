// The HTTP service end to end: a real server on a loopback port, a real
// client, every status code the service promises.
#include <gtest/gtest.h>
#include <unistd.h>

#include <atomic>
#include <filesystem>
#include <set>
#include <sstream>
#include <thread>

#include <httplib.h>
#include <nlohmann/json.hpp>

#include "corrections/core/time_utc.h"
#include "server/io/gzip_document.h"
#include "server/app/run_manager.h"
#include "server/http/service.h"
#include "server/store/api_keys.h"
#include "tests/unit/http_fixture.h"

using namespace strandline;
using nlohmann::json;

using namespace strandline::testing_http;

namespace {

TEST_F(HttpService, HealthMetricsAndOpenApiCoverEveryRoute) {
  start();
  auto h = client().Get("/healthz");
  ASSERT_TRUE(h);
  EXPECT_EQ(h->status, 200);
  EXPECT_EQ(json::parse(h->body)["status"], "ok");
  auto doc = client().Get("/v1/openapi.json");
  ASSERT_TRUE(doc && doc->status == 200);
  const auto openapi = json::parse(doc->body);
  EXPECT_EQ(openapi["openapi"].get<std::string>().substr(0, 2), "3.");
  for (const auto& route : http::Service::routes()) {
    std::string method = route.method;
    for (auto& ch : method) ch = static_cast<char>(std::tolower(ch));
    EXPECT_TRUE(openapi["paths"].contains(route.path) && openapi["paths"][route.path].contains(method))
        << route.method << " " << route.path << " is not in the OpenAPI document";
  }
  // Every operation has its own operationId; the document names its server; a queued run's
  // timings (not started, not finished) are allowed by the schema (they were not).
  std::set<std::string> ids;
  std::size_t operations = 0;
  for (const auto& [path, methods] : openapi["paths"].items())
    for (const auto& [method, operation] : methods.items()) {
      ++operations;
      ASSERT_TRUE(operation.contains("operationId")) << method << " " << path;
      EXPECT_TRUE(ids.insert(operation["operationId"].get<std::string>()).second) << operation["operationId"];
    }
  EXPECT_EQ(ids.size(), operations);
  EXPECT_EQ(openapi["servers"][0]["url"], "/");
  const auto& timings = openapi["components"]["schemas"]["Run"]["properties"]["timings"]["properties"];
  EXPECT_TRUE(timings["started_at"].value("nullable", false));
  EXPECT_TRUE(timings["finished_at"].value("nullable", false));
  auto m = client().Get("/metrics");
  ASSERT_TRUE(m && m->status == 200);
  EXPECT_NE(m->body.find("strandline_http_requests_total{method=\"GET\",route=\"/healthz\",status=\"200\"} 1"),
            std::string::npos)
      << m->body;
  EXPECT_NE(m->body.find("# TYPE strandline_http_request_duration_seconds histogram"), std::string::npos);
}

TEST_F(HttpService, WritesNeedAWriteKey) {
  start();
  const std::string site = R"({"id":"cove","name":"Cove","crs":"EPSG:32631"})";
  expect_problem(client().Post("/v1/sites", site, "application/json"), 401, "/problems/unauthorized");
  expect_problem(post("/v1/sites", site, "application/json", "sl_0000_bad"), 401, "/problems/unauthorized");
  expect_problem(post("/v1/sites", site, "application/json", read_key_), 403, "/problems/forbidden");
  auto ok = post("/v1/sites", site, "application/json", write_key_);
  ASSERT_TRUE(ok);
  EXPECT_EQ(ok->status, 201);
  expect_problem(post("/v1/sites", site, "application/json", write_key_), 409, "/problems/already-exists");
  // Reads are open by default.
  auto list = client().Get("/v1/sites");
  ASSERT_TRUE(list && list->status == 200);
  EXPECT_EQ(json::parse(list->body)["items"][0]["id"], "cove");
}

TEST_F(HttpService, ReadKeyRequiredClosesReads) {
  http::ServiceOptions options;
  options.read_key_required = true;
  start(options);
  expect_problem(client().Get("/v1/sites"), 401, "/problems/unauthorized");
  auto r = client().Get("/v1/sites", auth(read_key_));
  ASSERT_TRUE(r);
  EXPECT_EQ(r->status, 200);
}

TEST_F(HttpService, BadRequestsGetProblemTypes) {
  start();
  expect_problem(post("/v1/sites", "{not json", "application/json", write_key_), 400, "/problems/bad-json");
  expect_problem(post("/v1/sites", "id=cove", "application/x-www-form-urlencoded", write_key_), 415,
                 "/problems/unsupported-media-type");
  auto schema = post("/v1/sites", R"({"id":"cove","name":"Cove","crs":"EPSG:32631","colour":"red"})",
                     "application/json", write_key_);
  expect_problem(schema, 422, "/problems/invalid-body");
  EXPECT_EQ(json::parse(schema->body)["pointer"], "/colour");
  expect_problem(post("/v1/sites", R"({"id":"c","name":"C","crs":"EPSG:4326"})", "application/json", write_key_), 422,
                 "/problems/invalid-body");
  expect_problem(client().Get("/v1/sites/nowhere"), 404, "/problems/not-found");
  expect_problem(client().Get("/v1/no/such/route"), 404, "/problems/not-found");
  expect_problem(client().Get("/v1/runs/12345"), 404, "/problems/not-found");
}

TEST_F(HttpService, HttpRoughEdgesAreSmoothed) {
  // A known path with another method: 405 with Allow (was 404 "no route").
  start();
  create_demo_site();
  auto wrong = client().Delete("/v1/sites", auth(write_key_));
  expect_problem(wrong, 405, "/problems/method-not-allowed");
  EXPECT_EQ(wrong->get_header_value("Allow"), "GET, HEAD, POST");
  auto get_purge = client().Get("/v1/sites/cove/purge");
  expect_problem(get_purge, 405, "/problems/method-not-allowed");
  EXPECT_EQ(get_purge->get_header_value("Allow"), "POST");
  // POST .../runs with no body at all (no Content-Length): the site's defaults (was 400).
  const std::string reply = raw_exchange(port_, "POST /v1/sites/cove/runs HTTP/1.1\r\nHost: x\r\nAuthorization: Bearer " +
                                                    write_key_ + "\r\nConnection: close\r\n\r\n");
  ASSERT_EQ(status_of(reply), 202) << reply;
  EXPECT_EQ(wait_for_run(body_of(reply)["run_id"].get<std::int64_t>())["state"], "done");
  // GeoJSON's own media type for the transects (was 415).
  auto geo = client().Put("/v1/sites/cove/transects", auth(write_key_), kTransects, "application/geo+json");
  ASSERT_TRUE(geo);
  EXPECT_EQ(geo->status, 200) << geo->body;
}

TEST_F(HttpService, ObservationUploadsAreAllOrNothingIdempotentAndConflictChecked) {
  start();
  create_demo_site();
  const std::string csv = observations_csv(10);
  auto first = post("/v1/sites/cove/observations", csv, "text/csv", write_key_);
  ASSERT_TRUE(first);
  ASSERT_EQ(first->status, 201) << first->body;
  auto report = json::parse(first->body);
  EXPECT_EQ(report["received"], 20);
  EXPECT_EQ(report["inserted"], 20);
  EXPECT_EQ(report["duplicates"], 0);

  auto again = post("/v1/sites/cove/observations", csv, "text/csv", write_key_);
  ASSERT_TRUE(again && again->status == 201);
  EXPECT_EQ(json::parse(again->body)["inserted"], 0);
  EXPECT_EQ(json::parse(again->body)["duplicates"], 20);

  // Same (transect, image) with a different position: 409 naming it, nothing stored.
  const std::string conflicting =
      "transect_id,time,chainage_m,sensor,image_id\nT1,2020-02-01T00:00:00Z,1,sentinel2a,NEW\n"
      "T1,2020-01-01T10:00:00Z,999,sentinel2a,IMG0\n";
  auto conflict = post("/v1/sites/cove/observations", conflicting, "text/csv", write_key_);
  expect_problem(conflict, 409, "/problems/conflict");
  auto rows = json::parse(conflict->body)["rows"];
  ASSERT_EQ(rows.size(), 1u);
  EXPECT_EQ(rows[0]["line"], 3);
  EXPECT_EQ(rows[0]["key"], "T1/IMG0");

  // Two bad rows among good ones: 422 listing both, nothing stored.
  const std::string bad =
      "transect_id,time,chainage_m,sensor,image_id\n"
      "T1,2020-03-01T00:00:00Z,10,sentinel2a,G1\n"
      "T1,2020-03-02T00:00:00,10,sentinel2a,G2\n"     // no zone designator
      "T9,2020-03-03T00:00:00Z,10,sentinel2a,G3\n"    // unknown transect
      "T2,2020-03-04T00:00:00Z,10,sentinel2a,G4\n";
  auto invalid = post("/v1/sites/cove/observations", bad, "text/csv", write_key_);
  expect_problem(invalid, 422, "/problems/invalid-rows");
  auto bad_rows = json::parse(invalid->body)["rows"];
  ASSERT_EQ(bad_rows.size(), 2u);
  EXPECT_EQ(bad_rows[0]["line"], 3);
  EXPECT_EQ(bad_rows[0]["field"], "time");
  EXPECT_EQ(bad_rows[1]["line"], 4);
  EXPECT_EQ(bad_rows[1]["field"], "transect_id");
  auto uploads = json::parse(client().Get("/v1/sites/cove/uploads")->body)["items"];
  EXPECT_EQ(uploads.size(), 2u);  // the conflict and the 422 stored nothing

  auto skipped = post("/v1/sites/cove/observations?on_invalid=skip", bad, "text/csv", write_key_);
  ASSERT_TRUE(skipped && skipped->status == 201) << skipped->body;
  auto skip_report = json::parse(skipped->body);
  EXPECT_EQ(skip_report["inserted"], 2);
  EXPECT_EQ(skip_report["rejected"], 2);

  // JSON rows, same rules; errors point into the array.
  const std::string json_rows =
      R"({"observations":[{"transect_id":"T2","time":"2020-04-01T00:00:00Z","chainage_m":12.5,"sensor":"sentinel2a","image_id":"J1"},
                          {"transect_id":"T2","time":"2020-04-02T00:00:00Z","chainage_m":"far","sensor":"sentinel2a","image_id":"J2"}]})";
  auto json_invalid = post("/v1/sites/cove/observations", json_rows, "application/json", write_key_);
  expect_problem(json_invalid, 422, "/problems/invalid-rows");
  EXPECT_EQ(json::parse(json_invalid->body)["rows"][0]["pointer"], "/observations/1");
  auto json_ok = post("/v1/sites/cove/observations?on_invalid=skip", json_rows, "application/json", write_key_);
  ASSERT_TRUE(json_ok && json_ok->status == 201);
  EXPECT_EQ(json::parse(json_ok->body)["inserted"], 1);

  expect_problem(post("/v1/sites/cove/observations", csv, "text/plain", write_key_), 415,
                 "/problems/unsupported-media-type");
  expect_problem(post("/v1/sites/nowhere/observations", csv, "text/csv", write_key_), 404, "/problems/not-found");
}

TEST_F(HttpService, BodyLimitAnswers413) {
  http::ServiceOptions options;
  options.max_body_bytes = 64 * 1024;
  start(options);
  create_demo_site();
  const std::string big = observations_csv(2000);
  ASSERT_GT(big.size(), options.max_body_bytes);
  expect_problem(post("/v1/sites/cove/observations", big, "text/csv", write_key_), 413, "/problems/payload-too-large");
}

TEST_F(HttpService, RunsProduceSeriesWithEtagsChangesAndIncrementalScope) {
  start();
  create_demo_site();
  ASSERT_EQ(post("/v1/sites/cove/observations", observations_csv(40), "text/csv", write_key_)->status, 201);
  ASSERT_EQ(post("/v1/sites/cove/water-levels", water_levels_csv(), "text/csv", write_key_)->status, 201);

  expect_problem(post("/v1/sites/cove/runs", R"({"steps":{"no_such_step":{}}})", "application/json", write_key_), 422,
                 "/problems/invalid-run-options");
  auto started = post("/v1/sites/cove/runs", "{}", "application/json", write_key_);
  ASSERT_TRUE(started);
  ASSERT_EQ(started->status, 202) << started->body;
  const auto run_id = json::parse(started->body)["run_id"].get<std::int64_t>();
  EXPECT_EQ(started->get_header_value("Location"), "/v1/runs/" + std::to_string(run_id));
  auto run = wait_for_run(run_id);
  ASSERT_EQ(run["state"], "done") << run.dump();
  EXPECT_EQ(run["progress"]["transects_total"], 2);
  EXPECT_EQ(run["progress"]["transects_done"], 2);
  EXPECT_TRUE(run["provenance"].contains("configuration"));

  auto series = client().Get("/v1/sites/cove/transects/T1/series?run=latest&format=json");
  ASSERT_TRUE(series && series->status == 200);
  auto body = json::parse(series->body);
  ASSERT_EQ(body["rows"].size(), 40u);
  // With the default slope 0.1 and z_ref 0 the correction is level / slope;
  // both are given to the millimetre, so level / slope is known to ±5 mm.
  const auto& row = body["rows"][0];
  ASSERT_TRUE(row["water_level_m"].is_number());
  EXPECT_NEAR(row["correction_m"].get<double>(), row["water_level_m"].get<double>() / 0.1, 0.0056);
  const std::string etag = series->get_header_value("ETag");
  ASSERT_FALSE(etag.empty());
  auto revalidated =
      client().Get("/v1/sites/cove/transects/T1/series?format=json", httplib::Headers{{"If-None-Match", etag}});
  ASSERT_TRUE(revalidated);
  EXPECT_EQ(revalidated->status, 304);
  auto csv = client().Get("/v1/sites/cove/transects/T1/series?format=csv");
  ASSERT_TRUE(csv && csv->status == 200);
  EXPECT_EQ(csv->body.substr(0, 17), "transect_id,time,");

  // A client accepting gzip gets a gzip member of the rendered document, byte for byte
  // the same document, under its own ETag; either ETag revalidates.
  for (const auto& [format, identity] : {std::pair{"json", series->body}, std::pair{"csv", csv->body}}) {
    auto raw = client();
    raw.set_decompress(false);
    const std::string path = std::string("/v1/sites/cove/transects/T1/series?format=") + format;
    auto gz = raw.Get(path.c_str(), httplib::Headers{{"Accept-Encoding", "gzip, deflate, br"}});
    ASSERT_TRUE(gz && gz->status == 200);
    EXPECT_EQ(gz->get_header_value("Content-Encoding"), "gzip");
    EXPECT_EQ(gz->get_header_value("Vary"), "Accept-Encoding");
    ASSERT_GT(gz->body.size(), 2u);
    EXPECT_LT(gz->body.size(), identity.size());
    EXPECT_EQ(gzip_decompress(gz->body), identity);
    const std::string gz_etag = gz->get_header_value("ETag");
    EXPECT_EQ(gz_etag.substr(gz_etag.size() - 4), ".gz\"");
    auto plain = raw.Get(path.c_str(), httplib::Headers{{"Accept-Encoding", "gzip;q=0, br"}});
    ASSERT_TRUE(plain && plain->status == 200);
    EXPECT_NE(plain->get_header_value("Content-Encoding"), "gzip");
    auto again = raw.Get(path.c_str(), httplib::Headers{{"Accept-Encoding", "gzip"}, {"If-None-Match", gz_etag}});
    ASSERT_TRUE(again);
    EXPECT_EQ(again->status, 304);
  }
  expect_problem(client().Get("/v1/sites/cove/transects/T7/series"), 404, "/problems/not-found");
  expect_problem(client().Get("/v1/sites/cove/transects/T1/series?format=xml"), 400, "/problems/bad-request");

  auto changes = json::parse(client().Get("/v1/sites/cove/changes?since=0")->body);
  ASSERT_EQ(changes["items"].size(), 2u);
  const std::string cursor = changes["cursor"];
  EXPECT_TRUE(json::parse(client().Get(("/v1/sites/cove/changes?since=" + cursor).c_str())->body)["items"].empty());

  auto summary = client().Get("/v1/sites/cove/summary");
  ASSERT_TRUE(summary && summary->status == 200);
  EXPECT_EQ(json::parse(summary->body)["transects"].size(), 2u);
  // The summary carries the cautions, as the batch summary does, and the site-wide
  // sensor offsets and noise of the latest run (they were only in its provenance).
  EXPECT_GE(json::parse(summary->body)["cautions"].size(), 3u);
  const json site_offsets = json::parse(summary->body)["sensor_offsets"];
  ASSERT_TRUE(site_offsets.is_object()) << summary->body;
  EXPECT_EQ(site_offsets["mode"], "estimate");
  ASSERT_TRUE(json::parse(summary->body)["sensor_noise"].is_array());
  EXPECT_FALSE(json::parse(summary->body)["sensor_noise"].empty());

  // New points on T2 only: the next default run covers T2 alone.
  const std::string more = "transect_id,time,chainage_m,sensor,image_id\nT2,2020-01-02T12:00:00Z,170,sentinel2a,LATE\n";
  ASSERT_EQ(post("/v1/sites/cove/observations", more, "text/csv", write_key_)->status, 201);
  auto second = wait_for_run(json::parse(post("/v1/sites/cove/runs", "", "application/json", write_key_)->body)["run_id"]);
  EXPECT_EQ(second["progress"]["transects_total"], 1);
  auto after = json::parse(client().Get(("/v1/sites/cove/changes?since=" + cursor).c_str())->body);
  ASSERT_EQ(after["items"].size(), 1u);
  EXPECT_EQ(after["items"][0]["transect_id"], "T2");
  // T1's latest series is still the first run's; T2's is the second's.
  EXPECT_EQ(client().Get("/v1/sites/cove/transects/T1/series")->get_header_value("X-Run-Id"), std::to_string(run_id));
  EXPECT_EQ(json::parse(client().Get("/v1/sites/cove/transects/T2/series")->body)["rows"].size(), 41u);
}

TEST_F(HttpService, RetractionTakesRowsOutOfFutureRuns) {
  start();
  create_demo_site();
  ASSERT_EQ(post("/v1/sites/cove/water-levels", water_levels_csv(), "text/csv", write_key_)->status, 201);
  ASSERT_EQ(post("/v1/sites/cove/observations", observations_csv(10), "text/csv", write_key_)->status, 201);
  auto wrong = post("/v1/sites/cove/observations",
                    "transect_id,time,chainage_m,sensor,image_id\nT1,2020-01-02T01:00:00Z,900,sentinel2a,WRONG\n",
                    "text/csv", write_key_);
  const auto upload_id = json::parse(wrong->body)["upload_id"].get<std::int64_t>();
  const std::string path = "/v1/sites/cove/uploads/" + std::to_string(upload_id);
  expect_problem(client().Delete(path.c_str(), auth(write_key_)), 422, "/problems/invalid-body");  // no reason
  auto retracted = client().Delete((path + "?reason=mis-georeferenced").c_str(), auth(write_key_));
  ASSERT_TRUE(retracted && retracted->status == 200) << retracted->body;
  auto info = json::parse(retracted->body);
  EXPECT_EQ(info["retraction"]["by"], "writer");
  EXPECT_EQ(info["retraction"]["reason"], "mis-georeferenced");
  expect_problem(client().Delete((path + "?reason=again").c_str(), auth(write_key_)), 409, "/problems/conflict");
  expect_problem(client().Delete("/v1/sites/cove/uploads/999?reason=x", auth(write_key_)), 404, "/problems/not-found");
  auto run = wait_for_run(json::parse(post("/v1/sites/cove/runs", "", "application/json", write_key_)->body)["run_id"]);
  ASSERT_EQ(run["state"], "done");
  auto rows = json::parse(client().Get("/v1/sites/cove/transects/T1/series")->body)["rows"];
  EXPECT_EQ(rows.size(), 10u);
  for (const auto& r : rows) EXPECT_NE(r["image_id"], "WRONG");
  // Paging: one upload per page, newest first.
  auto page1 = json::parse(client().Get("/v1/sites/cove/uploads?limit=1")->body);
  ASSERT_EQ(page1["items"].size(), 1u);
  EXPECT_EQ(page1["items"][0]["upload_id"], upload_id);
  auto page2 = json::parse(
      client().Get(("/v1/sites/cove/uploads?limit=1&cursor=" + page1["next_cursor"].get<std::string>()).c_str())->body);
  ASSERT_EQ(page2["items"].size(), 1u);
  EXPECT_LT(page2["items"][0]["upload_id"].get<std::int64_t>(), upload_id);
}

TEST_F(HttpService, OverloadAnswers503WithRetryAfter) {
  http::ServiceOptions options;
  options.max_concurrent_requests = 1;
  options.http_threads = 16;
  start(options);
  create_demo_site();
  const std::string csv = observations_csv(4000);
  std::atomic<int> overloaded{0}, stored{0}, other{0};
  std::atomic<bool> retry_after_seen{false};
  for (int round = 0; round < 5 && overloaded == 0; ++round) {
    std::vector<std::thread> clients;
    for (int i = 0; i < 8; ++i)
      clients.emplace_back([&] {
        auto r = post("/v1/sites/cove/observations", csv, "text/csv", write_key_);
        if (!r) return ++other, void();
        if (r->status == 503) {
          ++overloaded;
          if (r->get_header_value("Retry-After") == "1") retry_after_seen = true;
        } else if (r->status == 201) {
          ++stored;
        } else {
          ++other;
        }
      });
    for (auto& t : clients) t.join();
  }
  EXPECT_GT(overloaded.load(), 0);
  EXPECT_TRUE(retry_after_seen.load());
  EXPECT_GT(stored.load(), 0);
  EXPECT_EQ(other.load(), 0);
}

TEST_F(HttpService, OtherUploadKinds) {
  start();
  create_demo_site();
  auto waves = post("/v1/sites/cove/waves", "time,hs_m,tp_s,dir_deg\n2020-01-01T00:00:00Z,1.5,9,270\n2020-01-01T01:00:00Z,99,9,270\n",
                    "text/csv", write_key_);
  expect_problem(waves, 422, "/problems/invalid-rows");
  EXPECT_EQ(json::parse(waves->body)["rows"][0]["field"], "hs_m");
  auto slopes = post("/v1/sites/cove/slopes", R"([{"transect_id":"T1","slope":0.09,"slope_sigma":0.01}])",
                     "application/json", write_key_);
  ASSERT_TRUE(slopes);
  EXPECT_EQ(slopes->status, 201) << slopes->body;
  expect_problem(post("/v1/sites/cove/slopes", R"([{"transect_id":"T1","slope":0.05}])", "application/json", write_key_),
                 409, "/problems/conflict");
  expect_problem(post("/v1/sites/cove/tide-constituents", R"({"constituents":"nope"})", "application/json", write_key_),
                 422, "/problems/invalid-body");
}

}  // namespace

namespace {

std::string summary_etag(httplib::Client c, const std::string& site) {
  auto r = c.Get(("/v1/sites/" + site + "/summary").c_str());
  EXPECT_TRUE(r && r->status == 200);
  return r ? r->get_header_value("ETag") : "";
}

// The uploads apply the batch readers' rules (server/io/*_rules.h).
TEST_F(HttpService, UploadsApplyTheBatchRules) {
  start();
  create_demo_site();
  // Water levels not in metres: the units rule names the row.
  for (const std::string wild : {"500", "1e6"}) {
    auto r = post("/v1/sites/cove/water-levels",
                  "time,level_m\n2020-01-01T00:00:00Z,0.4\n2020-01-01T01:00:00Z," + wild + "\n2020-01-01T02:00:00Z,0.5\n",
                  "text/csv", write_key_);
    expect_problem(r, 422, "/problems/invalid-rows");
    const auto rows = json::parse(r->body)["rows"];
    ASSERT_EQ(rows.size(), 1u) << r->body;
    EXPECT_EQ(rows[0]["line"], 3);
    EXPECT_EQ(rows[0]["field"], "level_m");
  }
  // One image, one time and one sensor within an upload...
  const std::string header = "transect_id,time,chainage_m,sensor,image_id\n";
  auto two_times = post("/v1/sites/cove/observations",
                        header + "T1,2020-01-01T10:00:00Z,100,sentinel2a,A\nT2,2020-01-02T10:00:00Z,100,sentinel2a,A\n",
                        "text/csv", write_key_);
  expect_problem(two_times, 422, "/problems/invalid-rows");
  EXPECT_EQ(json::parse(two_times->body)["rows"][0]["field"], "time");
  auto two_sensors = post("/v1/sites/cove/observations",
                          header + "T1,2020-01-01T10:00:00Z,100,sentinel2a,A\nT2,2020-01-01T10:00:00Z,100,sentinel2b,A\n",
                          "text/csv", write_key_);
  expect_problem(two_sensors, 422, "/problems/invalid-rows");
  EXPECT_EQ(json::parse(two_sensors->body)["rows"][0]["field"], "sensor");
  // ...and against the images already stored for the site, on any transect.
  ASSERT_EQ(post("/v1/sites/cove/observations", header + "T1,2020-01-01T10:00:00Z,100,sentinel2a,A\n", "text/csv",
                 write_key_)->status, 201);
  auto stored_other_time = post("/v1/sites/cove/observations", header + "T2,2020-01-03T10:00:00Z,100,sentinel2a,A\n",
                                "text/csv", write_key_);
  expect_problem(stored_other_time, 422, "/problems/invalid-rows");
  EXPECT_EQ(json::parse(stored_other_time->body)["rows"][0]["field"], "time");
  // A misspelt column is refused naming it; a genuine extra column is reported as ignored.
  auto misspelt = post("/v1/sites/cove/observations",
                       "transect_id,time,chainage_m,sensor,image_id,cloud_fration\nT1,2020-01-05T10:00:00Z,1,sentinel2a,B,0.9\n",
                       "text/csv", write_key_);
  expect_problem(misspelt, 422, "/problems/invalid-body");
  EXPECT_EQ(json::parse(misspelt->body)["field"], "cloud_fration");
  auto extra = post("/v1/sites/cove/observations",
                    "transect_id,time,chainage_m,sensor,image_id,crossings\nT1,2020-01-05T10:00:00Z,1,sentinel2a,B,2\n",
                    "text/csv", write_key_);
  ASSERT_EQ(extra->status, 201) << extra->body;
  EXPECT_EQ(json::parse(extra->body)["ignored_columns"], json::array({"crossings"}));
  // Row reasons speak of values, not of CLI options.
  auto sensor = post("/v1/sites/cove/observations", header + "T1,2020-01-06T10:00:00Z,1,landsat42,C\n", "text/csv",
                     write_key_);
  expect_problem(sensor, 422, "/problems/invalid-rows");
  EXPECT_EQ(json::parse(sensor->body)["rows"][0]["reason"].get<std::string>().find("--"), std::string::npos);
  // Waves: the batch's columns (dir_deg optional) and units rule.
  auto waves = post("/v1/sites/cove/waves", "time,hs_m,tp_s\n2020-01-01T00:00:00Z,1.5,9\n2020-01-01T01:00:00Z,1.5,95\n",
                    "text/csv", write_key_);
  expect_problem(waves, 422, "/problems/invalid-rows");
  EXPECT_EQ(json::parse(waves->body)["rows"][0]["field"], "tp_s");
}

}  // namespace

// The summary's ETag is the hash of its text: it differs between sites and
// changes when a run changes the summary, so a revalidating dashboard sees new data.
TEST_F(HttpService, SummaryEtagFollowsItsContent) {
  start();
  create_demo_site();
  ASSERT_EQ(post("/v1/sites/cove/observations", observations_csv(30), "text/csv", write_key_)->status, 201);
  ASSERT_EQ(post("/v1/sites/cove/water-levels", water_levels_csv(), "text/csv", write_key_)->status, 201);
  wait_for_run(json::parse(post("/v1/sites/cove/runs", "{}", "application/json", write_key_)->body)["run_id"]);
  const std::string first = summary_etag(client(), "cove");
  ASSERT_FALSE(first.empty());
  // The hash of an empty text would be the same for every site and run.
  EXPECT_NE(first, "\"" + store::sha256_hex("").substr(0, 32) + "\"");
  EXPECT_EQ(summary_etag(client(), "cove"), first);
  auto same = client().Get("/v1/sites/cove/summary", httplib::Headers{{"If-None-Match", first}});
  ASSERT_TRUE(same);
  EXPECT_EQ(same->status, 304);

  const std::string more = "transect_id,time,chainage_m,sensor,image_id\nT2,2020-01-02T12:00:00Z,190,sentinel2a,LATE\n";
  ASSERT_EQ(post("/v1/sites/cove/observations", more, "text/csv", write_key_)->status, 201);
  wait_for_run(json::parse(post("/v1/sites/cove/runs", "{}", "application/json", write_key_)->body)["run_id"]);
  const std::string second = summary_etag(client(), "cove");
  EXPECT_NE(second, first);
  auto changed = client().Get("/v1/sites/cove/summary", httplib::Headers{{"If-None-Match", first}});
  ASSERT_TRUE(changed);
  EXPECT_EQ(changed->status, 200);
}

// Text is escaped once: an image id with a comma and a quote reads back as
// uploaded from the CSV and JSON series.
TEST_F(HttpService, SeriesTextIsEscapedOnce) {
  start();
  create_demo_site();
  const std::string obs =
      "transect_id,time,chainage_m,sensor,image_id\n"
      "T1,2020-01-01T10:00:00Z,150,sentinel2a,\"IMG,7\"\n"
      "T1,2020-01-01T11:00:00Z,151,sentinel2a,\"IMG\"\"8\"\n";
  ASSERT_EQ(post("/v1/sites/cove/observations", obs, "text/csv", write_key_)->status, 201);
  ASSERT_EQ(post("/v1/sites/cove/water-levels", water_levels_csv(), "text/csv", write_key_)->status, 201);
  auto run = wait_for_run(json::parse(post("/v1/sites/cove/runs", "{}", "application/json", write_key_)->body)["run_id"]);
  ASSERT_EQ(run["state"], "done") << run.dump();
  auto csv = client().Get("/v1/sites/cove/transects/T1/series?format=csv");
  ASSERT_TRUE(csv && csv->status == 200);
  EXPECT_NE(csv->body.find(",\"IMG,7\","), std::string::npos) << csv->body;
  EXPECT_NE(csv->body.find(",\"IMG\"\"8\","), std::string::npos) << csv->body;
  EXPECT_EQ(csv->body.find("\"\"\"IMG"), std::string::npos) << csv->body;
  auto rows = json::parse(client().Get("/v1/sites/cove/transects/T1/series")->body)["rows"];
  ASSERT_EQ(rows.size(), 2u);
  EXPECT_EQ(rows[0]["image_id"], "IMG,7");
  EXPECT_EQ(rows[1]["image_id"], "IMG\"8");
}

// A service run reads the batch's run configuration: processing choices such as
// the wave correction and the slope are set in the body, and provenance
// records the effective configuration under the batch's key.
TEST_F(HttpService, RunBodyCarriesTheProcessingChoices) {
  start();
  create_demo_site();
  ASSERT_EQ(post("/v1/sites/cove/observations", observations_csv(20), "text/csv", write_key_)->status, 201);
  ASSERT_EQ(post("/v1/sites/cove/water-levels", water_levels_csv(), "text/csv", write_key_)->status, 201);
  expect_problem(post("/v1/sites/cove/runs", R"({"wave_correction":"sideways"})", "application/json", write_key_), 422,
                 "/problems/invalid-run-options");
  auto started = post("/v1/sites/cove/runs",
                      R"({"wave_correction":"runup","reference_elevation_m":0.25,"slope":{"fixed":0.05}})",
                      "application/json", write_key_);
  ASSERT_TRUE(started && started->status == 202) << (started ? started->body : "");
  auto run = wait_for_run(json::parse(started->body)["run_id"]);
  ASSERT_EQ(run["state"], "done") << run.dump();
  const auto& configuration = run["provenance"]["configuration"];
  EXPECT_EQ(configuration["wave_correction"], "runup");
  EXPECT_EQ(configuration["reference_elevation_m"], 0.25);
  EXPECT_EQ(configuration["slope"]["fixed"], 0.05);
  EXPECT_TRUE(configuration["steps"].contains("hampel"));
  for (const char* key : {"version", "inputs", "water_levels", "steps", "rows", "started", "finished"})
    EXPECT_TRUE(run["provenance"].contains(key)) << key;
  const auto row = json::parse(client().Get("/v1/sites/cove/transects/T1/series")->body)["rows"][0];
  EXPECT_EQ(row["slope"], 0.05);
  EXPECT_EQ(row["z_ref_m"], 0.25);
  EXPECT_NEAR(row["correction_m"].get<double>(), (row["water_level_m"].get<double>() - 0.25) / 0.05, 0.11);
}

// A site with no water levels and no tide constituents: the run fails naming
// the reason, as the batch refuses the same inputs.
TEST_F(HttpService, RunWithoutWaterLevelsFailsWithTheReason) {
  start();
  create_demo_site();
  ASSERT_EQ(post("/v1/sites/cove/observations", observations_csv(5), "text/csv", write_key_)->status, 201);
  auto run = wait_for_run(json::parse(post("/v1/sites/cove/runs", "{}", "application/json", write_key_)->body)["run_id"]);
  EXPECT_EQ(run["state"], "failed");
  EXPECT_NE(run["reason"].get<std::string>().find("no water levels"), std::string::npos) << run.dump();
}
