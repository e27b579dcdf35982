// Counters and latency histograms, rendered in the Prometheus text exposition
// format (version 0.0.4) by GET /metrics.
#pragma once

#include <array>
#include <cstdint>
#include <map>
#include <mutex>
#include <string>
#include <tuple>

namespace strandline::http {

class Metrics {
 public:
  // `route` is the route template (e.g. /v1/runs/{run}), never the raw path,
  // so the label set stays bounded.
  void observe_request(const std::string& method, const std::string& route, int status, double seconds);
  void count_rows(const std::string& kind, std::int64_t rows);
  void count_run(const std::string& state);
  void count_overload();

  std::string render(std::size_t runs_active, std::size_t requests_in_flight) const;

  static constexpr std::array<double, 12> kBucketsS = {0.001, 0.0025, 0.005, 0.01, 0.025, 0.05,
                                                       0.1,   0.25,   0.5,   1.0,  2.5,   10.0};

 private:
  struct Histogram {
    std::array<std::uint64_t, kBucketsS.size()> buckets{};
    std::uint64_t count = 0;
    double sum_s = 0;
  };
  mutable std::mutex mutex_;
  std::map<std::tuple<std::string, std::string, int>, std::uint64_t> requests_;
  std::map<std::string, Histogram> latency_;
  std::map<std::string, std::uint64_t> rows_;
  std::map<std::string, std::uint64_t> runs_;
  std::uint64_t overloads_ = 0;
};

}  // namespace strandline::http
