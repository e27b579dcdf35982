#include "server/http/metrics.h"

#include <sstream>

namespace strandline::http {

void Metrics::observe_request(const std::string& method, const std::string& route, int status, double seconds) {
  std::lock_guard lock(mutex_);
  ++requests_[{method, route, status}];
  auto& h = latency_[route];
  for (std::size_t i = 0; i < kBucketsS.size(); ++i)
    if (seconds <= kBucketsS[i]) ++h.buckets[i];
  ++h.count;
  h.sum_s += seconds;
}

void Metrics::count_rows(const std::string& kind, std::int64_t rows) {
  std::lock_guard lock(mutex_);
  rows_[kind] += static_cast<std::uint64_t>(rows);
}

void Metrics::count_run(const std::string& state) {
  std::lock_guard lock(mutex_);
  ++runs_[state];
}

void Metrics::count_overload() {
  std::lock_guard lock(mutex_);
  ++overloads_;
}

std::string Metrics::render(std::size_t runs_active, std::size_t requests_in_flight) const {
  std::lock_guard lock(mutex_);
  std::ostringstream out;
  out << "# HELP strandline_http_requests_total HTTP requests answered, by method, route and status.\n"
         "# TYPE strandline_http_requests_total counter\n";
  for (const auto& [key, n] : requests_)
    out << "strandline_http_requests_total{method=\"" << std::get<0>(key) << "\",route=\"" << std::get<1>(key)
        << "\",status=\"" << std::get<2>(key) << "\"} " << n << "\n";
  out << "# HELP strandline_http_request_duration_seconds Time from routing to response, by route.\n"
         "# TYPE strandline_http_request_duration_seconds histogram\n";
  for (const auto& [route, h] : latency_) {
    for (std::size_t i = 0; i < kBucketsS.size(); ++i)
      out << "strandline_http_request_duration_seconds_bucket{route=\"" << route << "\",le=\"" << kBucketsS[i]
          << "\"} " << h.buckets[i] << "\n";
    out << "strandline_http_request_duration_seconds_bucket{route=\"" << route << "\",le=\"+Inf\"} " << h.count
        << "\n";
    out << "strandline_http_request_duration_seconds_sum{route=\"" << route << "\"} " << h.sum_s << "\n";
    out << "strandline_http_request_duration_seconds_count{route=\"" << route << "\"} " << h.count << "\n";
  }
  out << "# HELP strandline_rows_stored_total Rows stored by uploads, by kind.\n"
         "# TYPE strandline_rows_stored_total counter\n";
  for (const auto& [kind, n] : rows_) out << "strandline_rows_stored_total{kind=\"" << kind << "\"} " << n << "\n";
  out << "# HELP strandline_runs_total Runs finished, by final state.\n"
         "# TYPE strandline_runs_total counter\n";
  for (const auto& [state, n] : runs_) out << "strandline_runs_total{state=\"" << state << "\"} " << n << "\n";
  out << "# HELP strandline_runs_active Runs queued or running.\n"
         "# TYPE strandline_runs_active gauge\n"
         "strandline_runs_active "
      << runs_active << "\n";
  out << "# HELP strandline_http_requests_in_flight Requests being handled.\n"
         "# TYPE strandline_http_requests_in_flight gauge\n"
         "strandline_http_requests_in_flight "
      << requests_in_flight << "\n";
  out << "# HELP strandline_http_overload_rejections_total Requests answered 503 past the concurrency limit.\n"
         "# TYPE strandline_http_overload_rejections_total counter\n"
         "strandline_http_overload_rejections_total "
      << overloads_ << "\n";
  return out.str();
}

}  // namespace strandline::http
