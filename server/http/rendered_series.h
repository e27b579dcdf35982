// Series replies rendered from a run's typed rows (JSON or CSV, identity or
// gzip), kept in a bounded least-recently-used cache: a run's result never
// changes, so a document is rendered and compressed once per process and
// encoding, and sent to every client after that without a copy.
#pragma once

#include <cstdint>
#include <functional>
#include <future>
#include <list>
#include <memory>
#include <mutex>
#include <string>
#include <unordered_map>

namespace strandline::http {

class RenderedSeriesCache {
 public:
  using Document = std::shared_ptr<const std::string>;

  explicit RenderedSeriesCache(std::size_t max_bytes) : max_bytes_(max_bytes) {}

  // The cached document under `key`, or `render()`'s, stored before it is
  // returned. One render per key at a time: concurrent readers of a document
  // being rendered wait for it (after a run, every client asks for the new
  // documents at once). A render that throws is not cached; its waiters see the error.
  Document get_or_render(const std::string& key, const std::function<std::string()>& render);
  std::size_t bytes() const;

 private:
  struct Entry {
    std::string key;
    Document document;
  };
  std::size_t max_bytes_;
  mutable std::mutex mutex_;
  std::list<Entry> entries_;  // most recent first
  std::unordered_map<std::string, std::list<Entry>::iterator> by_key_;
  std::unordered_map<std::string, std::shared_future<Document>> rendering_;
  std::size_t bytes_ = 0;
};

}  // namespace strandline::http
