#include <chrono>
#include <iostream>
#include <regex>

#include <sys/socket.h>

#include "corrections/core/errors.h"
#include "corrections/core/json_text.h"
#include "corrections/core/utf8_text.h"
#include "server/http/service_internal.h"

namespace strandline::http {

namespace {


// /v1/sites/{site} -> ^/v1/sites/([^/]+)$ (cpp-httplib matches the decoded path).
std::string route_regex(const std::string& path) {
  static const std::regex param(R"(\{[a-z_]+\})");
  std::string escaped = std::regex_replace(path, std::regex(R"([.])"), R"(\.)");
  return std::regex_replace(escaped, param, "([^/]+)");
}

struct InFlight {
  std::atomic<std::size_t>& n;
  std::size_t now;
  explicit InFlight(std::atomic<std::size_t>& n) : n(n), now(++n) {}
  ~InFlight() { --n; }
};

// Replies are JSON text whatever a message quotes: bytes that are not UTF-8 become U+FFFD.
std::string json_text(const nlohmann::json& body) {
  return body.dump(-1, ' ', false, nlohmann::json::error_handler_t::replace);
}

}  // namespace

const std::vector<Route>& route_table() {
  static const std::vector<Route> table = [] {
    std::vector<Route> out;
    for (auto part : {meta_routes(), site_routes(), upload_routes(), run_routes(), geodata_routes()})
      out.insert(out.end(), part.begin(), part.end());
    return out;
  }();
  return table;
}

void log_internal_error(const httplib::Request& req, const std::string& what) {
  std::cerr << "strandline serve: " << req.method << " " << printable_text(req.path)
            << ": internal error: " << printable_text(what) << "\n";
}

void write_problem(httplib::Response& res, const Problem& p, const std::string& instance) {
  res.status = p.status;
  res.set_content(json_text(p.to_json(printable_text(instance))), kProblemContentType);
}

std::optional<std::string> Context::query(const std::string& name) const {
  if (!req.has_param(name.c_str())) return std::nullopt;
  return req.get_param_value(name.c_str());
}

std::int64_t Context::query_integer(const std::string& name, std::int64_t fallback, std::int64_t max) const {
  auto text = query(name);
  if (!text) return fallback;
  std::int64_t v = 0;
  std::size_t used = 0;
  try {
    v = std::stoll(*text, &used);
  } catch (...) {
    used = 0;
  }
  if (used != text->size() || v < 0 || v > max)
    throw Problem(400, problem_type::bad_request, "Bad query parameter",
                  "query parameter \"" + name + "\" must be an integer from 0 to " + std::to_string(max),
                  {{"parameter", name}});
  return v;
}

nlohmann::json Context::json_body() const {
  // GeoJSON's own media type (RFC 7946) is JSON too.
  const std::string type = req.get_header_value("Content-Type");
  if (type.rfind("application/json", 0) != 0 && type.rfind("application/geo+json", 0) != 0)
    throw Problem(415, problem_type::unsupported_media_type, "Unsupported media type",
                  "expected Content-Type application/json (or application/geo+json), got \"" + type + "\"");
  try {
    return parse_json_text(req.body, "body");
  } catch (const JsonTextError& e) {
    throw Problem(400, problem_type::bad_json, "Malformed JSON", e.what());
  }
}

void Context::reply(int status, const nlohmann::json& body) {
  res.status = status;
  res.set_content(json_text(body), "application/json");
}

void Context::reply_text(int status, std::string body, const std::string& content_type) {
  res.status = status;
  res.body = std::move(body);  // series replies are large: no copy
  res.set_header("Content-Type", content_type);
}

store::Site Context::site_or_404(const std::string& site_id) const {
  auto site = service.store.site(site_id);
  if (!site) throw Problem(404, problem_type::not_found, "Not found", "site \"" + site_id + "\" not found");
  return *site;
}

bool not_modified(Context& c, const std::string& etag) {
  c.res.set_header("Vary", "Accept-Encoding");
  const std::string match = c.req.get_header_value("If-None-Match");
  const std::string identity = "\"" + etag + "\"", member = "\"" + etag + ".gz\"";
  if (match.empty() ||
      !(match == "*" || match.find(identity) != std::string::npos || match.find(member) != std::string::npos))
    return false;
  c.res.set_header("ETag", identity);
  c.res.status = 304;
  return true;
}

void reply_with_etag(Context& c, const std::string& etag, std::string text, const std::string& content_type) {
  if (not_modified(c, etag)) return;
  c.res.set_header("ETag", "\"" + etag + "\"");
  c.reply_text(200, std::move(text), content_type);
}

void reply_document(Context& c, const std::string& etag, RenderedSeriesCache::Document document,
                    const std::string& content_type, bool gzip) {
  if (not_modified(c, etag)) return;
  c.res.set_header("ETag", "\"" + etag + (gzip ? ".gz\"" : "\""));
  c.res.status = 200;
  if (gzip) c.res.set_header("Content-Encoding", "gzip");
  // A fixed-length content provider is sent as is (the server compresses only
  // bodies and chunked providers), so the cached document goes out without a copy.
  c.res.set_content_provider(document->size(), content_type,
                             [document](std::size_t offset, std::size_t length, httplib::DataSink& sink) {
                               return sink.write(document->data() + offset, length);
                             });
}

Service::Impl::Impl(store::Store& store, ServiceOptions options)
    : store(store),
      options(options),
      runs(store,
           [this](const app::RunManager::RunEnded& run) {
             metrics.count_run(run.state);
             warm_series_cache(*this, run);
           },
           options.run_workers, options.max_queued_runs) {}

void Service::Impl::dispatch(const Route& route, const httplib::Request& req, httplib::Response& res) {
  const auto start = std::chrono::steady_clock::now();
  InFlight guard(in_flight);
  Context c{req, res, *this, "anonymous"};
  try {
    if (guard.now > options.max_concurrent_requests) {
      metrics.count_overload();
      res.set_header("Retry-After", std::to_string(options.retry_after_s));
      throw Problem(503, problem_type::overloaded, "Service overloaded",
                    "more than " + std::to_string(options.max_concurrent_requests) +
                        " requests in progress; retry after " + std::to_string(options.retry_after_s) + " s");
    }
    // The key was checked before the body was read (screen_request).
    c.key_name = screened_caller();
    route.handler(c);
  } catch (const Problem& p) {
    write_problem(res, p, req.path);
  } catch (const store::ConflictError& e) {
    nlohmann::json rows = nlohmann::json::array();
    for (const auto& r : e.rows) {
      nlohmann::json j = {{"line", r.line}, {"key", r.key}, {"reason", r.reason}};
      if (!r.field.empty()) j["field"] = r.field;
      rows.push_back(j);
    }
    write_problem(res,
                  Problem(409, problem_type::conflict, "Conflict with stored rows",
                          std::to_string(e.rows.size()) + " row(s) contradict stored values; nothing was stored",
                          {{"rows", rows}}),
                  req.path);
  } catch (const store::StorageFull& e) {
    log_internal_error(req, e.what());
    write_problem(res,
                  Problem(507, problem_type::insufficient_storage, "Insufficient storage",
                          "the store is full; nothing of this request was stored. An operator must free space "
                          "or raise --max-db-mb"),
                  req.path);
  } catch (const store::AlreadyExists& e) {
    write_problem(res, Problem(409, problem_type::already_exists, "Already exists", e.what()), req.path);
  } catch (const store::NotFound& e) {
    write_problem(res, Problem(404, problem_type::not_found, "Not found", e.what()), req.path);
  } catch (const ConfigError& e) {
    write_problem(res,
                  Problem(422, problem_type::invalid_config, "Invalid run options", e.what(), {{"pointer", e.pointer}}),
                  req.path);
  } catch (const InputError& e) {
    write_problem(res, Problem(422, problem_type::invalid_body, "Invalid input", e.what()), req.path);
  } catch (const std::exception& e) {
    log_internal_error(req, e.what());
    write_problem(res, Problem(500, problem_type::internal, "Internal error", e.what()), req.path);
  }
  metrics.observe_request(req.method, route.info.path, res.status,
                          std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count());
}

void Service::Impl::install_routes() {
  server.set_pre_routing_handler(
      [this](const httplib::Request& req, httplib::Response& res) { return screen_request(*this, req, res); });
  for (const auto& route : route_table()) {
    auto handler = [this, &route](const httplib::Request& req, httplib::Response& res) { dispatch(route, req, res); };
    const std::string pattern = route_regex(route.info.path);
    if (route.info.method == "GET") server.Get(pattern, handler);
    else if (route.info.method == "POST") server.Post(pattern, handler);
    else if (route.info.method == "PUT") server.Put(pattern, handler);
    else if (route.info.method == "DELETE") server.Delete(pattern, handler);
  }
  // Registered last: the API routes above match first.
  server.Get(R"(/.*)", [this](const httplib::Request& req, httplib::Response& res) { serve_web_file(*this, req, res); });
  // Responses cpp-httplib produces itself (unknown path, body too large) get a
  // problem body too; handler responses already carry one.
  server.set_error_handler(httplib::Server::HandlerWithResponse([](const httplib::Request& req, httplib::Response& res) {
    if (!res.body.empty()) return httplib::Server::HandlerResponse::Unhandled;
    if (res.status == 413)
      write_problem(res, Problem(413, problem_type::too_large, "Payload too large", "the request body exceeds the limit"),
                    req.path);
    else if (res.status == 404)
      write_problem(res, Problem(404, problem_type::not_found, "Not found", "no route for " + req.method + " " + printable_text(req.path)),
                    req.path);
    else
      write_problem(res, Problem(res.status, problem_type::bad_request, "Bad request", "the request was refused"),
                    req.path);
    return httplib::Server::HandlerResponse::Handled;
  }));
  server.set_exception_handler([](const httplib::Request& req, httplib::Response& res, std::exception_ptr ep) {
    std::string what = "unknown exception";
    try {
      if (ep) std::rethrow_exception(ep);
    } catch (const std::exception& e) {
      what = e.what();
    } catch (...) {
    }
    log_internal_error(req, what);
    write_problem(res, Problem(500, problem_type::internal, "Internal error", what), req.path);
  });
}

const std::vector<RouteInfo>& Service::routes() {
  static const std::vector<RouteInfo> infos = [] {
    std::vector<RouteInfo> out;
    for (const auto& r : route_table()) out.push_back(r.info);
    return out;
  }();
  return infos;
}

Service::Service(store::Store& store, ServiceOptions options) : impl_(std::make_unique<Impl>(store, options)) {
  store.fail_interrupted_runs();
  auto& s = impl_->server;
  const unsigned threads = std::max<unsigned>(options.http_threads, 2);
  s.new_task_queue = [threads] { return new httplib::ThreadPool(threads); };
  s.set_payload_max_length(options.max_body_bytes);
  // A client gets 10 s between reads (a slow sender cannot hold a thread for
  // long) and 1,000 requests per connection before it reconnects.
  s.set_keep_alive_max_count(1000);
  s.set_keep_alive_timeout(5);
  s.set_read_timeout(10);
  s.set_write_timeout(30);
  // Headers and body go out as separate writes: without TCP_NODELAY the body
  // waits on the client's delayed ACK of the headers.
  s.set_tcp_nodelay(true);
  // The library's own options add SO_REUSEPORT, which lets a second server
  // bind the same port and silently take half its connections: address reuse
  // only (a restart over TIME_WAIT), and the socket is kept for its backlog.
  s.set_socket_options([impl = impl_.get()](socket_t sock) {
    int yes = 1;
    ::setsockopt(sock, SOL_SOCKET, SO_REUSEADDR, &yes, sizeof yes);
    impl->listen_socket = sock;
  });
  s.set_default_headers({{"X-Content-Type-Options", "nosniff"}});
  if (!options.static_dir.empty()) {
    std::error_code ec;
    impl_->static_root = std::filesystem::canonical(options.static_dir, ec);
    if (ec || !std::filesystem::is_directory(*impl_->static_root))
      throw std::runtime_error("static folder " + options.static_dir + " is not a folder");
  }
  impl_->install_routes();
}

Service::~Service() { stop(); }

int Service::bind(const std::string& host, int port) {
  auto& s = impl_->server;
  impl_->port = port == 0 ? s.bind_to_any_port(host) : (s.bind_to_port(host, port) ? port : -1);
  // The library listens with a backlog of 5: a burst of connections (64 at
  // once from a pipeline or a load test) overflows it, and each dropped
  // handshake costs the client a 1-3 s retransmission. listen() again on the
  // bound socket raises the backlog.
  if (impl_->port > 0 && impl_->listen_socket >= 0) ::listen(impl_->listen_socket, SOMAXCONN);
  return impl_->port;
}

void Service::listen() { impl_->server.listen_after_bind(); }

void Service::start() {
  impl_->listener = std::thread([this] { impl_->server.listen_after_bind(); });
  while (!impl_->server.is_running()) std::this_thread::sleep_for(std::chrono::milliseconds(2));
}

void Service::stop() {
  if (!impl_) return;
  impl_->server.stop();
  if (impl_->listener.joinable()) impl_->listener.join();
}

app::RunManager& Service::runs() { return impl_->runs; }

}  // namespace strandline::http
