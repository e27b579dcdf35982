#include "server/http/rendered_series.h"

namespace strandline::http {

RenderedSeriesCache::Document RenderedSeriesCache::get_or_render(const std::string& key,
                                                                 const std::function<std::string()>& render) {
  std::promise<Document> promise;
  {
    std::unique_lock lock(mutex_);
    if (auto it = by_key_.find(key); it != by_key_.end()) {
      entries_.splice(entries_.begin(), entries_, it->second);
      return it->second->document;
    }
    if (auto it = rendering_.find(key); it != rendering_.end()) {
      auto pending = it->second;
      lock.unlock();
      return pending.get();
    }
    rendering_.emplace(key, promise.get_future().share());
  }
  Document document;
  try {
    document = std::make_shared<const std::string>(render());
  } catch (...) {
    promise.set_exception(std::current_exception());
    std::lock_guard lock(mutex_);
    rendering_.erase(key);
    throw;
  }
  promise.set_value(document);
  std::lock_guard lock(mutex_);
  rendering_.erase(key);
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
