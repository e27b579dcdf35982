#include "server/store/serve_lock.h"

#include <fcntl.h>
#include <sys/file.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <stdexcept>

#include "server/store/store.h"

namespace strandline::store {

namespace {

std::string lock_path(const std::string& db_path) { return db_path + ".serve-lock"; }

std::string read_all(int fd) {
  std::string text;
  char buffer[256];
  ssize_t n;
  while ((n = ::pread(fd, buffer, sizeof buffer, static_cast<off_t>(text.size()))) > 0) text.append(buffer, n);
  while (!text.empty() && (text.back() == '\n' || text.back() == '\0')) text.pop_back();
  return text;
}

}  // namespace

ServeLock::ServeLock(const std::string& db_path) : path_(lock_path(db_path)) {
  fd_ = ::open(path_.c_str(), O_RDWR | O_CREAT | O_CLOEXEC, 0644);
  if (fd_ < 0) throw StoreError("cannot open the lock file " + path_ + ": " + std::strerror(errno));
  if (::flock(fd_, LOCK_EX | LOCK_NB) != 0) {
    const int error = errno;
    const std::string who = read_all(fd_);
    ::close(fd_);
    fd_ = -1;
    if (error == EWOULDBLOCK)
      throw AlreadyServed("database " + db_path + " is already being served" + (who.empty() ? "" : " by " + who) +
                          " (lock " + path_ + "); stop that server or give another --db");
    throw StoreError("cannot lock " + path_ + ": " + std::strerror(error));
  }
  char host[256] = "";
  ::gethostname(host, sizeof host - 1);
  const std::string who = "pid " + std::to_string(::getpid()) + " on " + host + " since " + now_utc_text() + "\n";
  if (::ftruncate(fd_, 0) != 0 || ::pwrite(fd_, who.data(), who.size(), 0) != static_cast<ssize_t>(who.size()))
    throw StoreError("cannot write the lock file " + path_ + ": " + std::strerror(errno));
}

ServeLock::~ServeLock() {
  if (fd_ < 0) return;
  // The file stays (removing it would race with a server taking it); an unlocked file means nobody
  // serves. Emptying it is a courtesy to readers: a failure changes nothing.
  (void)!::ftruncate(fd_, 0);
  ::close(fd_);
}

std::string ServeLock::holder(const std::string& db_path) {
  const std::string path = lock_path(db_path);
  const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0) return {};
  std::string who;
  if (::flock(fd, LOCK_SH | LOCK_NB) != 0) {
    who = read_all(fd);
    if (who.empty()) who = "another process";
  }
  ::close(fd);
  return who;
}

}  // namespace strandline::store
