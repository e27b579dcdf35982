// The dashboard's files: every GET that names no API route (web_files.h).
#include <chrono>

#include "corrections/core/utf8_text.h"
#include "server/http/service_internal.h"
#include "server/http/web_files.h"

namespace strandline::http {

namespace {

// The page loads only its own files and talks only to this server; it has no
// inline script or style, so none is allowed.
constexpr const char* kContentSecurityPolicy =
    "default-src 'self'; script-src 'self'; style-src 'self'; img-src 'self' data: blob:; "
    "connect-src 'self'; object-src 'none'; base-uri 'none'; frame-ancestors 'none'; form-action 'self'";

}  // namespace

void serve_web_file(Service::Impl& service, const httplib::Request& req, httplib::Response& res) {
  const auto start = std::chrono::steady_clock::now();
  Context c{req, res, service, "anonymous"};
  try {
    if (auto why = web_path_problem(req.path)) throw Problem(400, problem_type::bad_request, "Bad request", *why);
    auto file = service.static_root ? folder_web_file(*service.static_root, req.path) : embedded_web_file(req.path);
    if (!file)
      throw Problem(404, problem_type::not_found, "Not found",
                    "no route or dashboard file for " + req.method + " " + printable_text(req.path));
    res.set_header("Content-Security-Policy", kContentSecurityPolicy);
    res.set_header("Referrer-Policy", "no-referrer");
    res.set_header("X-Frame-Options", "DENY");
    // Revalidated by ETag on every load: a new build's files are seen at once, an unchanged file costs a 304.
    res.set_header("Cache-Control", "no-cache");
    reply_with_etag(c, file->etag, std::move(file->body), file->content_type);
  } catch (const Problem& p) {
    write_problem(res, p, req.path);
  }
  service.metrics.observe_request(req.method, "/{dashboard file}", res.status,
                                  std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count());
}

}  // namespace strandline::http
