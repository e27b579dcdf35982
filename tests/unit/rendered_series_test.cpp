// The rendered-series cache: one render per document however many readers ask
// at once, least recently used out first within the byte budget, errors not cached.
#include <gtest/gtest.h>

#include <atomic>
#include <chrono>
#include <stdexcept>
#include <thread>
#include <vector>

#include "server/http/rendered_series.h"

namespace strandline::http {
namespace {

TEST(RenderedSeriesCache, ConcurrentReadersShareOneRender) {
  RenderedSeriesCache cache(1 << 20);
  std::atomic<int> renders{0};
  std::vector<std::thread> readers;
  std::vector<std::string> got(16);
  for (int i = 0; i < 16; ++i)
    readers.emplace_back([&, i] {
      got[i] = *cache.get_or_render("run1/T1/json", [&] {
        ++renders;
        std::this_thread::sleep_for(std::chrono::milliseconds(50));
        return std::string("document");
      });
    });
  for (auto& t : readers) t.join();
  EXPECT_EQ(renders.load(), 1);
  for (const auto& g : got) EXPECT_EQ(g, "document");
}

TEST(RenderedSeriesCache, LeastRecentlyUsedLeavesFirst) {
  RenderedSeriesCache cache(10);
  int renders = 0;
  const auto render = [&](const char* text) {
    return [&renders, text] {
      ++renders;
      return std::string(text);
    };
  };
  cache.get_or_render("a", render("aaaa"));
  cache.get_or_render("b", render("bbbb"));
  cache.get_or_render("a", render("aaaa"));  // a is now the most recent
  cache.get_or_render("c", render("cccc"));  // 12 bytes > 10: b leaves
  EXPECT_EQ(renders, 3);
  EXPECT_EQ(cache.bytes(), 8u);
  cache.get_or_render("a", render("aaaa"));
  EXPECT_EQ(renders, 3);
  cache.get_or_render("b", render("bbbb"));
  EXPECT_EQ(renders, 4);
}

TEST(RenderedSeriesCache, AFailedRenderIsNotCached) {
  RenderedSeriesCache cache(100);
  EXPECT_THROW(cache.get_or_render("k", []() -> std::string { throw std::runtime_error("gone"); }), std::runtime_error);
  EXPECT_EQ(*cache.get_or_render("k", [] { return std::string("ok"); }), "ok");
}

}  // namespace
}  // namespace strandline::http
