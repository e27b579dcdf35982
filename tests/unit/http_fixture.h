// The fixture of the HTTP tests: a real server on a loopback port over a
// fresh SQLite store with a write and a read key, a real client.
#pragma once

#include <arpa/inet.h>
#include <gtest/gtest.h>
#include <netinet/in.h>
#include <poll.h>
#include <sys/socket.h>
#include <unistd.h>

#include <atomic>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <sstream>
#include <thread>

#include <httplib.h>
#include <nlohmann/json.hpp>

#include "corrections/core/time_utc.h"
#include "server/http/service.h"
#include "server/store/api_keys.h"

namespace strandline::testing_http {

using nlohmann::json;


// Two transects as GeoJSON lines in the site CRS (origin first).
inline const char* kTransects = R"({"type":"FeatureCollection",
 "crs":{"type":"name","properties":{"name":"urn:ogc:def:crs:EPSG::32631"}},
 "features":[
  {"type":"Feature","properties":{"transect_id":"T1"},"geometry":{"type":"LineString","coordinates":[[431000,5902000],[431000,5901600]]}},
  {"type":"Feature","properties":{"transect_id":"T2"},"geometry":{"type":"LineString","coordinates":[[431100,5902000],[431100,5901600]]}}]})";

inline std::string observations_csv(int images, double offset_m = 0) {
  std::ostringstream out;
  out << "transect_id,time,chainage_m,sensor,image_id,cloud_fraction\n";
  for (int i = 0; i < images; ++i)
    for (const char* t : {"T1", "T2"}) {
      const std::string time = format_time_utc(1577872800.0 + 3600.0 * i);  // hourly from 2020-01-01T10:00Z
      out << t << "," << time << "," << 150 + i * 0.5 + offset_m << ",sentinel2a,IMG" << i << ",0.1\n";
    }
  return out.str();
}

inline std::string water_levels_csv() {
  std::ostringstream out;
  out << "time,level_m\n";
  for (int d = 1; d <= 3; ++d)
    for (int h = 0; h < 24; ++h) {
      char time[32];
      std::snprintf(time, sizeof time, "2020-01-%02dT%02d:00:00Z", d, h);
      out << time << "," << 0.5 * std::sin(h * 0.5) << "\n";
    }
  return out.str();
}

// Sends `request` as is on a fresh connection and returns what the server
// answers within `timeout_ms` (the status line and headers at least).
inline std::string raw_exchange(int port, const std::string& request, int timeout_ms = 5000) {
  const int fd = ::socket(AF_INET, SOCK_STREAM, 0);
  sockaddr_in addr{};
  addr.sin_family = AF_INET;
  addr.sin_port = htons(static_cast<std::uint16_t>(port));
  addr.sin_addr.s_addr = htonl(INADDR_LOOPBACK);
  if (::connect(fd, reinterpret_cast<sockaddr*>(&addr), sizeof addr) != 0) {
    ::close(fd);
    return "connect failed";
  }
  ::send(fd, request.data(), request.size(), MSG_NOSIGNAL);
  std::string reply;
  const auto deadline = std::chrono::steady_clock::now() + std::chrono::milliseconds(timeout_ms);
  char buffer[4096];
  while (std::chrono::steady_clock::now() < deadline) {
    pollfd p{fd, POLLIN, 0};
    const auto left = std::chrono::duration_cast<std::chrono::milliseconds>(deadline - std::chrono::steady_clock::now());
    if (::poll(&p, 1, static_cast<int>(std::max<std::int64_t>(left.count(), 1))) <= 0) break;
    const ssize_t n = ::recv(fd, buffer, sizeof buffer, 0);
    if (n <= 0) break;
    reply.append(buffer, static_cast<std::size_t>(n));
    const auto head_end = reply.find("\r\n\r\n");
    if (head_end == std::string::npos) continue;
    // Stop once the announced body is complete.
    const auto cl = reply.find("Content-Length: ");
    if (cl != std::string::npos && cl < head_end &&
        reply.size() >= head_end + 4 + std::stoul(reply.substr(cl + 16)))
      break;
  }
  ::close(fd);
  return reply;
}

inline int status_of(const std::string& reply) {
  if (reply.rfind("HTTP/1.1 ", 0) != 0) return 0;
  return std::stoi(reply.substr(9, 3));
}

inline json body_of(const std::string& reply) {
  const auto head_end = reply.find("\r\n\r\n");
  return json::parse(reply.substr(head_end + 4));
}

class HttpService : public ::testing::Test {
 protected:
  void start(http::ServiceOptions options = {}) {
    dir_ = std::filesystem::temp_directory_path() /
           ("strandline-http-" + std::to_string(getpid()) + "-" +
            ::testing::UnitTest::GetInstance()->current_test_info()->name());
    std::filesystem::remove_all(dir_);
    std::filesystem::create_directories(dir_);
    store_ = store::open_sqlite_store((dir_ / "service.db").string());
    auto w = store::generate_api_key("writer", "write");
    auto r = store::generate_api_key("reader", "read");
    store_->add_key(w.record);
    store_->add_key(r.record);
    write_key_ = w.secret;
    read_key_ = r.secret;
    service_ = std::make_unique<http::Service>(*store_, options);
    port_ = service_->bind("127.0.0.1", 0);
    ASSERT_GT(port_, 0);
    service_->start();
  }
  void TearDown() override {
    if (service_) service_->stop();
    service_.reset();
    store_.reset();
    std::filesystem::remove_all(dir_);
  }
  httplib::Client client() const {
    httplib::Client c("127.0.0.1", port_);
    c.set_read_timeout(60);
    return c;
  }
  httplib::Headers auth(const std::string& key) const { return {{"Authorization", "Bearer " + key}}; }
  httplib::Result post(const std::string& path, const std::string& body, const std::string& type,
                       const std::string& key) {
    return client().Post(path.c_str(), auth(key), body, type.c_str());
  }
  void create_demo_site() {
    auto r = post("/v1/sites",
                  R"({"id":"cove","name":"Invented Cove","crs":"EPSG:32631","reference_elevation_m":0.0,"default_slope":0.1})",
                  "application/json", write_key_);
    ASSERT_TRUE(r);
    ASSERT_EQ(r->status, 201) << r->body;
    auto t = client().Put("/v1/sites/cove/transects", auth(write_key_), kTransects, "application/json");
    ASSERT_TRUE(t);
    ASSERT_EQ(t->status, 200) << t->body;
  }
  json wait_for_run(std::int64_t run_id) {
    for (int i = 0; i < 600; ++i) {
      auto r = client().Get(("/v1/runs/" + std::to_string(run_id)).c_str());
      EXPECT_TRUE(r && r->status == 200);
      auto j = json::parse(r->body);
      if (j["state"] == "done" || j["state"] == "failed") return j;
      std::this_thread::sleep_for(std::chrono::milliseconds(50));
    }
    ADD_FAILURE() << "run did not finish";
    return {};
  }
  static void expect_problem(const httplib::Result& r, int status, const std::string& type) {
    ASSERT_TRUE(r);
    EXPECT_EQ(r->status, status) << r->body;
    EXPECT_EQ(r->get_header_value("Content-Type"), "application/problem+json");
    auto j = json::parse(r->body);
    EXPECT_EQ(j["type"], type);
    EXPECT_EQ(j["status"], status);
    EXPECT_TRUE(j.contains("detail"));
  }

  std::filesystem::path dir_;
  std::unique_ptr<store::Store> store_;
  std::unique_ptr<http::Service> service_;
  std::string write_key_, read_key_;
  int port_ = 0;
};

}  // namespace strandline::testing_http
