// Thin RAII over the SQLite C API: one connection, its cached prepared
// statements, and a transaction guard. Errors become StoreError with the SQL
// message, so nothing half-done goes unnoticed.
#pragma once

#include <cstdint>
#include <memory>
#include <optional>
#include <stdexcept>
#include <string>
#include <string_view>
#include <unordered_map>

struct sqlite3;
struct sqlite3_stmt;

#include "server/store/store_error.h"

namespace strandline::store {

// A prepared statement borrowed from the connection's cache; reset and its
// bindings cleared when the borrow ends.
class Statement {
 public:
  explicit Statement(sqlite3_stmt* stmt) : stmt_(stmt) {}
  Statement(const Statement&) = delete;
  Statement& operator=(const Statement&) = delete;
  Statement(Statement&& o) noexcept : stmt_(o.stmt_) { o.stmt_ = nullptr; }
  ~Statement();

  // Binding by 1-based position; NaN doubles and empty optionals bind NULL.
  Statement& bind(int index, std::int64_t value);
  Statement& bind(int index, int value) { return bind(index, static_cast<std::int64_t>(value)); }
  Statement& bind(int index, double value);
  Statement& bind(int index, std::string_view value);
  Statement& bind(int index, const char* value) { return bind(index, std::string_view(value)); }
  Statement& bind(int index, const std::string& value) { return bind(index, std::string_view(value)); }
  Statement& bind(int index, const std::optional<std::string>& value);
  Statement& bind_null(int index);
  Statement& bind_blob(int index, std::string_view bytes);  // empty binds NULL

  // Steps once: true when a row is available.
  bool step();
  // Runs to completion (for statements without result rows).
  void run();
  // Resets for another execution with new bindings.
  void reset();

  bool is_null(int column) const;
  std::int64_t integer(int column) const;
  double real(int column) const;  // NULL reads as NaN
  std::string text(int column) const;
  std::string_view text_view(int column) const;  // valid until the next step
  std::optional<std::string> optional_text(int column) const;
  std::string_view blob_view(int column) const;  // empty for NULL; valid until the next step

 private:
  sqlite3_stmt* stmt_;
};

class Connection {
 public:
  // Opens (creating when `create`) the database at `path` in WAL mode with
  // foreign keys on and a busy timeout.
  Connection(const std::string& path, bool read_only);
  ~Connection();
  Connection(const Connection&) = delete;
  Connection& operator=(const Connection&) = delete;

  void exec(const std::string& sql);  // one or more statements, no results
  Statement prepare(const std::string& sql);  // cached by SQL text
  std::int64_t last_insert_rowid() const;
  int changes() const;
  sqlite3* handle() { return db_; }

 private:
  sqlite3* db_ = nullptr;
  std::unordered_map<std::string, sqlite3_stmt*> cache_;
};

// BEGIN IMMEDIATE ... COMMIT, rolled back unless commit() was called.
class Transaction {
 public:
  explicit Transaction(Connection& c);
  ~Transaction();
  void commit();

 private:
  Connection& c_;
  bool done_ = false;
};

}  // namespace strandline::store
