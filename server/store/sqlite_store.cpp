#include "server/store/sqlite_store.h"

#include <sys/resource.h>
#include <sys/syscall.h>
#include <unistd.h>

#include <chrono>
#include <cmath>

#include "corrections/core/time_utc.h"
#include "server/store/api_keys.h"
#include "server/store/result_rows_codec.h"
#include "server/store/sqlite_schema.h"
#include "server/store/sqlite_store_common.h"

namespace strandline::store {

std::string now_utc_text() {
  const auto now = std::chrono::floor<std::chrono::seconds>(std::chrono::system_clock::now());
  return format_time_utc(static_cast<double>(now.time_since_epoch().count()));
}

std::unique_ptr<Store> open_sqlite_store(const std::string& path, std::int64_t max_size_bytes) {
  auto store = std::make_unique<SqliteStore>(path);
  if (max_size_bytes > 0) store->limit_size(max_size_bytes);
  return store;
}

namespace detail {

std::int64_t site_key(Connection& db, const std::string& site_id) {
  auto q = db.prepare("SELECT site_key FROM sites WHERE id = ?");
  q.bind(1, site_id);
  if (!q.step()) throw NotFound("site \"" + site_id + "\" not found");
  return q.integer(0);
}

bool same_value(double a, double b) { return (std::isnan(a) && std::isnan(b)) || a == b; }

}  // namespace detail

using detail::site_key;

SqliteStore::SqliteStore(const std::string& path) : path_(path) {
  writer_ = std::make_unique<Connection>(path, false);
  migrate_sqlite_schema(*writer_);
  checkpointer_ = std::thread([this] { checkpoint_loop(); });
}

void SqliteStore::limit_size(std::int64_t max_bytes) {
  std::lock_guard lock(writer_mutex_);
  auto q = writer_->prepare("PRAGMA page_size");
  q.step();
  const std::int64_t page = q.integer(0);
  q.reset();
  // SQLite's own ceiling (2^32 - 2 pages) stands for "no limit".
  const std::int64_t pages = max_bytes > 0 ? std::max<std::int64_t>(1, max_bytes / page) : 4294967294;
  writer_->exec("PRAGMA max_page_count=" + std::to_string(pages));
}

SqliteStore::~SqliteStore() {
  {
    std::lock_guard lock(checkpoint_mutex_);
    stopping_ = true;
  }
  checkpoint_wake_.notify_all();
  checkpointer_.join();
  try {
    writer_->exec("PRAGMA wal_checkpoint(PASSIVE)");
  } catch (...) {
  }
}

void SqliteStore::checkpoint_loop() {
  // Background work, like runs: copying the log into the database must not
  // take the cores from readers (Linux keeps a nice value per thread).
  setpriority(PRIO_PROCESS, static_cast<id_t>(syscall(SYS_gettid)), 10);
  std::unique_ptr<Connection> db;
  std::unique_lock lock(checkpoint_mutex_);
  while (!checkpoint_wake_.wait_for(lock, std::chrono::milliseconds(500), [&] { return stopping_; })) {
    try {
      if (!db) db = std::make_unique<Connection>(path_, false);
      db->exec("PRAGMA wal_checkpoint(PASSIVE)");
    } catch (const std::exception&) {
      db.reset();  // busy or transient: try again on the next tick
    }
  }
}

SqliteStore::ReaderLease SqliteStore::reader() {
  {
    std::lock_guard lock(readers_mutex_);
    if (!idle_readers_.empty()) {
      auto c = std::move(idle_readers_.back());
      idle_readers_.pop_back();
      return ReaderLease(*this, std::move(c));
    }
  }
  return ReaderLease(*this, std::make_unique<Connection>(path_, true));
}

void SqliteStore::give_back(std::unique_ptr<Connection> c) {
  std::lock_guard lock(readers_mutex_);
  idle_readers_.push_back(std::move(c));
}

// ---------------------------------------------------------------- sites

void SqliteStore::create_site(const Site& site) {
  std::lock_guard lock(writer_mutex_);
  Transaction tx(*writer_);
  {
    auto q = writer_->prepare("SELECT 1 FROM sites WHERE id = ?");
    q.bind(1, site.id);
    if (q.step()) throw AlreadyExists("site \"" + site.id + "\" already exists");
  }
  writer_
      ->prepare(
          "INSERT INTO sites(id, name, crs, reference_elevation_m, default_slope, processing_defaults, created_at) "
          "VALUES(?, ?, ?, ?, ?, ?, ?)")
      .bind(1, site.id)
      .bind(2, site.name)
      .bind(3, site.crs)
      .bind(4, site.reference_elevation_m)
      .bind(5, site.default_slope)
      .bind(6, site.processing_defaults.dump())
      .bind(7, now_utc_text())
      .run();
  tx.commit();
}

namespace {
constexpr const char* kSiteColumns =
    "SELECT id, name, crs, reference_elevation_m, default_slope, processing_defaults, created_at FROM sites ";

Site read_site(const Statement& q) {
  Site s;
  s.id = q.text(0);
  s.name = q.text(1);
  s.crs = q.text(2);
  s.reference_elevation_m = q.real(3);
  s.default_slope = q.real(4);
  s.processing_defaults = nlohmann::json::parse(q.text_view(5));
  s.created_at = q.text(6);
  return s;
}
}  // namespace

std::optional<Site> SqliteStore::site(const std::string& id) {
  auto db = reader();
  auto q = db->prepare(std::string(kSiteColumns) + "WHERE id = ?");
  q.bind(1, id);
  if (!q.step()) return std::nullopt;
  return read_site(q);
}

std::vector<Site> SqliteStore::sites(const std::string& after_id, int limit) {
  auto db = reader();
  auto q = db->prepare(std::string(kSiteColumns) + "WHERE id > ? ORDER BY id LIMIT ?");
  q.bind(1, after_id).bind(2, limit);
  std::vector<Site> out;
  while (q.step()) out.push_back(read_site(q));
  return out;
}

void SqliteStore::replace_transects(const std::string& site_id, const std::vector<Transect>& transects) {
  std::lock_guard lock(writer_mutex_);
  Transaction tx(*writer_);
  const auto key = site_key(*writer_, site_id);
  writer_->prepare("DELETE FROM transects WHERE site_key = ?").bind(1, key).run();
  auto insert = writer_->prepare(
      "INSERT INTO transects(site_key, transect_id, origin_x_m, origin_y_m, azimuth_deg, length_m, feature) "
      "VALUES(?, ?, ?, ?, ?, ?, ?)");
  for (const auto& t : transects) {
    insert.bind(1, key)
        .bind(2, t.id)
        .bind(3, t.geometry.origin_x_m)
        .bind(4, t.geometry.origin_y_m)
        .bind(5, t.geometry.azimuth_deg)
        .bind(6, t.geometry.length_m)
        .bind(7, t.feature.dump());
    insert.run();
    insert.reset();
  }
  tx.commit();
}

std::vector<Transect> SqliteStore::transects(const std::string& site_id) {
  auto db = reader();
  const auto key = site_key(*db, site_id);
  auto q = db->prepare(
      "SELECT transect_id, origin_x_m, origin_y_m, azimuth_deg, length_m, feature FROM transects "
      "WHERE site_key = ? ORDER BY transect_id");
  q.bind(1, key);
  std::vector<Transect> out;
  while (q.step()) {
    Transect t;
    t.id = q.text(0);
    t.geometry.origin_x_m = q.real(1);
    t.geometry.origin_y_m = q.real(2);
    t.geometry.azimuth_deg = q.real(3);
    t.geometry.length_m = q.real(4);
    t.feature = nlohmann::json::parse(q.text_view(5));
    out.push_back(std::move(t));
  }
  return out;
}

// ---------------------------------------------------------------- runs

namespace {
constexpr const char* kRunColumns =
    "SELECT r.id, s.id, r.state, r.reason, r.options, r.scope, r.input_seq, r.created_at, r.started_at, "
    "r.finished_at, r.transects_total, r.transects_done, r.provenance, r.requested_by "
    "FROM runs r JOIN sites s ON s.site_key = r.site_key ";

RunInfo read_run(const Statement& q) {
  RunInfo r;
  r.id = q.integer(0);
  r.site_id = q.text(1);
  r.state = q.text(2);
  r.reason = q.text(3);
  r.options = nlohmann::json::parse(q.text_view(4));
  r.scope = q.text(5);
  r.input_seq = q.integer(6);
  r.created_at = q.text(7);
  r.started_at = q.text(8);
  r.finished_at = q.text(9);
  r.transects_total = q.integer(10);
  r.transects_done = q.integer(11);
  r.provenance = q.is_null(12) ? nlohmann::json() : nlohmann::json::parse(q.text_view(12));
  r.requested_by = q.text(13);
  return r;
}
}  // namespace

std::int64_t SqliteStore::create_run(const RunInfo& run) {
  std::lock_guard lock(writer_mutex_);
  Transaction tx(*writer_);
  const auto key = site_key(*writer_, run.site_id);
  writer_
      ->prepare(
          "INSERT INTO runs(site_key, state, options, scope, input_seq, created_at, requested_by) "
          "VALUES(?, 'queued', ?, ?, ?, ?, ?)")
      .bind(1, key)
      .bind(2, run.options.dump())
      .bind(3, run.scope)
      .bind(4, run.input_seq)
      .bind(5, now_utc_text())
      .bind(6, run.requested_by)
      .run();
  const auto id = writer_->last_insert_rowid();
  tx.commit();
  return id;
}

std::optional<RunInfo> SqliteStore::run(std::int64_t run_id) {
  auto db = reader();
  auto q = db->prepare(std::string(kRunColumns) + "WHERE r.id = ?");
  q.bind(1, run_id);
  if (!q.step()) return std::nullopt;
  return read_run(q);
}

std::vector<RunInfo> SqliteStore::runs(const std::string& site_id, std::int64_t before_id, int limit) {
  auto db = reader();
  const auto key = site_key(*db, site_id);
  auto q = db->prepare(std::string(kRunColumns) + "WHERE r.site_key = ? AND r.id < ? ORDER BY r.id DESC LIMIT ?");
  q.bind(1, key).bind(2, before_id > 0 ? before_id : INT64_MAX).bind(3, limit);
  std::vector<RunInfo> out;
  while (q.step()) out.push_back(read_run(q));
  return out;
}

void SqliteStore::mark_run_started(std::int64_t run_id, std::int64_t transects_total) {
  std::lock_guard lock(writer_mutex_);
  writer_->prepare("UPDATE runs SET state = 'running', started_at = ?, transects_total = ? WHERE id = ?")
      .bind(1, now_utc_text())
      .bind(2, transects_total)
      .bind(3, run_id)
      .run();
}

void SqliteStore::mark_run_failed(std::int64_t run_id, const std::string& reason) {
  std::lock_guard lock(writer_mutex_);
  writer_->prepare("UPDATE runs SET state = 'failed', reason = ?, finished_at = ? WHERE id = ?")
      .bind(1, reason)
      .bind(2, now_utc_text())
      .bind(3, run_id)
      .run();
}

void SqliteStore::finish_run(std::int64_t run_id, const nlohmann::json& provenance,
                             const std::vector<TransectResult>& results) {
  std::lock_guard lock(writer_mutex_);
  Transaction tx(*writer_);
  std::int64_t key = 0;
  {
    auto q = writer_->prepare("SELECT site_key FROM runs WHERE id = ?");
    q.bind(1, run_id);
    if (!q.step()) throw NotFound("run " + std::to_string(run_id) + " not found");
    key = q.integer(0);
  }
  auto previous = writer_->prepare(
      "SELECT sha256 FROM results WHERE site_key = ? AND transect_id = ? ORDER BY seq DESC LIMIT 1");
  auto insert = writer_->prepare(
      "INSERT INTO results(run_id, site_key, transect_id, summary, sha256, changed) VALUES(?, ?, ?, ?, ?, ?)");
  auto rows = writer_->prepare("INSERT INTO result_rows(result_seq, content) VALUES(?, ?)");
  for (const auto& r : results) {
    const std::string encoded = encode_result_rows(r.rows);
    const std::string sha256 = sha256_hex(encoded);
    previous.bind(1, key).bind(2, r.transect_id);
    const bool changed = !previous.step() || previous.text_view(0) != sha256;
    previous.reset();
    insert.bind(1, run_id)
        .bind(2, key)
        .bind(3, r.transect_id)
        .bind(4, r.summary.dump())
        .bind(5, sha256)
        .bind(6, changed ? 1 : 0);
    insert.run();
    insert.reset();
    rows.bind(1, writer_->last_insert_rowid()).bind_blob(2, encoded);
    rows.run();
    rows.reset();
  }
  writer_
      ->prepare(
          "UPDATE runs SET state = 'done', finished_at = ?, transects_done = transects_total, provenance = ? "
          "WHERE id = ?")
      .bind(1, now_utc_text())
      .bind(2, provenance.dump())
      .bind(3, run_id)
      .run();
  tx.commit();
}

std::optional<RunInfo> SqliteStore::latest_done_run(const std::string& site_id) {
  auto db = reader();
  const auto key = site_key(*db, site_id);
  auto q = db->prepare(std::string(kRunColumns) + "WHERE r.site_key = ? AND r.state = 'done' ORDER BY r.id DESC LIMIT 1");
  q.bind(1, key);
  if (!q.step()) return std::nullopt;
  return read_run(q);
}

int SqliteStore::fail_interrupted_runs() {
  std::lock_guard lock(writer_mutex_);
  writer_
      ->prepare(
          "UPDATE runs SET state = 'failed', reason = 'interrupted: the service stopped before the run finished', "
          "finished_at = ? WHERE state IN ('queued', 'running')")
      .bind(1, now_utc_text())
      .run();
  return writer_->changes();
}

// ---------------------------------------------------------------- results

namespace {
// Columns: seq, run_id, transect_id, summary, sha256.
TransectResult read_result(const Statement& q, bool with_summary = true) {
  TransectResult r;
  r.seq = q.integer(0);
  r.run_id = q.integer(1);
  r.transect_id = q.text(2);
  if (with_summary) r.summary = nlohmann::json::parse(q.text_view(3));
  r.sha256 = q.text(4);
  return r;
}
}  // namespace

std::optional<TransectResult> SqliteStore::result(const std::string& site_id, const std::string& transect_id,
                                                  std::int64_t run_id, ResultParts parts) {
  auto db = reader();
  const auto key = site_key(*db, site_id);
  auto q = db->prepare(
      "SELECT seq, run_id, transect_id, summary, sha256 FROM results WHERE site_key = ? AND transect_id = ? AND "
      "(? = 0 OR run_id = ?) ORDER BY run_id DESC LIMIT 1");
  q.bind(1, key).bind(2, transect_id).bind(3, run_id).bind(4, run_id);
  if (!q.step()) return std::nullopt;
  TransectResult r = read_result(q, parts.summary);
  if (!parts.rows) return r;
  auto rows = db->prepare("SELECT content FROM result_rows WHERE result_seq = ?");
  rows.bind(1, r.seq);
  if (!rows.step()) throw StoreError("result " + std::to_string(r.seq) + " has no rows");
  r.rows = decode_result_rows(rows.blob_view(0));
  return r;
}

std::vector<TransectResult> SqliteStore::latest_summaries(const std::string& site_id) {
  auto db = reader();
  const auto key = site_key(*db, site_id);
  auto q = db->prepare(
      "SELECT seq, run_id, transect_id, summary, sha256 FROM results r WHERE site_key = ?1 AND seq = "
      "(SELECT MAX(seq) FROM results r2 WHERE r2.site_key = ?1 AND r2.transect_id = r.transect_id) "
      "ORDER BY transect_id");
  q.bind(1, key);
  std::vector<TransectResult> out;
  while (q.step()) out.push_back(read_result(q));
  return out;
}

std::vector<TransectResult> SqliteStore::changes(const std::string& site_id, std::int64_t since, int limit) {
  auto db = reader();
  const auto key = site_key(*db, site_id);
  auto q = db->prepare(
      "SELECT seq, run_id, transect_id, summary, sha256 FROM results WHERE site_key = ? AND seq > ? AND changed = 1 "
      "ORDER BY seq LIMIT ?");
  q.bind(1, key).bind(2, since).bind(3, limit);
  std::vector<TransectResult> out;
  while (q.step()) out.push_back(read_result(q));
  return out;
}

// ---------------------------------------------------------------- keys

void SqliteStore::add_key(const ApiKey& key) {
  std::lock_guard lock(writer_mutex_);
  Transaction tx(*writer_);
  {
    auto q = writer_->prepare("SELECT 1 FROM api_keys WHERE name = ?");
    q.bind(1, key.name);
    if (q.step()) throw AlreadyExists("a key named \"" + key.name + "\" already exists");
  }
  writer_
      ->prepare(
          "INSERT INTO api_keys(name, prefix, hash, role, created_at, site_id, expires_at) "
          "VALUES(?, ?, ?, ?, ?, ?, ?)")
      .bind(1, key.name)
      .bind(2, key.prefix)
      .bind(3, key.hash_hex)
      .bind(4, key.role)
      .bind(5, now_utc_text())
      .bind(6, key.site_id)
      .bind(7, key.expires_at)
      .run();
  tx.commit();
}

namespace {
constexpr const char* kKeyColumns =
    "SELECT id, name, prefix, role, created_at, revoked_at, hash, site_id, expires_at FROM api_keys ";
ApiKey read_key(const Statement& q) {
  ApiKey k;
  k.id = q.integer(0);
  k.name = q.text(1);
  k.prefix = q.text(2);
  k.role = q.text(3);
  k.created_at = q.text(4);
  k.revoked_at = q.optional_text(5);
  k.hash_hex = q.text(6);
  k.site_id = q.optional_text(7);
  k.expires_at = q.optional_text(8);
  return k;
}
}  // namespace

std::vector<ApiKey> SqliteStore::keys() {
  auto db = reader();
  auto q = db->prepare(std::string(kKeyColumns) + "ORDER BY id");
  std::vector<ApiKey> out;
  while (q.step()) out.push_back(read_key(q));
  return out;
}

bool SqliteStore::revoke_key(const std::string& name) {
  std::lock_guard lock(writer_mutex_);
  writer_->prepare("UPDATE api_keys SET revoked_at = ? WHERE name = ? AND revoked_at IS NULL")
      .bind(1, now_utc_text())
      .bind(2, name)
      .run();
  return writer_->changes() > 0;
}

std::optional<ApiKey> SqliteStore::key_by_prefix(const std::string& prefix) {
  auto db = reader();
  auto q = db->prepare(std::string(kKeyColumns) + "WHERE prefix = ?");
  q.bind(1, prefix);
  if (!q.step()) return std::nullopt;
  return read_key(q);
}

}  // namespace strandline::store
