// Backup and restore of the SQLite store's database file.
//
// A backup copies a live database with SQLite's online backup API, a few pages
// at a time, inside one read transaction on the source: the copy is the
// database as it was when that transaction began (WAL mode lets the service keep
// writing meanwhile), so an upload is in it whole or not at all. The copy is
// written to a temporary file beside the output, checked (`integrity_check`),
// and renamed into place only when complete.
//
// A restore copies a backup into a temporary file beside the database, checks
// that it is a Strandline database this build understands and that it is
// intact, takes the database away from any other user (an exclusive lock: it is
// refused while a server has the file open), keeps the old file under another
// name unless told not to, and renames the copy into place.
#pragma once

#include <chrono>
#include <cstdint>
#include <optional>
#include <string>

#include "server/store/store_error.h"

namespace strandline::store {

// A refusal that names its file: the output exists, the file is not a
// Strandline database or is damaged, the database is in use, ...
class BackupRefused : public StoreError {
 public:
  using StoreError::StoreError;
};

// What a check of a database file found.
struct DatabaseCheck {
  int schema_version = 0;
  std::int64_t pages = 0;
  std::int64_t page_size = 0;
  std::int64_t bytes = 0;  // pages × page size
  std::int64_t sites = 0, uploads = 0, keys = 0;
};

// Opens `path` read-only and checks it: a SQLite database (BackupRefused
// otherwise), `integrity_check` ok, a Strandline schema (`schema_migrations`
// and the store's tables) of a version this build can open. Never modifies it.
DatabaseCheck check_strandline_database(const std::string& path);

struct BackupOptions {
  bool force = false;          // replace an existing output
  int pages_per_step = 256;    // copied per sqlite3_backup_step
  std::chrono::milliseconds pause_between_steps{1};
  std::chrono::milliseconds busy_timeout{60000};  // total time spent waiting on BUSY/LOCKED
};

struct BackupReport {
  DatabaseCheck copy;
  int steps = 0;
  int busy_retries = 0;
};

// Copies the database `db_path` into `out_path` (see the top of this file).
// Refuses (BackupRefused) a missing database, a file that is not a Strandline
// database, an existing output without `force`, an output that is the database
// itself, and an output with a write-ahead log beside it.
BackupReport backup_sqlite_database(const std::string& db_path, const std::string& out_path,
                                    const BackupOptions& options = {});

struct RestoreOptions {
  bool keep_old = true;  // keep the replaced file as DB.before-restore-<UTC time>
  std::chrono::milliseconds busy_timeout{60000};
};

struct RestoreReport {
  DatabaseCheck restored;
  std::optional<std::string> kept_as;  // where the replaced database went
};

// Replaces `db_path` (which may not exist yet) by the backup `backup_path`
// (see the top of this file). Refuses (BackupRefused) a backup that is not a
// Strandline database, is damaged or comes from a newer build, and a database
// another connection has open.
RestoreReport restore_sqlite_database(const std::string& backup_path, const std::string& db_path,
                                      const RestoreOptions& options = {});

// Why another connection (a server) holds `db_path` open, or nothing when this
// process could take it exclusively (or it does not exist).
std::optional<std::string> sqlite_database_in_use(const std::string& db_path);

}  // namespace strandline::store
