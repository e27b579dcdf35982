// An output file that appears whole or not at all: written to a temporary file
// beside the target and renamed over it on commit(). Destroyed uncommitted
// (an error on the way), the temporary is removed and the target untouched.
#pragma once

#include <fstream>
#include <string>

namespace strandline {

class AtomicFile {
 public:
  explicit AtomicFile(std::string path);
  ~AtomicFile();
  AtomicFile(const AtomicFile&) = delete;
  AtomicFile& operator=(const AtomicFile&) = delete;

  std::ostream& stream() { return out_; }
  const std::string& path() const { return path_; }
  // Flushes, checks for write errors, renames into place. Throws on failure.
  void commit();

 private:
  std::string path_;
  std::string temp_path_;
  std::ofstream out_;
  bool committed_ = false;
};

// Writes `text` to `path` atomically.
void write_file_atomically(const std::string& path, const std::string& text);

}  // namespace strandline
