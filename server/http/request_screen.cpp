// What can be checked before a request's body is read runs here, in the HTTP
// library's pre-routing hook: the text of the path and query, the framing
// headers, the route and the caller's key. A request refused here costs no
// memory for its body, and its connection is closed rather than left holding
// an unread body.
#include <cctype>
#include <set>

#include "corrections/core/utf8_text.h"
#include "server/http/service_internal.h"
#include "server/store/api_keys.h"

namespace strandline::http {

namespace {

// The caller a screened request was authorised as, for the handler on the
// same thread (the library reads, routes and answers a request on one thread).
thread_local std::string t_caller = "anonymous";

Problem bad_request(const std::string& detail, nlohmann::json extra = nlohmann::json::object()) {
  return Problem(400, problem_type::bad_request, "Bad request", detail, std::move(extra));
}

bool iequals(std::string_view a, std::string_view b) {
  if (a.size() != b.size()) return false;
  for (std::size_t i = 0; i < a.size(); ++i)
    if (std::tolower(static_cast<unsigned char>(a[i])) != std::tolower(static_cast<unsigned char>(b[i]))) return false;
  return true;
}

// Path and query reach replies, logs and the store: they must be text.
void check_text(const httplib::Request& req) {
  if (auto fault = text_fault(req.path))
    throw bad_request("the request path is not text: " + fault->reason + " (after percent-decoding)");
  for (const auto& [name, value] : req.params) {
    if (auto fault = text_fault(name))
      throw bad_request("a query parameter name is not text: " + fault->reason, {{"parameter", printable_text(name)}});
    if (auto fault = text_fault(value))
      throw bad_request("query parameter \"" + name + "\" is not text: " + fault->reason + " (after percent-decoding)",
                        {{"parameter", name}});
    if (req.params.count(name) > 1)
      throw bad_request("query parameter \"" + name + "\" is given more than once", {{"parameter", name}});
  }
  // The library keeps the first value of "run=1=1": a value holding "=" must be encoded (%3D).
  const auto query_at = req.target.find('?');
  if (query_at == std::string::npos) return;
  std::string_view query(req.target);
  query.remove_prefix(query_at + 1);
  while (!query.empty()) {
    const auto amp = query.find('&');
    const std::string_view part = query.substr(0, amp);
    const auto eq = part.find('=');
    if (eq != std::string_view::npos && part.find('=', eq + 1) != std::string_view::npos) {
      const std::string name = printable_text(part.substr(0, eq));
      throw bad_request("query parameter \"" + name + "\": its value holds \"=\"; write it as %3D",
                        {{"parameter", name}});
    }
    if (amp == std::string_view::npos) break;
    query.remove_prefix(amp + 1);
  }
}

// Headers that decide how the body is read (RFC 9112 section 6.3).
void check_framing(const httplib::Request& req, const ServiceOptions& options) {
  const auto lengths = req.get_header_value_count("Content-Length");
  for (std::size_t i = 1; i < lengths; ++i)
    if (req.get_header_value("Content-Length", i) != req.get_header_value("Content-Length", 0))
      throw bad_request("the request has Content-Length headers with different values");
  if (lengths > 0 && req.has_header("Transfer-Encoding"))
    throw bad_request("the request has both Content-Length and Transfer-Encoding");
  if (lengths > 0) {
    const std::string text = req.get_header_value("Content-Length");
    std::size_t declared = 0;
    for (char ch : text) {
      if (ch < '0' || ch > '9' || declared > (std::size_t{1} << 50))
        throw bad_request("Content-Length \"" + printable_text(text) + "\" is not a length");
      declared = declared * 10 + static_cast<std::size_t>(ch - '0');
    }
    if (declared > options.max_body_bytes)
      throw Problem(413, problem_type::too_large, "Payload too large",
                    "the body declares " + std::to_string(declared) + " bytes; the limit is " +
                        std::to_string(options.max_body_bytes) + " (--max-body-mb)");
  }
  // A compressed body could inflate far past the limit before it is measured:
  // bodies are taken as sent (compress on the wire with TLS or not at all).
  const std::string encoding = req.get_header_value("Content-Encoding");
  if (!encoding.empty() && !iequals(encoding, "identity"))
    throw Problem(415, problem_type::unsupported_media_type, "Unsupported media type",
                  "request bodies are taken as sent: Content-Encoding \"" + printable_text(encoding) +
                      "\" is not accepted; send the body uncompressed");
}

// The route template's segments against the path's ("{...}" matches one
// non-empty segment); `site` receives the segment where the template has "{site}".
bool path_matches(std::string_view templ, std::string_view path, std::string* site = nullptr) {
  while (!templ.empty() && !path.empty()) {
    const auto ts = templ.find('/', 1), ps = path.find('/', 1);
    const std::string_view t = templ.substr(0, ts), p = path.substr(0, ps);
    const bool parameter = t.size() > 2 && t[1] == '{';
    if (parameter ? p.size() < 2 : t != p) return false;
    if (site && t == "/{site}") *site = std::string(p.substr(1));
    templ.remove_prefix(ts == std::string_view::npos ? templ.size() : ts);
    path.remove_prefix(ps == std::string_view::npos ? path.size() : ps);
  }
  return templ.empty() && path.empty();
}

}  // namespace

std::string bearer_token(const httplib::Request& req) {
  // RFC 9110 section 11.1: the scheme is case-insensitive; one or more spaces follow it.
  const std::string h = req.get_header_value("Authorization");
  constexpr std::string_view scheme = "bearer";
  if (h.size() <= scheme.size() || !iequals(std::string_view(h).substr(0, scheme.size()), scheme) ||
      h[scheme.size()] != ' ')
    return {};
  const auto start = h.find_first_not_of(' ', scheme.size());
  return start == std::string::npos ? std::string() : h.substr(start);
}

const Route* find_route(const std::string& method, const std::string& path) {
  const std::string& m = method == "HEAD" ? std::string("GET") : method;
  for (const auto& route : route_table())
    if (route.info.method == m && path_matches(route.info.path, path)) return &route;
  return nullptr;
}

// The methods the API has for this path ("GET, HEAD, POST"), empty when none.
std::string allowed_methods(const std::string& path) {
  std::set<std::string> methods;
  for (const auto& route : route_table())
    if (path_matches(route.info.path, path)) {
      methods.insert(route.info.method);
      if (route.info.method == "GET") methods.insert("HEAD");
    }
  std::string out;
  for (const auto& m : methods) out += (out.empty() ? "" : ", ") + m;
  return out;
}

const std::string& screened_caller() { return t_caller; }

httplib::Server::HandlerResponse screen_request(Service::Impl& service, const httplib::Request& req,
                                                httplib::Response& res) {
  t_caller = "anonymous";
  try {
    check_text(req);
    check_framing(req, service.options);
    const Route* route = find_route(req.method, req.path);
    const bool has_body = req.has_header("Content-Length") || req.has_header("Transfer-Encoding");
    // A request with neither header has no body (RFC 9112 6.3); cpp-httplib would
    // wait for one until the connection closes and answer 400. Saying so lets
    // `POST .../runs` without a body mean "the site's defaults". The request
    // object is the server's own, handed here before its body is read.
    if (!has_body && (req.method == "POST" || req.method == "PUT" || req.method == "DELETE"))
      const_cast<httplib::Request&>(req).set_header("Content-Length", "0");
    if (!route) {
      // A path the API serves with other methods: 405 with Allow (RFC 9110 15.5.6).
      if (const std::string allow = allowed_methods(req.path); !allow.empty()) {
        res.set_header("Allow", allow);
        throw Problem(405, problem_type::method_not_allowed, "Method not allowed",
                      req.method + " is not served on " + printable_text(req.path) + "; allowed: " + allow);
      }
      // GET and HEAD may name a static file of the dashboard; any other method
      // on an unknown path is refused before its body is read.
      if (req.method == "GET" || req.method == "HEAD" || !has_body) return httplib::Server::HandlerResponse::Unhandled;
      throw Problem(404, problem_type::not_found, "Not found", "no route for " + req.method + " " + req.path);
    }
    const auto& options = service.options;
    const bool needs_key = route->access == Access::write || (route->access == Access::read && options.read_key_required);
    const std::string token = bearer_token(req);
    if (!needs_key && token.empty()) return httplib::Server::HandlerResponse::Unhandled;
    if (token.empty()) {
      res.set_header("WWW-Authenticate", "Bearer");
      throw Problem(401, problem_type::unauthorized, "Unauthorized",
                    "this request needs an API key: Authorization: Bearer <key>");
    }
    const auto key = store::verify_api_key(service.store, token);
    if (!key) {
      res.set_header("WWW-Authenticate", "Bearer error=\"invalid_token\"");
      throw Problem(401, problem_type::unauthorized, "Unauthorized", "the API key is unknown, revoked or expired");
    }
    if (route->access == Access::write && key->role != "write")
      throw Problem(403, problem_type::forbidden, "Forbidden", "key \"" + key->name + "\" is read-only; this request writes");
    if (key->site_id) {
      std::string site;
      path_matches(route->info.path, req.path, &site);
      if (!site.empty() ? !store::key_covers_site(*key, site) : route->access == Access::write)
        throw Problem(403, problem_type::forbidden, "Forbidden",
                      "key \"" + key->name + "\" acts on site \"" + *key->site_id + "\" only");
    }
    t_caller = key->name;
    return httplib::Server::HandlerResponse::Unhandled;
  } catch (const Problem& p) {
    write_problem(res, p, req.path);
  } catch (const std::exception& e) {
    log_internal_error(req, e.what());
    write_problem(res, Problem(500, problem_type::internal, "Internal error", e.what()), req.path);
  }
  // The body (if any) is left unread: the connection cannot carry another request.
  res.set_header("Connection", "close");
  return httplib::Server::HandlerResponse::Handled;
}

}  // namespace strandline::http
