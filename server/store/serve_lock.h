// One serving process per database. SQLite lets many processes open a file,
// and a second `serve` would mark the first one's running runs as interrupted;
// this advisory lock (flock on "<db>.serve-lock", released by the kernel when
// the holder exits, even by SIGKILL) keeps a second server out while `keys`
// and `backup` still open the database beside a running server.
#pragma once

#include <stdexcept>
#include <string>

namespace strandline::store {

class ServeLock {
 public:
  // Takes the lock for `db_path`; throws AlreadyServed naming the holder.
  explicit ServeLock(const std::string& db_path);
  ~ServeLock();
  ServeLock(const ServeLock&) = delete;
  ServeLock& operator=(const ServeLock&) = delete;

  // Who holds the lock of `db_path` ("pid 123 on host since ..."), or "" when nobody does.
  static std::string holder(const std::string& db_path);

 private:
  int fd_ = -1;
  std::string path_;
};

class AlreadyServed : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

}  // namespace strandline::store
