// `strandline serve`: the HTTP service over a Store. This header is free of
// cpp-httplib (whose <resolv.h> breaks Eigen headers included after it); the
// server itself lives in service.cpp.
#pragma once

#include <cstddef>
#include <memory>
#include <string>
#include <vector>

#include "server/store/store.h"

namespace strandline::app {
class RunManager;
}  // namespace strandline::app

namespace strandline::http {

struct ServiceOptions {
  bool read_key_required = false;
  std::string static_dir;  // the dashboard's files from this folder instead of the built-in ones
  std::size_t max_body_bytes = std::size_t{512} << 20;
  // Handler threads. With keep-alive each open connection holds one, so this
  // bounds the connections served at once; it must exceed max_concurrent_requests
  // so that the 503 path always has a thread to answer on.
  unsigned http_threads = 96;
  std::size_t max_concurrent_requests = 80;
  int retry_after_s = 1;
  unsigned run_workers = 1;
  std::size_t max_queued_runs = 32;
};

// A route as documented: method and OpenAPI path template.
struct RouteInfo {
  std::string method;  // GET, POST, PUT, DELETE
  std::string path;    // e.g. /v1/sites/{site}/uploads/{upload}
};

class Service {
 public:
  Service(store::Store& store, ServiceOptions options);
  ~Service();
  Service(const Service&) = delete;
  Service& operator=(const Service&) = delete;

  // Binds to host:port (port 0 = any free port); returns the port, or -1.
  int bind(const std::string& host, int port);
  // Serves until stop(); call after bind().
  void listen();
  // listen() on a background thread; returns once the socket accepts.
  void start();
  void stop();

  app::RunManager& runs();
  static const std::vector<RouteInfo>& routes();

  struct Impl;

 private:
  std::unique_ptr<Impl> impl_;
};

}  // namespace strandline::http
