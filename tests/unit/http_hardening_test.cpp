// Requests a careless or hostile client sends: each is answered with a 4xx
// problem (5xx only where the fault is ours) and the server stays up. Framing
// rules follow RFC 9112 section 6.3; the bearer scheme RFC 6750 / RFC 9110
// section 11.1 (schemes are case-insensitive).

#include "server/store/sqlite_store.h"
#include "tests/unit/http_fixture.h"

using namespace strandline;
using namespace strandline::testing_http;

namespace {

class HttpHardening : public HttpService {
 protected:
  void expect_alive() {
    auto h = client().Get("/healthz");
    ASSERT_TRUE(h) << "the server is down";
    EXPECT_EQ(h->status, 200);
  }
  std::string upload_path() const { return "/v1/sites/cove/observations"; }
};

}  // namespace

// The old main aborted on "/%ff": the problem body was serialised from the raw path.
TEST_F(HttpHardening, InvalidUtf8InThePathIs400AndTheServerStaysUp) {
  start();
  for (const char* path : {"/%ff", "/v1/sites/%ff", "/v1/sites/%c0%ae/summary", "/%00", "/v1/%ed%a0%80"}) {
    const std::string reply = raw_exchange(port_, std::string("GET ") + path + " HTTP/1.1\r\nHost: x\r\n\r\n");
    ASSERT_EQ(status_of(reply), 400) << path << "\n" << reply;
    const auto problem = body_of(reply);
    EXPECT_EQ(problem["type"], "/problems/bad-request");
    EXPECT_NE(problem["detail"].get<std::string>().find("path is not text"), std::string::npos);
    expect_alive();
  }
}

TEST_F(HttpHardening, QueryValuesAreTextGivenOnceWithoutStrayEquals) {
  start();
  create_demo_site();
  const auto check = [&](const std::string& target, const std::string& says) {
    const std::string reply = raw_exchange(port_, "GET " + target + " HTTP/1.1\r\nHost: x\r\n\r\n");
    ASSERT_EQ(status_of(reply), 400) << target << "\n" << reply;
    const auto problem = body_of(reply);
    EXPECT_EQ(problem["parameter"], "run") << reply;
    EXPECT_NE(problem["detail"].get<std::string>().find(says), std::string::npos) << reply;
  };
  check("/v1/sites/cove/transects/T1/series?run=%ff", "is not text");
  check("/v1/sites/cove/summary?run=1=1", "holds \"=\"");
  check("/v1/sites/cove/summary?run=1&run=2", "more than once");
  const std::string reply = raw_exchange(port_, "DELETE /v1/sites/cove/uploads/1?reason=bad%e9byte HTTP/1.1\r\n"
                                                "Host: x\r\nAuthorization: Bearer " + write_key_ + "\r\n\r\n");
  EXPECT_EQ(status_of(reply), 400) << reply;
  EXPECT_EQ(body_of(reply)["parameter"], "reason");
  expect_alive();
  auto uploads = client().Get("/v1/sites/cove/uploads");
  ASSERT_TRUE(uploads);
  EXPECT_EQ(uploads->status, 200);
}

TEST_F(HttpHardening, BearerSchemeIsCaseInsensitive) {
  start();
  for (const char* scheme : {"bearer", "BEARER", "Bearer"}) {
    const std::string id = std::string("site-") + scheme;
    auto r = client().Post("/v1/sites", {{"Authorization", std::string(scheme) + " " + write_key_}},
                           R"({"id":")" + id + R"(","name":"Invented","crs":"EPSG:32631"})", "application/json");
    ASSERT_TRUE(r);
    EXPECT_EQ(r->status, 201) << scheme << ": " << r->body;
  }
  auto basic = client().Post("/v1/sites", {{"Authorization", "Basic " + write_key_}},
                             R"({"id":"x","name":"x","crs":"EPSG:32631"})", "application/json");
  expect_problem(basic, 401, "/problems/unauthorized");
}

TEST_F(HttpHardening, FramingHeadersThatDisagreeAreRefused) {
  start();
  create_demo_site();
  const std::string auth = "Authorization: Bearer " + write_key_ + "\r\n";
  const std::string two_lengths = raw_exchange(
      port_, "POST /v1/sites/cove/observations HTTP/1.1\r\nHost: x\r\n" + auth +
                 "Content-Type: text/csv\r\nContent-Length: 5\r\nContent-Length: 50\r\n\r\nabcde");
  EXPECT_EQ(status_of(two_lengths), 400) << two_lengths;
  EXPECT_NE(body_of(two_lengths)["detail"].get<std::string>().find("Content-Length"), std::string::npos);
  const std::string gzip = raw_exchange(
      port_, "POST /v1/sites/cove/observations HTTP/1.1\r\nHost: x\r\n" + auth +
                 "Content-Type: text/csv\r\nContent-Encoding: gzip\r\nContent-Length: 4\r\n\r\nabcd");
  EXPECT_EQ(status_of(gzip), 415) << gzip;
  expect_alive();
}

// The old main read a whole unkeyed body before refusing it, and waited 30 s for a declared body that never came.
TEST_F(HttpHardening, KeyAndDeclaredSizeAreCheckedBeforeTheBodyIsRead) {
  http::ServiceOptions options;
  options.max_body_bytes = 1 << 20;
  start(options);
  create_demo_site();
  const auto t0 = std::chrono::steady_clock::now();
  const std::string unkeyed = raw_exchange(
      port_, "POST /v1/sites/cove/observations HTTP/1.1\r\nHost: x\r\nContent-Type: text/csv\r\n"
             "Content-Length: 1000000\r\n\r\n", 3000);
  EXPECT_EQ(status_of(unkeyed), 401) << unkeyed;
  EXPECT_NE(unkeyed.find("Connection: close"), std::string::npos) << unkeyed;
  const std::string huge = raw_exchange(
      port_, "POST /v1/sites/cove/observations HTTP/1.1\r\nHost: x\r\nAuthorization: Bearer " + write_key_ +
                 "\r\nContent-Type: text/csv\r\nContent-Length: 2147483648\r\n\r\n", 3000);
  EXPECT_EQ(status_of(huge), 413) << huge;
  const std::string readonly = raw_exchange(
      port_, "POST /v1/sites/cove/observations HTTP/1.1\r\nHost: x\r\nAuthorization: Bearer " + read_key_ +
                 "\r\nContent-Type: text/csv\r\nContent-Length: 1000\r\n\r\n", 3000);
  EXPECT_EQ(status_of(readonly), 403) << readonly;
  // None of the three waited for its body.
  EXPECT_LT(std::chrono::steady_clock::now() - t0, std::chrono::seconds(3));
  expect_alive();
}

TEST_F(HttpHardening, RepliesForbidContentSniffing) {
  start();
  auto h = client().Get("/healthz");
  ASSERT_TRUE(h);
  EXPECT_EQ(h->get_header_value("X-Content-Type-Options"), "nosniff");
  auto missing = client().Get("/v1/sites/none");
  ASSERT_TRUE(missing);
  EXPECT_EQ(missing->get_header_value("X-Content-Type-Options"), "nosniff");
}

// 100,000 nested arrays overflowed the stack of the old main (exit 139).
TEST_F(HttpHardening, DeeplyNestedJsonIsRefusedOnEveryJsonRoute) {
  start();
  create_demo_site();
  const std::string deep = std::string(100000, '[') + std::string(100000, ']');
  const std::string deep_member = R"({"id":"deep","name":"x","crs":"EPSG:32631","processing_defaults":)" + deep + "}";
  for (const auto& [path, body] : std::vector<std::pair<std::string, std::string>>{
           {"/v1/sites/cove/shorelines", deep},
           {"/v1/sites/cove/tide-constituents", deep},
           {"/v1/sites/cove/runs", deep},
           {"/v1/sites/cove/observations", R"({"observations":)" + deep + "}"},
           {"/v1/sites", deep_member}}) {
    auto r = post(path, body, "application/json", write_key_);
    expect_problem(r, 400, "/problems/bad-json");
    if (r) EXPECT_NE(r->body.find("nested deeper than 64"), std::string::npos) << path << ": " << r->body;
    expect_alive();
  }
}

TEST_F(HttpHardening, NumbersTooLargeAndUtf16BodiesAreClientErrors) {
  start();
  create_demo_site();
  auto overflow = post("/v1/sites/cove/observations",
                       R"({"observations":[{"transect_id":"T1","time":"2020-01-01T10:00:00Z","chainage_m":1e400,)"
                       R"("sensor":"sentinel2a","image_id":"A"}]})",
                       "application/json", write_key_);
  expect_problem(overflow, 400, "/problems/bad-json");
  if (overflow) EXPECT_NE(overflow->body.find("number overflow"), std::string::npos) << overflow->body;
  std::string utf16 = "\xFF\xFE";
  for (char ch : std::string(R"({"id":"u","name":"u","crs":"EPSG:32631"})")) utf16 += std::string{ch, '\0'};
  auto r = post("/v1/sites", utf16, "application/json", write_key_);
  expect_problem(r, 400, "/problems/bad-json");
  if (r) EXPECT_NE(r->body.find("UTF-16"), std::string::npos) << r->body;
  expect_alive();
}

// The old main stored an image id holding a Latin-1 byte (201), and every later run of the site failed.
TEST_F(HttpHardening, UploadTextThatIsNotUtf8IsRefusedNamingLineAndField) {
  start();
  create_demo_site();
  std::string csv = observations_csv(3);
  const auto at = csv.find("IMG1");
  csv.replace(at, 4, "IMG\xE9");
  auto r = post(upload_path(), csv, "text/csv", write_key_);
  ASSERT_TRUE(r);
  EXPECT_EQ(r->status, 422) << r->body;
  EXPECT_EQ(r->get_header_value("Content-Type"), "application/problem+json");
  const auto problem = json::parse(r->body);  // the reply itself is valid UTF-8
  ASSERT_EQ(problem["rows"].size(), 1u) << r->body;
  EXPECT_EQ(problem["rows"][0]["field"], "image_id");
  EXPECT_EQ(problem["rows"][0]["line"], 4);  // IMG1 is on the 4th line (header, T1 IMG0, T2 IMG0)
  auto uploads = client().Get("/v1/sites/cove/uploads");
  ASSERT_TRUE(uploads);
  EXPECT_EQ(json::parse(uploads->body)["uploads"].size(), 0u);
  // NUL in a field is refused the same way.
  std::string nul = observations_csv(1);
  nul.insert(nul.find("IMG0"), std::string(1, '\0'));
  auto n = post(upload_path(), nul, "text/csv", write_key_);
  ASSERT_TRUE(n);
  EXPECT_EQ(n->status, 422) << n->body;
}

TEST_F(HttpHardening, EmptyUploadsAreNotRecorded) {
  start();
  create_demo_site();
  auto r = post(upload_path(), "transect_id,time,chainage_m,sensor,image_id\n", "text/csv", write_key_);
  ASSERT_TRUE(r);
  EXPECT_EQ(r->status, 422) << r->body;
  EXPECT_NE(r->body.find("no data rows"), std::string::npos) << r->body;
  auto uploads = client().Get("/v1/sites/cove/uploads");
  ASSERT_TRUE(uploads);
  EXPECT_EQ(json::parse(uploads->body)["uploads"].size(), 0u);
}

// 23 MB of bad rows gave a 36 MB reply on the old main.
TEST_F(HttpHardening, RowErrorListsAreCappedWithTheirCount) {
  start();
  create_demo_site();
  std::ostringstream csv;
  csv << "transect_id,time,chainage_m,sensor,image_id\n";
  for (int i = 0; i < 5000; ++i) csv << "T1,2020-01-01T10:00:00Z," << std::string(300, 'x') << ",sentinel2a,I" << i << "\n";
  auto r = post(upload_path(), csv.str(), "text/csv", write_key_);
  ASSERT_TRUE(r);
  ASSERT_EQ(r->status, 422) << r->body.substr(0, 500);
  const auto problem = json::parse(r->body);
  EXPECT_EQ(problem["rows"].size(), 1000u);
  EXPECT_EQ(problem["row_count"], 5000);
  EXPECT_EQ(problem["rows"][0]["line"], 2);
  EXPECT_LT(problem["rows"][0]["value"].get<std::string>().size(), 240u);  // a long value is quoted shortened
  EXPECT_LT(r->body.size(), 400000u);
}

TEST_F(HttpHardening, SiteCrsNamesNoFile) {
  start();
  for (const char* crs : {"+proj=utm +zone=31 +datum=WGS84 +nadgrids=/etc/passwd",
                          "+proj=utm +zone=31 +datum=WGS84",
                          R"(PROJCRS["x",BASEGEOGCRS["WGS 84",DATUM["d",ELLIPSOID["e",6378137,298.257223563]]],)"
                          R"(CONVERSION["c",METHOD["NTv2",ID["EPSG",9615]],PARAMETERFILE["Latitude and longitude difference file","/etc/passwd"]]])"}) {
    json site = {{"id", "grid"}, {"name", "x"}, {"crs", crs}};
    auto r = post("/v1/sites", site.dump(), "application/json", write_key_);
    expect_problem(r, 422, "/problems/invalid-body");
    if (r) EXPECT_EQ(json::parse(r->body)["pointer"], "/crs") << r->body;
  }
  for (const char* crs : {"EPSG:32631", "32631"}) {
    json site = {{"id", std::string("ok") + crs[0]}, {"name", "x"}, {"crs", crs}};
    auto r = post("/v1/sites", site.dump(), "application/json", write_key_);
    ASSERT_TRUE(r);
    EXPECT_EQ(r->status, 201) << crs << ": " << r->body;
  }
}

// A full disk (a size limit here) is 507 and nothing of the upload is stored.
TEST_F(HttpHardening, FullStoreIs507AndKeepsNothingOfTheRequest) {
  start();
  create_demo_site();
  auto* sqlite = dynamic_cast<store::SqliteStore*>(store_.get());
  ASSERT_NE(sqlite, nullptr);
  sqlite->limit_size(std::filesystem::file_size(dir_ / "service.db") + 8192);
  auto r = post(upload_path(), observations_csv(4000), "text/csv", write_key_);
  expect_problem(r, 507, "/problems/insufficient-storage");
  sqlite->limit_size(0);
  auto uploads = client().Get("/v1/sites/cove/uploads");
  ASSERT_TRUE(uploads);
  EXPECT_EQ(json::parse(uploads->body)["uploads"].size(), 0u);
  auto again = post(upload_path(), observations_csv(4000), "text/csv", write_key_);
  ASSERT_TRUE(again);
  EXPECT_EQ(again->status, 201) << again->body;
}

// A key scoped to one site acts on that site only.
TEST_F(HttpHardening, SiteScopedKeysStayOnTheirSite) {
  start();
  create_demo_site();
  auto scoped = store::generate_api_key("cove-only", "write", {.site_id = "cove", .expires = std::nullopt});
  store_->add_key(scoped.record);
  auto own = post(upload_path(), observations_csv(2), "text/csv", scoped.secret);
  ASSERT_TRUE(own);
  EXPECT_EQ(own->status, 201) << own->body;
  auto other = post("/v1/sites/elsewhere/observations", observations_csv(2), "text/csv", scoped.secret);
  expect_problem(other, 403, "/problems/forbidden");
  auto create = post("/v1/sites", R"({"id":"new","name":"x","crs":"EPSG:32631"})", "application/json", scoped.secret);
  expect_problem(create, 403, "/problems/forbidden");
  auto expired = store::generate_api_key("old", "write", {.site_id = std::nullopt, .expires = store::utc_now_s() - 1});
  store_->add_key(expired.record);
  expect_problem(post(upload_path(), observations_csv(2), "text/csv", expired.secret), 401, "/problems/unauthorized");
}
