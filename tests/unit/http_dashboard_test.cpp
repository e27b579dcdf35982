// What the dashboard reads from the service: its own files at `/` (with the
// security and caching headers, path traversal refused), transects with an
// RFC 7946 geometry, run progress through every stage, and the rows an upload
// refused. The page itself is tested in a real browser (tests/browser).
#include <fstream>
#include <latch>

#include "server/app/run_manager.h"
#include "server/http/web_files.h"
#include "tests/unit/http_fixture.h"

using namespace strandline;
using namespace strandline::testing_http;

namespace {

using HttpDashboard = HttpService;

TEST_F(HttpDashboard, PageIsServedAtTheRootWithItsPolicies) {
  start();
  auto page = client().Get("/");
  ASSERT_TRUE(page);
  ASSERT_EQ(page->status, 200) << page->body;
  EXPECT_EQ(page->get_header_value("Content-Type"), "text/html; charset=utf-8");
  EXPECT_NE(page->body.find("<!doctype html"), std::string::npos) << page->body.substr(0, 200);
  const std::string csp = page->get_header_value("Content-Security-Policy");
  EXPECT_NE(csp.find("script-src 'self'"), std::string::npos) << csp;
  EXPECT_NE(csp.find("style-src 'self'"), std::string::npos) << csp;
  EXPECT_EQ(csp.find("unsafe-inline"), std::string::npos) << csp;
  EXPECT_EQ(page->get_header_value("X-Content-Type-Options"), "nosniff");
  EXPECT_EQ(page->get_header_value("Cache-Control"), "no-cache");
  const std::string etag = page->get_header_value("ETag");
  ASSERT_FALSE(etag.empty());
  auto again = client().Get("/index.html", httplib::Headers{{"If-None-Match", etag}});
  ASSERT_TRUE(again);
  EXPECT_EQ(again->status, 304);

  // Every file the page names is served, with its type.
  for (const auto& [path, type] : {std::pair{"/assets/app.js", "text/javascript; charset=utf-8"},
                                   std::pair{"/assets/style.css", "text/css; charset=utf-8"},
                                   std::pair{"/assets/favicon.svg", "image/svg+xml"},
                                   std::pair{"/vendor/uPlot.iife.min.js", "text/javascript; charset=utf-8"},
                                   std::pair{"/vendor/uPlot.min.css", "text/css; charset=utf-8"}}) {
    auto r = client().Get(path);
    ASSERT_TRUE(r) << path;
    EXPECT_EQ(r->status, 200) << path;
    EXPECT_EQ(r->get_header_value("Content-Type"), type) << path;
    EXPECT_FALSE(r->body.empty()) << path;
    EXPECT_NE(page->body.find(path), std::string::npos) << "index.html does not name " << path;
  }
  auto head = client().Head("/");
  ASSERT_TRUE(head);
  EXPECT_EQ(head->status, 200);
  EXPECT_TRUE(head->body.empty());
  // A missing file is a problem body, as an unknown API path is.
  expect_problem(client().Get("/assets/no-such-file.js"), 404, "/problems/not-found");
  expect_problem(client().Get("/v1/no-such-route"), 404, "/problems/not-found");
}

TEST_F(HttpDashboard, TraversalIsRefusedInEveryForm) {
  start();
  // Sent byte for byte: a client library would normalise some of these paths.
  for (const char* target : {"/../etc/passwd", "/assets/../../etc/passwd", "/%2e%2e/etc/passwd",
                             "/assets/%2e%2e%2findex.html", "/assets/..%2f..%2fetc%2fpasswd", "/assets/..%5cindex.html",
                             "/assets/./app.js", "//etc/passwd", "/assets/%2E%2E/index.html"}) {
    const std::string reply =
        raw_exchange(port_, std::string("GET ") + target + " HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n");
    const int status = status_of(reply);
    EXPECT_TRUE(status == 400 || status == 404) << target << ": " << reply.substr(0, 300);
    EXPECT_EQ(reply.find("root:"), std::string::npos) << target;
  }
  auto h = client().Get("/healthz");
  ASSERT_TRUE(h);
  EXPECT_EQ(h->status, 200);
}

TEST(WebFiles, PathRulesAndFolderConfinement) {
  for (const char* bad : {"", "x", "/..", "/a/../b", "/./a", "/a//b", "/a\\b", "/assets/.."})
    EXPECT_TRUE(http::web_path_problem(bad).has_value()) << bad;
  for (const char* good : {"/", "/index.html", "/assets/app.js", "/assets/a..b.js", "/vendor/uPlot.min.css"})
    EXPECT_FALSE(http::web_path_problem(good).has_value()) << good;

  const auto root = std::filesystem::temp_directory_path() / ("strandline-web-" + std::to_string(getpid()));
  const auto outside = root.string() + "-outside";
  std::filesystem::remove_all(root);
  std::filesystem::remove_all(outside);
  std::filesystem::create_directories(root / "assets");
  std::filesystem::create_directories(outside);
  { std::ofstream(root / "index.html") << "<!doctype html><p>page"; }
  { std::ofstream(root / "assets" / "app.js") << "export {};"; }
  { std::ofstream(std::filesystem::path(outside) / "secret.txt") << "secret"; }
  std::filesystem::create_directory_symlink(outside, root / "assets" / "out");
  std::filesystem::create_symlink(std::filesystem::path(outside) / "secret.txt", root / "assets" / "link.txt");
  std::filesystem::create_symlink(root / "assets" / "app.js", root / "assets" / "inside.js");
  const auto canonical_root = std::filesystem::canonical(root);

  const auto page = http::folder_web_file(canonical_root, "/");
  ASSERT_TRUE(page);
  EXPECT_EQ(page->body, "<!doctype html><p>page");
  EXPECT_EQ(page->content_type, "text/html; charset=utf-8");
  EXPECT_TRUE(http::folder_web_file(canonical_root, "/assets/app.js"));
  EXPECT_TRUE(http::folder_web_file(canonical_root, "/assets/inside.js"));  // a link that stays inside
  EXPECT_FALSE(http::folder_web_file(canonical_root, "/assets/out/secret.txt"));
  EXPECT_FALSE(http::folder_web_file(canonical_root, "/assets/link.txt"));
  EXPECT_FALSE(http::folder_web_file(canonical_root, "/assets/../../etc/passwd"));
  EXPECT_FALSE(http::folder_web_file(canonical_root, "/assets"));  // a folder is not a file
  // A sibling folder whose name starts with the root's is outside too.
  EXPECT_FALSE(http::folder_web_file(canonical_root, "/../" + std::filesystem::path(outside).filename().string() +
                                                         "/secret.txt"));
  const auto a = http::folder_web_file(canonical_root, "/assets/app.js");
  { std::ofstream(root / "assets" / "app.js") << "export const changed = 1;"; }
  const auto b = http::folder_web_file(canonical_root, "/assets/app.js");
  ASSERT_TRUE(a && b);
  EXPECT_NE(a->etag, b->etag) << "the ETag follows the content";
  std::filesystem::remove_all(root);
  std::filesystem::remove_all(outside);
}

TEST_F(HttpDashboard, StaticFolderOptionServesThatFolderOnly) {
  const auto folder = std::filesystem::temp_directory_path() / ("strandline-static-" + std::to_string(getpid()));
  std::filesystem::remove_all(folder);
  std::filesystem::create_directories(folder);
  { std::ofstream(folder / "index.html") << "<!doctype html><p>from the folder"; }
  std::filesystem::create_symlink("/etc/passwd", folder / "passwd");
  http::ServiceOptions options;
  options.static_dir = folder.string();
  start(options);
  auto page = client().Get("/");
  ASSERT_TRUE(page);
  EXPECT_EQ(page->status, 200);
  EXPECT_EQ(page->body, "<!doctype html><p>from the folder");
  EXPECT_FALSE(page->get_header_value("Content-Security-Policy").empty());
  expect_problem(client().Get("/passwd"), 404, "/problems/not-found");
  std::filesystem::remove_all(folder);
}

TEST_F(HttpDashboard, TransectsCarryLonLatGeometry) {
  start();
  create_demo_site();
  auto r = client().Get("/v1/sites/cove/transects");
  ASSERT_TRUE(r && r->status == 200);
  const auto doc = json::parse(r->body);
  EXPECT_EQ(doc["site_crs"], "EPSG:32631");
  ASSERT_EQ(doc["features"].size(), 2u);
  for (const auto& f : doc["features"]) {
    ASSERT_EQ(f["geometry"]["type"], "LineString") << f.dump();
    const auto& c = f["geometry"]["coordinates"];
    ASSERT_EQ(c.size(), 2u);
    // kTransects run due south (azimuth 180) from northing 5,902,000 in UTM 31N;
    // T1's origin is 1.96554 E, 53.26276 N (pyproj, EPSG:32631 -> 4326, always_xy):
    // longitude first, the end south of the origin by 400 m.
    const double lon0 = c[0][0], lat0 = c[0][1], lon1 = c[1][0], lat1 = c[1][1];
    EXPECT_NEAR(lon0, 1.9655 + (f["id"] == "T2" ? 0.0015 : 0.0), 0.001);
    EXPECT_NEAR(lat0, 53.2628, 0.001);
    EXPECT_NEAR((lat0 - lat1) * 111200.0, 400.0, 2.0);  // ~111.2 km per degree of latitude
    EXPECT_NEAR(lon0, lon1, 1e-4);
    EXPECT_DOUBLE_EQ(f["properties"]["azimuth_deg"].get<double>(), 180.0);
    EXPECT_DOUBLE_EQ(f["properties"]["length_m"].get<double>(), 400.0);
  }
}

TEST(RunStatus, ProgressCountsEveryStage) {
  store::RunInfo run;
  run.state = "running";
  run.transects_total = 20;
  using app::RunProgress, app::RunStage;
  auto s = app::run_status(run, RunProgress{RunStage::reading_inputs, 0, 20});
  EXPECT_EQ(s.state, "running");
  EXPECT_EQ(s.progress["stage"], "reading inputs");
  EXPECT_EQ(s.progress["stage_index"], 1);
  EXPECT_EQ(s.progress["stage_count"], 4);
  EXPECT_DOUBLE_EQ(s.progress["fraction"].get<double>(), 0.0);
  s = app::run_status(run, RunProgress{RunStage::correcting, 5, 20});
  EXPECT_EQ(s.progress["stage"], "correcting transects");
  EXPECT_EQ(s.progress["stage_index"], 2);
  EXPECT_EQ(s.progress["transects_done"], 5);
  EXPECT_DOUBLE_EQ(s.progress["fraction"].get<double>(), 0.1 + 0.7 * 5 / 20);
  s = app::run_status(run, RunProgress{RunStage::storing_results, 20, 20});
  EXPECT_EQ(s.progress["stage_index"], 3);
  EXPECT_DOUBLE_EQ(s.progress["fraction"].get<double>(), 0.8);
  // The store says done once the results are in; the documents are still being rendered.
  run.state = "done";
  s = app::run_status(run, RunProgress{RunStage::rendering_documents, 20, 20});
  EXPECT_EQ(s.state, "running");
  EXPECT_EQ(s.progress["stage"], "rendering documents");
  EXPECT_EQ(s.progress["stage_index"], 4);
  EXPECT_DOUBLE_EQ(s.progress["fraction"].get<double>(), 0.9);
  s = app::run_status(run, std::nullopt);
  EXPECT_EQ(s.state, "done");
  EXPECT_EQ(s.progress["transects_done"], 20);
  EXPECT_EQ(s.progress["stage_index"], 4);
  EXPECT_DOUBLE_EQ(s.progress["fraction"].get<double>(), 1.0);
  run.state = "failed";
  s = app::run_status(run, RunProgress{RunStage::correcting, 3, 20});
  EXPECT_EQ(s.state, "failed");
  EXPECT_TRUE(s.progress["fraction"].is_null());
  run.state = "queued";
  run.transects_total = 0;
  s = app::run_status(run, std::nullopt);
  EXPECT_EQ(s.progress["stage"], "queued");
  EXPECT_DOUBLE_EQ(s.progress["fraction"].get<double>(), 0.0);
}

// The defect: a run read 20/20 and "done" while it still wrote its documents.
TEST_F(HttpDashboard, RunIsRunningUntilItsLastStageEnds) {
  start();
  create_demo_site();
  ASSERT_EQ(post("/v1/sites/cove/observations", observations_csv(40), "text/csv", write_key_)->status, 201);
  ASSERT_EQ(post("/v1/sites/cove/water-levels", water_levels_csv(), "text/csv", write_key_)->status, 201);
  // A second run manager on the same store whose last stage waits for the test.
  std::latch in_last_stage(1), release(1);
  app::RunManager runs(
      *store_,
      [&](const app::RunManager::RunEnded&) {
        in_last_stage.count_down();
        release.wait();
      },
      1, 4);
  store::RunInfo run;
  run.site_id = "cove";
  run.scope = "all";
  run.input_seq = store_->input_seq("cove");
  run.requested_by = "test";
  run.id = store_->create_run(run);
  ASSERT_TRUE(runs.enqueue(run.id));
  in_last_stage.wait();
  const auto stored = store_->run(run.id);
  ASSERT_TRUE(stored);
  EXPECT_EQ(stored->state, "done") << "the results are stored before the last stage";
  const auto status = app::run_status(*stored, runs.progress(run.id));
  EXPECT_EQ(status.state, "running");
  EXPECT_EQ(status.progress["stage"], "rendering documents");
  EXPECT_LT(status.progress["fraction"].get<double>(), 1.0);
  release.count_down();
  runs.wait_idle();
  EXPECT_EQ(app::run_status(*store_->run(run.id), runs.progress(run.id)).state, "done");
}

TEST_F(HttpDashboard, UploadKeepsTheRowsItRefused) {
  start();
  create_demo_site();
  std::string body = observations_csv(3);
  body += "T1,2020-02-01T10:00:00Z,not-a-number,sentinel2a,IMGX,0.1\n";  // line 8
  body += "T9,2020-02-02T10:00:00Z,150,sentinel2a,IMGY,0.1\n";           // line 9: no such transect
  auto r = post("/v1/sites/cove/observations?on_invalid=skip", body, "text/csv", write_key_);
  ASSERT_TRUE(r);
  ASSERT_EQ(r->status, 201) << r->body;
  const auto report = json::parse(r->body);
  ASSERT_EQ(report["rejected"], 2);
  auto one = client().Get(("/v1/sites/cove/uploads/" + std::to_string(report["upload_id"].get<int>())).c_str());
  ASSERT_TRUE(one && one->status == 200);
  const auto upload = json::parse(one->body);
  EXPECT_EQ(upload["rejected"], 2);
  ASSERT_EQ(upload["rejected_rows"].size(), 2u) << upload.dump();
  EXPECT_EQ(upload["rejected_rows"], report["rejected_rows"]) << "the stored rows read as the report named them";
  EXPECT_EQ(upload["rejected_rows"][0]["line"], 8);
  EXPECT_EQ(upload["rejected_rows"][0]["field"], "chainage_m");
  EXPECT_EQ(upload["rejected_rows"][1]["line"], 9);
  EXPECT_FALSE(upload["rejected_rows"][1]["reason"].get<std::string>().empty());
  auto list = client().Get("/v1/sites/cove/uploads");
  ASSERT_TRUE(list && list->status == 200);
  EXPECT_FALSE(json::parse(list->body)["items"][0].contains("rejected_rows")) << "lists stay light";
}

}  // namespace
