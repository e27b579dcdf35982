#include "server/http/web_files.h"

#include <algorithm>
#include <fstream>
#include <map>
#include <sstream>

#include "server/http/embedded_web_files.h"
#include "server/io/file_digest.h"

namespace strandline::http {

namespace {

std::string content_type_for(std::string_view path) {
  static const std::map<std::string, std::string, std::less<>> types = {
      {".html", "text/html; charset=utf-8"}, {".js", "text/javascript; charset=utf-8"},
      {".mjs", "text/javascript; charset=utf-8"}, {".css", "text/css; charset=utf-8"},
      {".svg", "image/svg+xml"}, {".png", "image/png"}, {".ico", "image/x-icon"},
      {".json", "application/json"}, {".txt", "text/plain; charset=utf-8"}, {".woff2", "font/woff2"}};
  const auto dot = path.rfind('.');
  if (dot != std::string_view::npos && path.find('/', dot) == std::string_view::npos)
    if (auto it = types.find(path.substr(dot)); it != types.end()) return it->second;
  return "application/octet-stream";
}

// "/" is the page itself.
std::string_view file_path(std::string_view url_path) { return url_path == "/" ? "/index.html" : url_path; }

WebFile make_file(std::string_view url_path, std::string body) {
  WebFile f{std::move(body), content_type_for(file_path(url_path)), {}};
  f.etag = sha256_hex(f.body).substr(0, 32);
  return f;
}

}  // namespace

std::optional<std::string> web_path_problem(std::string_view url_path) {
  if (url_path.empty() || url_path.front() != '/') return "the path must start with /";
  if (url_path.find('\\') != std::string_view::npos) return "the path holds a backslash";
  if (url_path.find('\0') != std::string_view::npos) return "the path holds a NUL byte";
  std::string_view rest = url_path.substr(1);
  while (!rest.empty()) {
    const auto slash = rest.find('/');
    const std::string_view segment = rest.substr(0, slash);
    if (segment.empty()) return "the path has an empty segment";
    if (segment == "." || segment == "..") return "the path has a \"" + std::string(segment) + "\" segment";
    if (slash == std::string_view::npos) break;
    rest.remove_prefix(slash + 1);
  }
  return std::nullopt;
}

std::optional<WebFile> embedded_web_file(std::string_view url_path) {
  // Built once: the bodies are part of the binary, the digests are computed on first use.
  static const std::map<std::string, WebFile, std::less<>> files = [] {
    std::map<std::string, WebFile, std::less<>> out;
    for (std::size_t i = 0; i < kEmbeddedWebFileCount; ++i) {
      const auto& e = kEmbeddedWebFiles[i];
      out.emplace(e.url_path, make_file(e.url_path, std::string(reinterpret_cast<const char*>(e.data), e.size)));
    }
    return out;
  }();
  const auto it = files.find(file_path(url_path));
  if (it == files.end()) return std::nullopt;
  return it->second;
}

std::optional<WebFile> folder_web_file(const std::filesystem::path& root, std::string_view url_path) {
  if (web_path_problem(url_path)) return std::nullopt;
  const std::string_view relative = file_path(url_path).substr(1);
  std::error_code ec;
  const auto resolved = std::filesystem::canonical(root / relative, ec);
  if (ec || !std::filesystem::is_regular_file(resolved, ec)) return std::nullopt;
  // canonical() follows symbolic links: the file must still lie under the root.
  const auto [root_end, unused] = std::mismatch(root.begin(), root.end(), resolved.begin(), resolved.end());
  if (root_end != root.end()) return std::nullopt;
  std::ifstream in(resolved, std::ios::binary);
  std::ostringstream body;
  body << in.rdbuf();
  if (!in) return std::nullopt;
  return make_file(url_path, std::move(body).str());
}

}  // namespace strandline::http
