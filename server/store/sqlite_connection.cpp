#include "server/store/sqlite_connection.h"

#include <cmath>
#include <limits>

#include <sqlite3.h>

namespace strandline::store {

namespace {
[[noreturn]] void fail(sqlite3* db, const std::string& what) {
  const std::string message = what + ": " + (db ? sqlite3_errmsg(db) : "out of memory");
  // SQLite reports a full disk (ENOSPC) and max_page_count alike as SQLITE_FULL
  // and rolls the statement's transaction back.
  if (db && (sqlite3_extended_errcode(db) & 0xFF) == SQLITE_FULL) throw StorageFull(message);
  throw StoreError(message);
}
}  // namespace

Statement::~Statement() {
  if (stmt_) {
    sqlite3_reset(stmt_);
    sqlite3_clear_bindings(stmt_);
  }
}

Statement& Statement::bind(int index, std::int64_t value) {
  if (sqlite3_bind_int64(stmt_, index, value) != SQLITE_OK) fail(sqlite3_db_handle(stmt_), "bind");
  return *this;
}

Statement& Statement::bind(int index, double value) {
  int rc = std::isnan(value) ? sqlite3_bind_null(stmt_, index) : sqlite3_bind_double(stmt_, index, value);
  if (rc != SQLITE_OK) fail(sqlite3_db_handle(stmt_), "bind");
  return *this;
}

Statement& Statement::bind_blob(int index, std::string_view bytes) {
  if (bytes.empty()) return bind_null(index);
  if (sqlite3_bind_blob(stmt_, index, bytes.data(), static_cast<int>(bytes.size()), SQLITE_TRANSIENT) != SQLITE_OK)
    fail(sqlite3_db_handle(stmt_), "bind");
  return *this;
}

Statement& Statement::bind(int index, std::string_view value) {
  if (sqlite3_bind_text(stmt_, index, value.data(), static_cast<int>(value.size()), SQLITE_TRANSIENT) !=
      SQLITE_OK)
    fail(sqlite3_db_handle(stmt_), "bind");
  return *this;
}

Statement& Statement::bind(int index, const std::optional<std::string>& value) {
  return value ? bind(index, std::string_view(*value)) : bind_null(index);
}

Statement& Statement::bind_null(int index) {
  if (sqlite3_bind_null(stmt_, index) != SQLITE_OK) fail(sqlite3_db_handle(stmt_), "bind");
  return *this;
}

bool Statement::step() {
  const int rc = sqlite3_step(stmt_);
  if (rc == SQLITE_ROW) return true;
  if (rc == SQLITE_DONE) return false;
  fail(sqlite3_db_handle(stmt_), std::string("executing ") + sqlite3_sql(stmt_));
}

void Statement::run() {
  while (step()) {
  }
}

void Statement::reset() {
  sqlite3_reset(stmt_);
  sqlite3_clear_bindings(stmt_);
}

bool Statement::is_null(int column) const { return sqlite3_column_type(stmt_, column) == SQLITE_NULL; }
std::int64_t Statement::integer(int column) const { return sqlite3_column_int64(stmt_, column); }
double Statement::real(int column) const {
  return is_null(column) ? std::numeric_limits<double>::quiet_NaN() : sqlite3_column_double(stmt_, column);
}
std::string_view Statement::text_view(int column) const {
  const auto* p = reinterpret_cast<const char*>(sqlite3_column_text(stmt_, column));
  return p ? std::string_view(p, static_cast<std::size_t>(sqlite3_column_bytes(stmt_, column))) : std::string_view();
}
std::string_view Statement::blob_view(int column) const {
  const auto* p = static_cast<const char*>(sqlite3_column_blob(stmt_, column));
  return p ? std::string_view(p, static_cast<std::size_t>(sqlite3_column_bytes(stmt_, column))) : std::string_view();
}
std::string Statement::text(int column) const { return std::string(text_view(column)); }
std::optional<std::string> Statement::optional_text(int column) const {
  if (is_null(column)) return std::nullopt;
  return text(column);
}

Connection::Connection(const std::string& path, bool read_only) {
  // Readers open read-write but query-only: a read-only handle on a WAL file
  // cannot recover the shared-memory index when it is the first to open.
  const int flags = read_only ? SQLITE_OPEN_READWRITE : (SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE);
  if (sqlite3_open_v2(path.c_str(), &db_, flags | SQLITE_OPEN_NOMUTEX, nullptr) != SQLITE_OK) {
    std::string message = "opening database " + path + ": " + (db_ ? sqlite3_errmsg(db_) : "out of memory");
    sqlite3_close(db_);
    db_ = nullptr;
    throw StoreError(message);
  }
  sqlite3_busy_timeout(db_, 10000);
  if (read_only) {
    exec("PRAGMA query_only=1; PRAGMA mmap_size=1073741824;");
  } else {
    // FULL in WAL mode syncs the log at every commit: an acknowledged upload survives a power cut.
    exec("PRAGMA journal_mode=WAL; PRAGMA synchronous=FULL; PRAGMA foreign_keys=ON;");
    // A large upload touches many index pages: a page cache that holds them
    // keeps the transaction from spilling to the log and re-reading it.
    exec("PRAGMA cache_size=-262144; PRAGMA mmap_size=1073741824; PRAGMA temp_store=MEMORY;");
    // Checkpoints run on the store's own thread, not inside an upload's commit.
    exec("PRAGMA wal_autocheckpoint=0;");
  }
}

Connection::~Connection() {
  for (auto& [sql, stmt] : cache_) sqlite3_finalize(stmt);
  sqlite3_close(db_);
}

void Connection::exec(const std::string& sql) {
  char* error = nullptr;
  if (sqlite3_exec(db_, sql.c_str(), nullptr, nullptr, &error) != SQLITE_OK) {
    std::string message = "executing " + sql.substr(0, 60) + ": " + (error ? error : "unknown error");
    sqlite3_free(error);
    if ((sqlite3_extended_errcode(db_) & 0xFF) == SQLITE_FULL) throw StorageFull(message);
    throw StoreError(message);
  }
}

Statement Connection::prepare(const std::string& sql) {
  auto it = cache_.find(sql);
  if (it == cache_.end()) {
    sqlite3_stmt* stmt = nullptr;
    if (sqlite3_prepare_v3(db_, sql.c_str(), -1, SQLITE_PREPARE_PERSISTENT, &stmt, nullptr) != SQLITE_OK)
      fail(db_, "preparing " + sql);
    it = cache_.emplace(sql, stmt).first;
  }
  return Statement(it->second);
}

std::int64_t Connection::last_insert_rowid() const { return sqlite3_last_insert_rowid(db_); }
int Connection::changes() const { return sqlite3_changes(db_); }

Transaction::Transaction(Connection& c) : c_(c) { c_.exec("BEGIN IMMEDIATE"); }
Transaction::~Transaction() {
  if (!done_) {
    try {
      c_.exec("ROLLBACK");
    } catch (...) {
    }
  }
}
void Transaction::commit() {
  c_.exec("COMMIT");
  done_ = true;
}

}  // namespace strandline::store
