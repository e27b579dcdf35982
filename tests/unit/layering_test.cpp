// The layers of the source tree (DEVELOPERS.md, "Layers"): each folder may
// include only the folders below it, the store interface names no backend, and
// the engine names no command-line option. Read from the sources themselves.
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <regex>
#include <string>
#include <vector>

namespace {

namespace fs = std::filesystem;
const fs::path kRoot = STRANDLINE_SOURCE_DIR;

struct Include {
  std::string file;  // relative to the root
  int line;
  std::string header;
};

std::vector<fs::path> sources_under(const std::string& folder) {
  std::vector<fs::path> out;
  for (const auto& e : fs::recursive_directory_iterator(kRoot / folder))
    if (e.is_regular_file() && (e.path().extension() == ".cpp" || e.path().extension() == ".h")) out.push_back(e.path());
  return out;
}

std::vector<Include> includes_under(const std::string& folder) {
  static const std::regex include_line(R"re(^\s*#\s*include\s*"([^"]+)")re");
  std::vector<Include> out;
  for (const auto& path : sources_under(folder)) {
    std::ifstream in(path);
    std::string text;
    int line = 0;
    while (std::getline(in, text)) {
      ++line;
      std::smatch m;
      if (std::regex_search(text, m, include_line))
        out.push_back({fs::relative(path, kRoot).string(), line, m[1].str()});
    }
  }
  return out;
}

bool starts_with(const std::string& s, const std::string& prefix) { return s.rfind(prefix, 0) == 0; }

// Every include of `folder` that starts with one of `forbidden`.
std::vector<std::string> violations(const std::string& folder, const std::vector<std::string>& forbidden,
                                    const std::vector<std::string>& allowed = {}) {
  std::vector<std::string> out;
  for (const auto& inc : includes_under(folder)) {
    bool bad = false;
    for (const auto& f : forbidden) bad = bad || starts_with(inc.header, f);
    for (const auto& a : allowed) bad = bad && inc.header != a;
    if (bad) out.push_back(inc.file + ":" + std::to_string(inc.line) + " includes " + inc.header);
  }
  return out;
}

std::string joined(const std::vector<std::string>& lines) {
  std::string s;
  for (const auto& l : lines) s += l + "\n";
  return s;
}

TEST(Layering, TheEngineIncludesNothingAboveIt) {
  EXPECT_EQ(joined(violations("corrections", {"server/", "demo_data/", "tests/", "qc/"})), "");
  EXPECT_EQ(joined(violations("qc", {"server/", "demo_data/", "tests/", "corrections/steps/", "corrections/engine/"})),
            "");
  // The pipeline runner knows the step interface, not the steps.
  EXPECT_EQ(joined(violations("corrections/engine", {"corrections/steps/", "corrections/spectral/", "corrections/tide/",
                                                     "corrections/waves/", "corrections/water_level/"})),
            "");
}

TEST(Layering, AdaptersIncludeNeitherTheApplicationNorTheFaces) {
  for (const char* adapter : {"server/io", "server/geo", "server/store"})
    EXPECT_EQ(joined(violations(adapter, {"server/app/", "server/cli/", "server/http/"})), "") << adapter;
  EXPECT_EQ(joined(violations("server/io", {"server/geo/", "server/store/"})), "");
  EXPECT_EQ(joined(violations("server/store", {"server/io/", "server/geo/"})), "");
}

TEST(Layering, TheApplicationLayerIncludesNoFace) {
  EXPECT_EQ(joined(violations("server/app", {"server/cli/", "server/http/"})), "");
}

TEST(Layering, TheFacesDoNotReachIntoEachOther) {
  EXPECT_EQ(joined(violations("server/http", {"server/cli/"})), "");
  // `strandline serve` starts the service through its one public header.
  EXPECT_EQ(joined(violations("server/cli", {"server/http/"}, {"server/http/service.h"})), "");
}

TEST(Layering, TheStoreInterfaceNamesNoBackend) {
  std::vector<std::string> bad;
  for (const auto& inc : includes_under("server/store"))
    if (inc.file == "server/store/store.h" && inc.header.find("sqlite") != std::string::npos)
      bad.push_back(inc.header);
  EXPECT_EQ(joined(bad), "");
}

TEST(Layering, TheEngineNamesNoCommandLineOption) {
  // An option is "--name" after a space, quote, backtick or parenthesis; a
  // decrement ("--k)" or "--lo;") is code, not text.
  static const std::regex option(R"re((^|[\s"'`(])--[a-z][a-z0-9-]*([\s"'`,.:]|$))re");
  std::vector<std::string> found;
  for (const char* folder : {"corrections", "qc"})
    for (const auto& path : sources_under(folder)) {
      std::ifstream in(path);
      std::string text;
      int line = 0;
      while (std::getline(in, text)) {
        ++line;
        if (std::regex_search(text, option))
          found.push_back(fs::relative(path, kRoot).string() + ":" + std::to_string(line) + ": " + text);
      }
    }
  EXPECT_EQ(joined(found), "");
}

// The checks above would pass on an empty tree: make sure they read the real one.
TEST(Layering, TheScanSeesTheSources) {
  EXPECT_GT(includes_under("corrections").size(), 50u);
  EXPECT_GT(includes_under("server/http").size(), 20u);
  EXPECT_FALSE(violations("server/http", {"server/app/"}).empty());
}

}  // namespace
