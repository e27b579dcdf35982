#include "server/io/atomic_file.h"

#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <stdexcept>

namespace strandline {

AtomicFile::AtomicFile(std::string path) : path_(std::move(path)) {
  temp_path_ = path_ + ".tmp." + std::to_string(::getpid());
  out_.open(temp_path_, std::ios::binary | std::ios::trunc);
  if (!out_) throw std::runtime_error("cannot write " + path_ + ": " + std::strerror(errno));
}

AtomicFile::~AtomicFile() {
  if (!committed_) {
    out_.close();
    std::error_code ec;
    std::filesystem::remove(temp_path_, ec);
  }
}

void AtomicFile::commit() {
  out_.flush();
  if (!out_) throw std::runtime_error("write error on " + path_);
  out_.close();
  if (std::rename(temp_path_.c_str(), path_.c_str()) != 0)
    throw std::runtime_error("cannot rename into " + path_ + ": " + std::strerror(errno));
  committed_ = true;
}

void write_file_atomically(const std::string& path, const std::string& text) {
  AtomicFile f(path);
  f.stream() << text;
  f.commit();
}

}  // namespace strandline
