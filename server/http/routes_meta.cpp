// Health, metrics and the API description.
#include "server/http/openapi.h"
#include "server/http/service_internal.h"

namespace strandline::http {

namespace {

void healthz(Context& c) {
  try {
    c.service.store.sites("", 1);  // the store answers a read
  } catch (const std::exception& e) {
    throw Problem(503, problem_type::internal, "Store unavailable", e.what());
  }
  c.reply(200, {{"status", "ok"}, {"version", STRANDLINE_VERSION}, {"runs_active", c.service.runs.active()}});
}

void metrics(Context& c) {
  c.reply_text(200, c.service.metrics.render(c.service.runs.active(), c.service.in_flight.load()),
               "text/plain; version=0.0.4");
}

void openapi(Context& c) { c.reply(200, openapi_document()); }

}  // namespace

std::vector<Route> meta_routes() {
  return {
      {{"GET", "/healthz"}, Access::open, healthz},
      {{"GET", "/metrics"}, Access::open, metrics},
      {{"GET", "/v1/openapi.json"}, Access::open, openapi},
  };
}

}  // namespace strandline::http
