// The table that server/http/embed_web_files.cmake writes at build time
// (embedded_web_files.cpp in the build folder): each dashboard file's URL path and bytes.
#pragma once

#include <cstddef>

namespace strandline::http {

struct EmbeddedWebFile {
  const char* url_path;
  const unsigned char* data;
  std::size_t size;
};
extern const EmbeddedWebFile kEmbeddedWebFiles[];
extern const std::size_t kEmbeddedWebFileCount;

}  // namespace strandline::http
