#include "server/store/sqlite_backup.h"

#include <fcntl.h>
#include <stdlib.h>
#include <sys/stat.h>
#include <sys/sysmacros.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <ctime>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <thread>
#include <vector>

#include <sqlite3.h>

#include "server/store/serve_lock.h"
#include "server/store/sqlite_schema.h"

namespace strandline::store {

namespace fs = std::filesystem;

namespace {

using Clock = std::chrono::steady_clock;

// One raw connection, closed on every path out.
class Handle {
 public:
  Handle(const std::string& path, int flags) {
    if (sqlite3_open_v2(path.c_str(), &db_, flags, nullptr) != SQLITE_OK) {
      const std::string message = db_ ? sqlite3_errmsg(db_) : "out of memory";
      sqlite3_close(db_);
      db_ = nullptr;
      throw BackupRefused("cannot open " + path + ": " + message);
    }
    sqlite3_extended_result_codes(db_, 0);
  }
  ~Handle() { close(); }
  Handle(const Handle&) = delete;
  Handle& operator=(const Handle&) = delete;
  void close() {
    if (db_) sqlite3_close(db_);
    db_ = nullptr;
  }
  sqlite3* get() const { return db_; }

 private:
  sqlite3* db_ = nullptr;
};

// A refusal for the SQLite result codes that say "this is not (or no longer) a
// database", a plain failure otherwise.
[[noreturn]] void fail(int rc, const std::string& path, const std::string& what, sqlite3* db) {
  const std::string detail = db ? sqlite3_errmsg(db) : sqlite3_errstr(rc);
  if (rc == SQLITE_NOTADB) throw BackupRefused(path + " is not a SQLite database (" + detail + ")");
  if (rc == SQLITE_CORRUPT) throw BackupRefused(path + " is damaged: " + detail);
  if (rc == SQLITE_BUSY || rc == SQLITE_LOCKED)
    throw BackupRefused(path + " is in use by another connection (a running server?): " + detail);
  throw StoreError(path + ": " + what + ": " + detail);
}

// Runs `sql` and returns the first column of every row as text.
std::vector<std::string> query(sqlite3* db, const std::string& path, const std::string& sql) {
  sqlite3_stmt* stmt = nullptr;
  int rc = sqlite3_prepare_v2(db, sql.c_str(), -1, &stmt, nullptr);
  if (rc != SQLITE_OK) fail(rc, path, "preparing " + sql, db);
  std::vector<std::string> rows;
  while ((rc = sqlite3_step(stmt)) == SQLITE_ROW) {
    const auto* text = reinterpret_cast<const char*>(sqlite3_column_text(stmt, 0));
    rows.emplace_back(text ? text : "");
  }
  sqlite3_finalize(stmt);
  if (rc != SQLITE_DONE) fail(rc, path, "executing " + sql, db);
  return rows;
}

std::int64_t query_integer(sqlite3* db, const std::string& path, const std::string& sql) {
  const auto rows = query(db, path, sql);
  return rows.empty() ? 0 : std::stoll(rows[0]);
}

// Retries `attempt` (an SQLite result code) while it reports BUSY or LOCKED,
// until `deadline`; returns the last code.
template <class F>
int retry_busy(F attempt, Clock::time_point deadline, int* retries = nullptr) {
  for (;;) {
    const int rc = attempt();
    if ((rc != SQLITE_BUSY && rc != SQLITE_LOCKED) || Clock::now() >= deadline) return rc;
    if (retries) ++*retries;
    std::this_thread::sleep_for(std::chrono::milliseconds(10));
  }
}

int exec_rc(sqlite3* db, const char* sql) { return sqlite3_exec(db, sql, nullptr, nullptr, nullptr); }

void exec(sqlite3* db, const std::string& path, const char* sql) {
  const int rc = exec_rc(db, sql);
  if (rc != SQLITE_OK) fail(rc, path, std::string("executing ") + sql, db);
}

// The Strandline schema version of an open database, or a refusal naming `path`.
int strandline_schema_version(sqlite3* db, const std::string& path) {
  const auto tables = query_integer(db, path,
                                    "SELECT COUNT(*) FROM sqlite_schema WHERE type = 'table' AND name IN "
                                    "('schema_migrations', 'sites', 'uploads', 'api_keys')");
  if (tables != 4) throw BackupRefused(path + " is not a Strandline database (no Strandline tables)");
  const auto version = query_integer(db, path, "SELECT COALESCE(MAX(version), 0) FROM schema_migrations");
  if (version < 1) throw BackupRefused(path + " is not a Strandline database (no schema version)");
  if (version > latest_sqlite_schema_version())
    throw BackupRefused(path + " has schema version " + std::to_string(version) + ", newer than this build (" +
                        std::to_string(latest_sqlite_schema_version()) + ")");
  return static_cast<int>(version);
}

void fsync_path(const std::string& path, bool directory) {
  const int fd = ::open(path.c_str(), directory ? (O_RDONLY | O_DIRECTORY) : O_RDONLY);
  if (fd < 0) throw StoreError("opening " + path + " to sync it: " + std::strerror(errno));
  const int rc = ::fsync(fd);
  const int error = errno;
  ::close(fd);
  if (rc != 0) throw StoreError("syncing " + path + ": " + std::strerror(error));
}

std::string parent_folder(const std::string& path) {
  const auto parent = fs::path(path).parent_path();
  return parent.empty() ? "." : parent.string();
}

// A temporary file beside `target` (same folder, so a rename is atomic),
// removed with its journal unless released.
class TempFile {
 public:
  explicit TempFile(const std::string& target, const char* tag) {
    std::string pattern = target + tag + "-XXXXXX";
    std::vector<char> buffer(pattern.begin(), pattern.end());
    buffer.push_back('\0');
    const int fd = ::mkstemp(buffer.data());
    if (fd < 0) throw StoreError("cannot create a temporary file beside " + target + ": " + std::strerror(errno));
    ::close(fd);
    path_ = buffer.data();
  }
  ~TempFile() {
    if (path_.empty()) return;
    std::error_code ignored;
    for (const char* suffix : {"", "-journal", "-wal", "-shm"}) fs::remove(path_ + suffix, ignored);
  }
  TempFile(const TempFile&) = delete;
  TempFile& operator=(const TempFile&) = delete;
  const std::string& path() const { return path_; }
  void release() { path_.clear(); }

 private:
  std::string path_;
};

bool non_empty_file(const std::string& path) {
  std::error_code ec;
  return fs::exists(path, ec) && fs::file_size(path, ec) > 0;
}

struct CopyResult {
  int steps = 0;
  int busy_retries = 0;
};

// Copies the database at `source` into the (new, empty) file `dest` with the
// online backup API, inside one read transaction on the source, and leaves the
// copy as a single file (rollback journal mode).
CopyResult copy_database(const std::string& source, const std::string& dest, int pages_per_step,
                         std::chrono::milliseconds pause, std::chrono::milliseconds busy_timeout) {
  CopyResult result;
  const auto deadline = Clock::now() + busy_timeout;
  // Read-write without create, queries only, like the store's readers: a
  // read-only handle cannot recover a write-ahead log's index when it is the
  // first to open the file.
  Handle src(source, SQLITE_OPEN_READWRITE | SQLITE_OPEN_NOMUTEX);
  sqlite3_busy_timeout(src.get(), 100);
  exec(src.get(), source, "PRAGMA query_only=1");
  // One read transaction over every step: the copy is this snapshot, whatever
  // other connections commit meanwhile (in WAL mode they keep committing).
  exec(src.get(), source, "BEGIN");
  int rc = retry_busy([&] { return exec_rc(src.get(), "SELECT COUNT(*) FROM sqlite_schema"); }, deadline,
                      &result.busy_retries);
  if (rc != SQLITE_OK) fail(rc, source, "starting a read transaction", src.get());
  strandline_schema_version(src.get(), source);

  Handle dst(dest, SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE | SQLITE_OPEN_NOMUTEX);
  sqlite3_backup* backup = sqlite3_backup_init(dst.get(), "main", src.get(), "main");
  if (!backup) fail(sqlite3_errcode(dst.get()), dest, "starting the copy", dst.get());
  for (;;) {
    rc = sqlite3_backup_step(backup, pages_per_step);
    if (rc == SQLITE_DONE) break;
    if (rc == SQLITE_OK) {
      ++result.steps;
      if (pause.count() > 0) std::this_thread::sleep_for(pause);
      continue;
    }
    if ((rc == SQLITE_BUSY || rc == SQLITE_LOCKED) && Clock::now() < deadline) {
      ++result.busy_retries;
      std::this_thread::sleep_for(std::chrono::milliseconds(10));
      continue;
    }
    sqlite3_backup_finish(backup);
    fail(rc, source, "copying into " + dest, src.get());
  }
  ++result.steps;
  rc = sqlite3_backup_finish(backup);
  if (rc != SQLITE_OK) fail(rc, dest, "finishing the copy", dst.get());
  exec(src.get(), source, "COMMIT");
  src.close();
  const auto mode = query(dst.get(), dest, "PRAGMA journal_mode=DELETE");
  if (mode.empty() || mode[0] != "delete") throw StoreError(dest + ": cannot leave write-ahead-log mode");
  dst.close();
  return result;
}

// UTC time for a file name: 20260314T091500Z.
std::string file_time_utc() {
  const std::time_t now = std::time(nullptr);
  std::tm parts{};
  gmtime_r(&now, &parts);
  char text[32];
  std::strftime(text, sizeof text, "%Y%m%dT%H%M%SZ", &parts);
  return text;
}

// Puts `from` at `to`: atomically replacing it when `replace`, else refusing
// an existing `to` (a hard link cannot overwrite; where links are not
// supported, a check and a rename).
void move_into_place(const std::string& from, const std::string& to, bool replace) {
  if (replace) {
    if (::rename(from.c_str(), to.c_str()) != 0)
      throw StoreError("renaming " + from + " to " + to + ": " + std::strerror(errno));
    return;
  }
  if (::link(from.c_str(), to.c_str()) == 0) {
    ::unlink(from.c_str());
    return;
  }
  if (errno == EEXIST) throw BackupRefused(to + " already exists");
  if (errno != EPERM && errno != ENOTSUP && errno != EXDEV)
    throw StoreError("linking " + from + " to " + to + ": " + std::strerror(errno));
  std::error_code ec;
  if (fs::exists(to, ec)) throw BackupRefused(to + " already exists");
  if (::rename(from.c_str(), to.c_str()) != 0)
    throw StoreError("renaming " + from + " to " + to + ": " + std::strerror(errno));
}

// The id of another process holding a lock on the database or its
// shared-memory index (every SQLite connection in WAL mode keeps one on the
// index while open, also between transactions), read from /proc/locks so that
// no descriptor of those files is opened and closed here (closing one would
// drop this process's own POSIX locks on them).
std::optional<long> other_process_locking(const std::string& db_path) {
  std::vector<std::pair<dev_t, ino_t>> files;
  for (const std::string& path : {db_path, db_path + "-shm"}) {
    struct stat st {};
    if (::stat(path.c_str(), &st) == 0) files.emplace_back(st.st_dev, st.st_ino);
  }
  std::ifstream locks("/proc/locks");
  std::string line;
  while (std::getline(locks, line)) {
    std::istringstream fields(line);
    std::string id, kind, mode, access, pid_text, file;
    fields >> id >> kind;
    if (kind == "->") continue;  // a waiter, not a holder
    fields >> mode >> access >> pid_text >> file;
    unsigned major_id = 0, minor_id = 0;
    unsigned long inode = 0;
    if (std::sscanf(file.c_str(), "%x:%x:%lu", &major_id, &minor_id, &inode) != 3) continue;
    const long pid = std::strtol(pid_text.c_str(), nullptr, 10);
    if (pid == static_cast<long>(::getpid())) continue;
    for (const auto& [dev, ino] : files)
      if (ino == inode && major(dev) == major_id && minor(dev) == minor_id) return pid;
  }
  return std::nullopt;
}

// A connection holding `db_path` exclusively, in rollback-journal mode (its
// write-ahead log checkpointed and removed); a refusal when another
// connection has the file open.
std::unique_ptr<Handle> take_exclusively(const std::string& db_path, std::chrono::milliseconds busy_timeout) {
  if (const auto pid = other_process_locking(db_path))
    throw BackupRefused(db_path + " is open in process " + std::to_string(*pid) + " (a running server?)");
  auto lock = std::make_unique<Handle>(db_path, SQLITE_OPEN_READWRITE | SQLITE_OPEN_NOMUTEX);
  sqlite3_busy_timeout(lock->get(), 0);
  const auto deadline = Clock::now() + busy_timeout;
  exec(lock->get(), db_path, "PRAGMA locking_mode=EXCLUSIVE");
  // Leaving WAL mode needs every other connection gone: a running server keeps one open.
  std::vector<std::string> mode;
  int rc = retry_busy(
      [&] {
        try {
          mode = query(lock->get(), db_path, "PRAGMA journal_mode=DELETE");
          return SQLITE_OK;
        } catch (const BackupRefused&) {
          return SQLITE_BUSY;
        }
      },
      deadline);
  if (rc != SQLITE_OK || mode.empty() || mode[0] != "delete")
    throw BackupRefused(db_path + " is in use by another connection (a running server?)");
  rc = retry_busy([&] { return exec_rc(lock->get(), "BEGIN EXCLUSIVE"); }, deadline);
  if (rc != SQLITE_OK) throw BackupRefused(db_path + " is in use by another connection (a running server?)");
  exec(lock->get(), db_path, "COMMIT");  // the exclusive lock stays until the connection closes
  if (non_empty_file(db_path + "-wal"))
    throw StoreError(db_path + "-wal is still there after the database left WAL mode");
  return lock;
}

}  // namespace

DatabaseCheck check_strandline_database(const std::string& path) {
  std::error_code ec;
  if (!fs::is_regular_file(path, ec)) throw BackupRefused(path + " does not exist or is not a file");
  Handle db(path, SQLITE_OPEN_READONLY | SQLITE_OPEN_NOMUTEX);
  sqlite3_busy_timeout(db.get(), 10000);
  DatabaseCheck check;
  check.schema_version = strandline_schema_version(db.get(), path);
  const auto problems = query(db.get(), path, "PRAGMA integrity_check(5)");
  if (problems.empty() || problems[0] != "ok") {
    std::string text;
    for (const auto& p : problems) text += (text.empty() ? "" : "; ") + p;
    throw BackupRefused(path + " is damaged (integrity check: " + text + ")");
  }
  check.pages = query_integer(db.get(), path, "PRAGMA page_count");
  check.page_size = query_integer(db.get(), path, "PRAGMA page_size");
  check.bytes = check.pages * check.page_size;
  check.sites = query_integer(db.get(), path, "SELECT COUNT(*) FROM sites");
  check.uploads = query_integer(db.get(), path, "SELECT COUNT(*) FROM uploads");
  check.keys = query_integer(db.get(), path, "SELECT COUNT(*) FROM api_keys");
  return check;
}

BackupReport backup_sqlite_database(const std::string& db_path, const std::string& out_path,
                                    const BackupOptions& options) {
  std::error_code ec;
  if (!fs::is_regular_file(db_path, ec)) throw BackupRefused("database " + db_path + " does not exist");
  if (fs::exists(out_path, ec)) {
    if (fs::equivalent(db_path, out_path, ec)) throw BackupRefused(out_path + " is the database itself");
    if (!options.force) throw BackupRefused(out_path + " already exists");
    if (!fs::is_regular_file(out_path, ec)) throw BackupRefused(out_path + " exists and is not a file");
  }
  // A log beside the output would be replayed into the new copy when it is opened.
  if (fs::exists(out_path + "-wal", ec))
    throw BackupRefused(out_path + "-wal exists (is " + out_path + " open somewhere?)");
  if (!fs::is_directory(parent_folder(out_path), ec))
    throw BackupRefused("folder " + parent_folder(out_path) + " of " + out_path + " does not exist");

  TempFile temp(out_path, ".partial");
  BackupReport report;
  const auto copied = copy_database(db_path, temp.path(), std::max(1, options.pages_per_step),
                                    options.pause_between_steps, options.busy_timeout);
  report.steps = copied.steps;
  report.busy_retries = copied.busy_retries;
  try {
    report.copy = check_strandline_database(temp.path());
  } catch (const BackupRefused& e) {
    throw StoreError("the copy of " + db_path + " failed its check: " + e.what());
  }
  fsync_path(temp.path(), false);
  move_into_place(temp.path(), out_path, options.force);
  temp.release();
  fsync_path(parent_folder(out_path), true);
  return report;
}

RestoreReport restore_sqlite_database(const std::string& backup_path, const std::string& db_path,
                                      const RestoreOptions& options) {
  std::error_code ec;
  if (!fs::is_regular_file(backup_path, ec)) throw BackupRefused("backup " + backup_path + " does not exist");
  const bool replacing = fs::exists(db_path, ec);
  if (replacing && fs::equivalent(backup_path, db_path, ec))
    throw BackupRefused(backup_path + " is the database itself");
  if (replacing && !fs::is_regular_file(db_path, ec)) throw BackupRefused(db_path + " is not a file");
  if (!replacing && non_empty_file(db_path + "-wal"))
    throw BackupRefused(db_path + "-wal exists without " + db_path + "; move it away first");
  if (!fs::is_directory(parent_folder(db_path), ec))
    throw BackupRefused("folder " + parent_folder(db_path) + " of " + db_path + " does not exist");

  // No server may start on the database while it is replaced (the serve lock),
  // and none may have it open now (the serve lock, then SQLite's own locks).
  std::optional<ServeLock> serving;
  try {
    serving.emplace(db_path);
  } catch (const AlreadyServed& e) {
    throw BackupRefused(e.what());
  }
  // The copy is checked, not the backup: what is renamed into place is what was checked.
  TempFile temp(db_path, ".restoring");
  RestoreReport report;
  try {
    copy_database(backup_path, temp.path(), 1024, std::chrono::milliseconds(0), options.busy_timeout);
    report.restored = check_strandline_database(temp.path());
  } catch (const BackupRefused& e) {
    // Name the backup, not its temporary copy.
    std::string message = e.what();
    for (auto at = message.find(temp.path()); at != std::string::npos;
         at = message.find(temp.path(), at + backup_path.size()))
      message.replace(at, temp.path().size(), backup_path);
    throw BackupRefused(message);
  }
  fsync_path(temp.path(), false);

  if (!replacing) {
    move_into_place(temp.path(), db_path, false);
    temp.release();
    fsync_path(parent_folder(db_path), true);
    return report;
  }
  const auto lock = take_exclusively(db_path, options.busy_timeout);
  if (options.keep_old) {
    const std::string base = db_path + ".before-restore-" + file_time_utc();
    std::string kept = base;
    for (int n = 2; ::link(db_path.c_str(), kept.c_str()) != 0; ++n) {
      if (errno != EEXIST || n > 99) throw StoreError("keeping " + db_path + " as " + kept + ": " + std::strerror(errno));
      kept = base + "-" + std::to_string(n);
    }
    report.kept_as = kept;
  }
  move_into_place(temp.path(), db_path, true);
  temp.release();
  fsync_path(parent_folder(db_path), true);
  lock->close();
  return report;
}

std::optional<std::string> sqlite_database_in_use(const std::string& db_path) {
  std::error_code ec;
  if (!fs::is_regular_file(db_path, ec)) return std::nullopt;
  if (const auto who = ServeLock::holder(db_path); !who.empty())
    return db_path + " is being served by " + who;
  if (const auto pid = other_process_locking(db_path))
    return db_path + " is open in process " + std::to_string(*pid) + " (a running server?)";
  Handle probe(db_path, SQLITE_OPEN_READWRITE | SQLITE_OPEN_NOMUTEX);
  sqlite3_busy_timeout(probe.get(), 0);
  // An exclusive lock in exclusive locking mode: in WAL mode it is refused
  // while any other connection has the database open.
  exec(probe.get(), db_path, "PRAGMA locking_mode=EXCLUSIVE");
  const int rc = exec_rc(probe.get(), "BEGIN EXCLUSIVE");
  if (rc == SQLITE_BUSY || rc == SQLITE_LOCKED)
    return db_path + " is in use by another connection (a running server?)";
  if (rc != SQLITE_OK) fail(rc, db_path, "locking", probe.get());
  exec(probe.get(), db_path, "ROLLBACK");
  return std::nullopt;
}

}  // namespace strandline::store
