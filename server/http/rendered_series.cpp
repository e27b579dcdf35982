#include "server/http/rendered_series.h"

namespace strandline::http {

RenderedSeriesCache::Document RenderedSeriesCache::get_or_render(const std::string& key,
                                                                 const std::function<std::string()>& render) {
  {
    std::lock_guard lock(mutex_);
    if (auto it = by_key_.find(key); it != by_key_.end()) {
      entries_.splice(entries_.begin(), entries_, it->second);
      return it->second->document;
    }
  }
  // Rendered outside the lock: two readers of a new document may both render
  // it (the same bytes), which is cheaper than serialising every miss.
  auto document = std::make_shared<const std::string>(render());
  std::lock_guard lock(mutex_);
  if (auto it = by_key_.find(key); it != by_key_.end()) return it->second->document;
  if (document->size() > max_bytes_) return document;
  entries_.push_front({key, document});
  by_key_[key] = entries_.begin();
  bytes_ += document->size();
  while (bytes_ > max_bytes_) {
    bytes_ -= entries_.back().document->size();
    by_key_.erase(entries_.back().key);
    entries_.pop_back();
  }
  return document;
}

std::size_t RenderedSeriesCache::bytes() const {
  std::lock_guard lock(mutex_);
  return bytes_;
}

}  // namespace strandline::http
