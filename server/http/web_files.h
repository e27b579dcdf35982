// The dashboard's files (web_static/): built into the binary, or read from a
// folder given with `serve --static DIR` while the page is being worked on.
// URL layout: `/` and `/index.html` the page, `/assets/<file>` its scripts,
// styles and icon, `/vendor/<file>` the chart library. No other path is a file.
#pragma once

#include <filesystem>
#include <optional>
#include <string>
#include <string_view>

namespace strandline::http {

struct WebFile {
  std::string body;
  std::string content_type;
  std::string etag;  // from the content (unquoted)
};

// Why a path can never name a dashboard file ("..", "." or empty segments,
// backslashes, NUL), or nullopt. Paths are percent-decoded before this check.
std::optional<std::string> web_path_problem(std::string_view url_path);

// The built-in file at `url_path`, or nullopt.
std::optional<WebFile> embedded_web_file(std::string_view url_path);

// The file at `url_path` under `root` (canonical), or nullopt when there is none
// or it resolves outside `root` (a symbolic link out of the folder).
std::optional<WebFile> folder_web_file(const std::filesystem::path& root, std::string_view url_path);

}  // namespace strandline::http
