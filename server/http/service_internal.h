// Shared by the route files of the service (and only by them: it includes
// httplib.h). A route handler receives a Context and either fills the response
// or throws a Problem / store error, which the router renders as RFC 7807.
#pragma once

#include <atomic>
#include <filesystem>
#include <functional>
#include <optional>
#include <string>
#include <thread>

#include <httplib.h>
#include <nlohmann/json.hpp>

#include "server/http/metrics.h"
#include "server/http/problem.h"
#include "server/http/rendered_series.h"
#include "server/app/run_manager.h"
#include "server/http/service.h"
#include "server/store/store.h"

namespace strandline::http {

enum class Access { open, read, write };

struct Context {
  const httplib::Request& req;
  httplib::Response& res;
  Service::Impl& service;
  std::string key_name;  // who is calling ("anonymous" without a key)

  std::string path_param(std::size_t i) const { return req.matches[i + 1]; }
  std::optional<std::string> query(const std::string& name) const;
  // A positive integer query parameter with a default and a maximum; 400 otherwise.
  std::int64_t query_integer(const std::string& name, std::int64_t fallback, std::int64_t max) const;
  nlohmann::json json_body() const;  // 415 unless application/json or geo+json, 400 on bad JSON
  void reply(int status, const nlohmann::json& body);
  void reply_text(int status, std::string body, const std::string& content_type);
  // 404 Problem when the site does not exist.
  store::Site site_or_404(const std::string& site_id) const;
};

using HandlerFn = void (*)(Context&);

struct Route {
  RouteInfo info;
  Access access;
  HandlerFn handler;
};

// Each route file contributes its table.
std::vector<Route> site_routes();
std::vector<Route> upload_routes();
std::vector<Route> run_routes();
std::vector<Route> meta_routes();
std::vector<Route> geodata_routes();

// Every route of the service, in one table (the router, the screen and the OpenAPI test read it).
const std::vector<Route>& route_table();
const Route* find_route(const std::string& method, const std::string& path);

// The key of "Authorization: Bearer <key>" (scheme case-insensitive), or "".
std::string bearer_token(const httplib::Request& req);

struct Service::Impl {
  Impl(store::Store& store, ServiceOptions options);

  store::Store& store;
  ServiceOptions options;
  Metrics metrics;
  RenderedSeriesCache series_cache{std::size_t{64} << 20};
  app::RunManager runs;
  httplib::Server server;
  std::thread listener;
  std::atomic<std::size_t> in_flight{0};
  int port = -1;
  int listen_socket = -1;  // recorded when the server creates it (see Service::bind)
  std::optional<std::filesystem::path> static_root;  // `--static DIR`, canonical; else the built-in files

  void install_routes();
  void dispatch(const Route& route, const httplib::Request& req, httplib::Response& res);
};

// A transect's series of one run as sent (JSON or CSV, identity or gzip), from the cache.
RenderedSeriesCache::Document series_document(Service::Impl& service, const std::string& site_id,
                                              const std::string& transect, std::int64_t run_id,
                                              const std::string& format, bool gzip);
// Renders the gzip documents of a finished run ahead of the first reader.
void warm_series_cache(Service::Impl& service, const app::RunManager::RunEnded& run);

// Answers a GET that names no API route with a dashboard file, or 404/400 (routes_web.cpp).
void serve_web_file(Service::Impl& service, const httplib::Request& req, httplib::Response& res);

// Checks what can be checked before the body is read (text of path and query,
// framing headers, route, key); refuses with a problem and a closed connection.
httplib::Server::HandlerResponse screen_request(Service::Impl& service, const httplib::Request& req,
                                                httplib::Response& res);
// The key name screen_request authorised the current request as ("anonymous" without a key).
const std::string& screened_caller();

// Logs an unexpected failure, its text made printable.
void log_internal_error(const httplib::Request& req, const std::string& what);

// Renders a problem into the response.
void write_problem(httplib::Response& res, const Problem& p, const std::string& instance);

// True (and the reply set to 304) when If-None-Match names `etag` (or its
// gzip form "<etag>.gz": the document is the same) or is "*".
bool not_modified(Context& c, const std::string& etag);

// Writes `text` for a GET with an ETag, or 304 when If-None-Match matches.
void reply_with_etag(Context& c, const std::string& etag, std::string text, const std::string& content_type);

// Sends a rendered document as is: with `gzip`, a gzip member with
// Content-Encoding gzip under the ETag "<etag>.gz". Replies vary by Accept-Encoding.
void reply_document(Context& c, const std::string& etag, RenderedSeriesCache::Document document,
                    const std::string& content_type, bool gzip);

}  // namespace strandline::http
