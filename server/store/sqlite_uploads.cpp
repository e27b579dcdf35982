// Uploads, retractions and the live inputs of runs (part of SqliteStore).
#include <algorithm>
#include <functional>
#include <optional>
#include <set>
#include <tuple>
#include <unordered_map>

#include "corrections/core/time_utc.h"
#include "server/store/sqlite_store.h"
#include "server/store/sqlite_store_common.h"

namespace strandline::store {

using detail::same_value;
using detail::site_key;

namespace {

constexpr std::size_t kListedDuplicates = 100;  // rows named in a report; counts stay exact
constexpr std::size_t kListedConflicts = 1000;

// The tables holding each upload kind's rows.
const char* table_of(const std::string& kind) {
  if (kind == "observations") return "observations";
  if (kind == "water_levels") return "water_levels";
  if (kind == "waves") return "waves";
  if (kind == "slopes") return "slopes";
  return "documents";
}

std::int64_t begin_upload(Connection& db, std::int64_t key, const std::string& kind, const UploadMeta& meta) {
  db.prepare(
        "INSERT INTO uploads(site_key, kind, content_type, sha256, received_at, uploaded_by, rows_received, "
        "rows_inserted, rows_duplicate, rows_rejected) VALUES(?, ?, ?, ?, ?, ?, ?, 0, 0, ?)")
      .bind(1, key)
      .bind(2, kind)
      .bind(3, meta.content_type)
      .bind(4, meta.sha256)
      .bind(5, now_utc_text())
      .bind(6, meta.uploaded_by)
      .bind(7, meta.received)
      .bind(8, static_cast<std::int64_t>(meta.rejected.size()))
      .run();
  const std::int64_t id = db.last_insert_rowid();
  auto insert = db.prepare(
      "INSERT INTO upload_rejected_rows(upload_id, line, key, field, value, reason) VALUES(?, ?, ?, ?, ?, ?)");
  const std::size_t kept = std::min(meta.rejected.size(), kStoredRejectedRows);
  for (std::size_t i = 0; i < kept; ++i) {
    const RowIssue& r = meta.rejected[i];
    insert.reset();
    insert.bind(1, id).bind(2, r.line).bind(3, r.key).bind(4, r.field).bind(5, r.value).bind(6, r.reason).run();
  }
  return id;
}

// Counts are known only once the rows are in; the upload row is still inside
// its own transaction, so no reader ever sees it incomplete.
void end_upload(Connection& db, UploadResult& r) {
  db.prepare("UPDATE uploads SET rows_inserted = ?, rows_duplicate = ? WHERE id = ?")
      .bind(1, r.inserted)
      .bind(2, r.duplicates)
      .bind(3, r.upload_id)
      .run();
}

void record_change(Connection& db, std::int64_t key, const std::optional<std::string>& transect,
                   std::int64_t upload_id) {
  db.prepare("INSERT INTO input_changes(site_key, transect_id, upload_id) VALUES(?, ?, ?)")
      .bind(1, key)
      .bind(2, transect)
      .bind(3, upload_id)
      .run();
}

// Collects duplicates and conflicts while rows are inserted; throws at the end
// so every conflicting row is named, then the transaction rolls back.
struct Outcome {
  UploadResult result;
  std::vector<RowIssue> conflicts;
  void duplicate(std::int64_t line, std::string key) {
    ++result.duplicates;
    if (result.duplicate_rows.size() < kListedDuplicates)
      result.duplicate_rows.push_back({line, std::move(key), "", "", "identical to a stored row"});
  }
  void conflict(std::int64_t line, std::string key, std::string field, std::string reason) {
    if (conflicts.size() < kListedConflicts)
      conflicts.push_back({line, std::move(key), std::move(field), "", std::move(reason)});
    else
      conflicts.back().reason = "(further conflicts not listed)";
  }
  void throw_if_conflicts() {
    if (conflicts.empty()) return;
    std::stable_sort(conflicts.begin(), conflicts.end(), [](const auto& a, const auto& b) { return a.line < b.line; });
    throw ConflictError(std::move(conflicts));
  }
  void sort_report() {
    std::stable_sort(result.duplicate_rows.begin(), result.duplicate_rows.end(),
                     [](const auto& a, const auto& b) { return a.line < b.line; });
  }
};

std::string time_key(TimeS t) { return format_time_utc(t); }

constexpr std::size_t kRowsPerInsert = 128;  // 2 + 7 x 128 parameters, well under SQLite's limit

// INSERT of `rows` observation rows; parameters ?1 upload id, ?2 site key, then
// seven per row.
std::string observation_insert_sql(std::size_t rows) {
  std::string sql =
      "INSERT INTO observations(upload_id, site_key, transect_key, image_key, time_s, chainage_m, sensor, "
      "cloud_fraction, georef_rmse_m) VALUES";
  for (std::size_t j = 0; j < rows; ++j) {
    const std::size_t p = 3 + j * 7;
    sql += j ? ",(?1,?2" : "(?1,?2";
    for (std::size_t c = 0; c < 7; ++c) sql += ",?" + std::to_string(p + c);
    sql += ")";
  }
  sql += " ON CONFLICT(site_key, transect_key, image_key) WHERE live = 1 DO NOTHING";
  return sql;
}

struct Inserted {
  std::int64_t transect_key, image_key, row_id;
  bool operator<(const Inserted& o) const {
    return std::tie(transect_key, image_key) < std::tie(o.transect_key, o.image_key);
  }
};

// A site's transect or image ids as integer keys (table interned_ids), created
// on first use inside the caller's transaction; one lookup per distinct id.
// Interners of one connection share its cached statements: each key() call
// binds, steps and resets them before returning.
class IdInterner {
 public:
  IdInterner(Connection& db, std::int64_t site_key, const char* kind)
      : site_key_(site_key),
        kind_(kind),
        find_(db.prepare("SELECT id_key FROM interned_ids WHERE site_key = ? AND kind = ? AND name = ?")),
        add_(db.prepare("INSERT INTO interned_ids(site_key, kind, name) VALUES(?, ?, ?)")),
        db_(db) {}

  std::int64_t key(const std::string& name) {
    // Consecutive rows mostly share an id (one image across transects, or
    // one transect across images): the last answer first.
    if (last_ && *last_ == name) return last_key_;
    if (auto it = keys_.find(name); it != keys_.end()) return remember(it);
    std::int64_t key = 0;
    find_.bind(1, site_key_).bind(2, kind_).bind(3, name);
    if (find_.step()) {
      key = find_.integer(0);
    } else {
      add_.bind(1, site_key_).bind(2, kind_).bind(3, name);
      add_.run();
      add_.reset();
      key = db_.last_insert_rowid();
    }
    find_.reset();
    return remember(keys_.emplace(name, key).first);
  }

 private:
  std::int64_t site_key_;
  const char* kind_;
  Statement find_, add_;
  Connection& db_;
  std::unordered_map<std::string, std::int64_t> keys_;
  const std::string* last_ = nullptr;  // points into keys_ (node-based: stable)
  std::int64_t last_key_ = 0;

  std::int64_t remember(std::unordered_map<std::string, std::int64_t>::const_iterator it) {
    last_ = &it->first;
    last_key_ = it->second;
    return last_key_;
  }
};

// How one keyed input kind (water levels and waves by time, slopes by transect)
// is stored: the shared loop is keyed_upload below.
template <class Row>
struct KeyedKind {
  const char* kind;
  std::string insert_sql;    // parameters: 1 upload id, 2 site key, 3.. the row
  std::string existing_sql;  // parameters: 1 site key, 2.. the row's key
  std::function<void(Statement&, const Row&)> bind_row;  // from parameter 3
  std::function<void(Statement&, const Row&)> bind_key;  // from parameter 2
  std::function<bool(const Statement&, const Row&)> same_as_stored;
  std::function<std::string(const Row&)> report_key;
  std::function<std::pair<std::string, std::string>(const Row&)> conflict;  // field, reason
  // The transect a row touches; none for site-wide inputs (a change to every transect).
  std::function<std::optional<std::string>(const Row&)> transect;
};

// One transaction: insert every row whose key has no live row; a row meeting a
// stored one is a duplicate when the values agree and a conflict otherwise, and
// any conflict rolls the whole upload back.
template <class Row>
UploadResult keyed_upload(Connection& db, const std::string& site_id, const UploadMeta& meta,
                          const std::vector<Row>& rows, const KeyedKind<Row>& k) {
  Transaction tx(db);
  const auto key = site_key(db, site_id);
  Outcome out;
  out.result.upload_id = begin_upload(db, key, k.kind, meta);
  out.result.received = meta.received;
  out.result.rejected = meta.rejected;
  auto insert = db.prepare(k.insert_sql);
  auto existing = db.prepare(k.existing_sql);
  std::set<std::optional<std::string>> touched;
  for (const auto& r : rows) {
    insert.bind(1, out.result.upload_id).bind(2, key);
    k.bind_row(insert, r);
    insert.run();
    insert.reset();
    if (db.changes() > 0) {
      ++out.result.inserted;
      touched.insert(k.transect(r));
      continue;
    }
    existing.bind(1, key);
    k.bind_key(existing, r);
    existing.step();
    const bool same = k.same_as_stored(existing, r);
    existing.reset();
    if (same) {
      out.duplicate(r.line, k.report_key(r));
    } else {
      auto [field, reason] = k.conflict(r);
      out.conflict(r.line, k.report_key(r), std::move(field), std::move(reason));
    }
  }
  out.throw_if_conflicts();
  end_upload(db, out.result);
  for (const auto& t : touched) record_change(db, key, t, out.result.upload_id);
  tx.commit();
  return out.result;
}

}  // namespace

UploadResult SqliteStore::add_observations(const std::string& site_id, const UploadMeta& meta,
                                           const std::vector<ObservationRow>& rows) {
  std::lock_guard lock(writer_mutex_);
  Transaction tx(*writer_);
  const auto key = site_key(*writer_, site_id);
  Outcome out;
  out.result.upload_id = begin_upload(*writer_, key, "observations", meta);
  out.result.received = meta.received;
  out.result.rejected = meta.rejected;

  // Integer keys for every row, then inserts in index order: consecutive index
  // updates land on the same pages (twice as fast as input order here).
  IdInterner transects(*writer_, key, "transect"), images(*writer_, key, "image");
  struct Keyed {
    std::int64_t transect_key, image_key;
    std::uint32_t index;
  };
  std::vector<Keyed> order(rows.size());
  for (std::uint32_t i = 0; i < order.size(); ++i)
    order[i] = {transects.key(rows[i].transect_id), images.key(rows[i].image_id), i};
  std::sort(order.begin(), order.end(), [](const Keyed& a, const Keyed& b) {
    return std::tie(a.transect_key, a.image_key, a.index) < std::tie(b.transect_key, b.image_key, b.index);
  });

  auto existing = writer_->prepare(
      "SELECT time_s, chainage_m, sensor, cloud_fraction, georef_rmse_m FROM observations "
      "WHERE site_key = ? AND transect_key = ? AND image_key = ? AND live = 1");
  std::vector<std::string> touched;  // transect ids, one per run of rows in key order
  std::int64_t first_row_id = 0, last_row_id = 0;
  // A row the insert skipped meets a stored live row: identical is a duplicate,
  // anything else a conflict.
  auto compare_with_stored = [&](const Keyed& k) {
    const auto& r = rows[k.index];
    existing.bind(1, key).bind(2, k.transect_key).bind(3, k.image_key);
    existing.step();
    std::string differs;
    if (!same_value(existing.real(0), r.time_s)) differs = "time";
    else if (!same_value(existing.real(1), r.chainage_m)) differs = "chainage_m";
    else if (existing.text_view(2) != r.sensor) differs = "sensor";
    else if (!same_value(existing.real(3), r.cloud_fraction)) differs = "cloud_fraction";
    else if (!same_value(existing.real(4), r.georef_rmse_m)) differs = "georef_rmse_m";
    existing.reset();
    const std::string row_key = r.transect_id + "/" + r.image_id;
    if (differs.empty())
      out.duplicate(r.line, row_key);
    else
      out.conflict(r.line, row_key, differs,
                   "transect " + r.transect_id + " image " + r.image_id + " is already stored with a different " +
                       differs);
  };

  // Many rows per INSERT statement: the per-statement cost (cursors, halt,
  // bindings) is paid once per batch. A batch's inserted rows are the rowids
  // above the largest before it; a row not among them met a live row (stored
  // before, or earlier in this upload).
  std::optional<Statement> full_batch, single_row;
  auto since = writer_->prepare(
      "SELECT id, transect_key, image_key FROM observations WHERE id > ? ORDER BY id");
  std::int64_t max_row_id = 0;
  {
    auto q = writer_->prepare("SELECT COALESCE(MAX(id), 0) FROM observations");
    if (q.step()) max_row_id = q.integer(0);
  }
  std::vector<Inserted> inserted;
  for (std::size_t begin = 0, n = 0; begin < order.size(); begin += n) {
    // Full batches, then the last rows one by one: two statement shapes only
    // (prepared statements are cached per connection).
    n = order.size() - begin >= kRowsPerInsert ? kRowsPerInsert : 1;
    std::optional<Statement>& slot = n == kRowsPerInsert ? full_batch : single_row;
    if (!slot) slot.emplace(writer_->prepare(observation_insert_sql(n)));
    Statement& insert = *slot;
    insert.bind(1, out.result.upload_id).bind(2, key);
    for (std::size_t j = 0; j < n; ++j) {
      const Keyed& k = order[begin + j];
      const auto& r = rows[k.index];
      const int p = 3 + static_cast<int>(j) * 7;
      insert.bind(p, k.transect_key)
          .bind(p + 1, k.image_key)
          .bind(p + 2, r.time_s)
          .bind(p + 3, r.chainage_m)
          .bind(p + 4, r.sensor)
          .bind(p + 5, r.cloud_fraction)
          .bind(p + 6, r.georef_rmse_m);
    }
    insert.run();
    insert.reset();
    const auto changed = static_cast<std::size_t>(writer_->changes());
    inserted.clear();
    if (changed == n && writer_->last_insert_rowid() == max_row_id + static_cast<std::int64_t>(n)) {
      // Every row went in, in VALUES order, as the next n rowids.
      for (std::size_t j = 0; j < n; ++j)
        inserted.push_back({order[begin + j].transect_key, order[begin + j].image_key,
                            max_row_id + 1 + static_cast<std::int64_t>(j)});
    } else if (changed > 0) {
      since.bind(1, max_row_id);
      while (since.step()) inserted.push_back({since.integer(1), since.integer(2), since.integer(0)});
      since.reset();
    }
    if (changed > 0) max_row_id = writer_->last_insert_rowid();
    std::sort(inserted.begin(), inserted.end());
    // Batch rows are in (transect, image, input) order: the first row of a key
    // is the one inserted, when any was.
    auto next = inserted.begin();
    for (std::size_t j = 0; j < n; ++j) {
      const Keyed& k = order[begin + j];
      if (next != inserted.end() && next->transect_key == k.transect_key && next->image_key == k.image_key) {
        ++out.result.inserted;
        first_row_id = first_row_id == 0 ? next->row_id : std::min(first_row_id, next->row_id);
        last_row_id = std::max(last_row_id, next->row_id);
        const std::string& transect = rows[k.index].transect_id;
        if (touched.empty() || touched.back() != transect) touched.push_back(transect);
        ++next;
      } else {
        compare_with_stored(k);
      }
    }
  }
  out.throw_if_conflicts();
  out.sort_report();
  end_upload(*writer_, out.result);
  if (first_row_id != 0)
    writer_->prepare("UPDATE uploads SET first_row_id = ?, last_row_id = ? WHERE id = ?")
        .bind(1, first_row_id)
        .bind(2, last_row_id)
        .bind(3, out.result.upload_id)
        .run();
  std::sort(touched.begin(), touched.end());
  for (const auto& t : touched) record_change(*writer_, key, t, out.result.upload_id);
  tx.commit();
  return out.result;
}

UploadResult SqliteStore::add_water_levels(const std::string& site_id, const UploadMeta& meta,
                                           const std::vector<WaterLevelRow>& rows) {
  static const KeyedKind<WaterLevelRow> kind{
      "water_levels",
      "INSERT INTO water_levels(upload_id, site_key, time_s, level_m) VALUES(?, ?, ?, ?) "
      "ON CONFLICT(site_key, time_s) WHERE live = 1 DO NOTHING",
      "SELECT level_m FROM water_levels WHERE site_key = ? AND time_s = ? AND live = 1",
      [](Statement& q, const WaterLevelRow& r) { q.bind(3, r.time_s).bind(4, r.level_m); },
      [](Statement& q, const WaterLevelRow& r) { q.bind(2, r.time_s); },
      [](const Statement& q, const WaterLevelRow& r) { return same_value(q.real(0), r.level_m); },
      [](const WaterLevelRow& r) { return time_key(r.time_s); },
      [](const WaterLevelRow&) {
        return std::pair<std::string, std::string>("level_m", "a different water level is stored for this time");
      },
      [](const WaterLevelRow&) { return std::optional<std::string>(); }};
  std::lock_guard lock(writer_mutex_);
  return keyed_upload(*writer_, site_id, meta, rows, kind);
}

UploadResult SqliteStore::add_waves(const std::string& site_id, const UploadMeta& meta,
                                    const std::vector<WaveRow>& rows) {
  static const KeyedKind<WaveRow> kind{
      "waves",
      "INSERT INTO waves(upload_id, site_key, time_s, hs_m, tp_s, dir_deg, depth_m) VALUES(?, ?, ?, ?, ?, ?, ?) "
      "ON CONFLICT(site_key, time_s) WHERE live = 1 DO NOTHING",
      "SELECT hs_m, tp_s, dir_deg, depth_m FROM waves WHERE site_key = ? AND time_s = ? AND live = 1",
      [](Statement& q, const WaveRow& r) {
        q.bind(3, r.time_s).bind(4, r.hs_m).bind(5, r.tp_s).bind(6, r.dir_deg).bind(7, r.depth_m);
      },
      [](Statement& q, const WaveRow& r) { q.bind(2, r.time_s); },
      [](const Statement& q, const WaveRow& r) {
        return same_value(q.real(0), r.hs_m) && same_value(q.real(1), r.tp_s) && same_value(q.real(2), r.dir_deg) &&
               same_value(q.real(3), r.depth_m);
      },
      [](const WaveRow& r) { return time_key(r.time_s); },
      [](const WaveRow&) {
        return std::pair<std::string, std::string>("", "different wave conditions are stored for this time");
      },
      [](const WaveRow&) { return std::optional<std::string>(); }};
  std::lock_guard lock(writer_mutex_);
  return keyed_upload(*writer_, site_id, meta, rows, kind);
}

UploadResult SqliteStore::add_slopes(const std::string& site_id, const UploadMeta& meta,
                                     const std::vector<SlopeRow>& rows) {
  static const KeyedKind<SlopeRow> kind{
      "slopes",
      "INSERT INTO slopes(upload_id, site_key, transect_id, slope, slope_sigma) VALUES(?, ?, ?, ?, ?) "
      "ON CONFLICT(site_key, transect_id) WHERE live = 1 DO NOTHING",
      "SELECT slope, slope_sigma FROM slopes WHERE site_key = ? AND transect_id = ? AND live = 1",
      [](Statement& q, const SlopeRow& r) { q.bind(3, r.transect_id).bind(4, r.slope).bind(5, r.slope_sigma); },
      [](Statement& q, const SlopeRow& r) { q.bind(2, r.transect_id); },
      [](const Statement& q, const SlopeRow& r) {
        return same_value(q.real(0), r.slope) && same_value(q.real(1), r.slope_sigma);
      },
      [](const SlopeRow& r) { return r.transect_id; },
      [](const SlopeRow& r) {
        return std::pair<std::string, std::string>(
            "slope", "a different slope is stored for transect " + r.transect_id + " (retract its upload first)");
      },
      [](const SlopeRow& r) { return std::optional<std::string>(r.transect_id); }};
  std::lock_guard lock(writer_mutex_);
  return keyed_upload(*writer_, site_id, meta, rows, kind);
}

UploadResult SqliteStore::add_document(const std::string& site_id, const std::string& kind, const UploadMeta& meta,
                                       const std::string& content) {
  std::lock_guard lock(writer_mutex_);
  Transaction tx(*writer_);
  const auto key = site_key(*writer_, site_id);
  UploadResult result;
  result.received = 1;
  {
    auto q = writer_->prepare(
        "SELECT u.id FROM uploads u JOIN documents d ON d.upload_id = u.id "
        "WHERE u.site_key = ? AND u.kind = ? AND u.sha256 = ? AND d.live = 1");
    q.bind(1, key).bind(2, kind).bind(3, meta.sha256);
    if (q.step()) {
      result.upload_id = q.integer(0);
      result.duplicates = 1;
      result.replay = true;
      return result;  // nothing written; the transaction rolls back empty
    }
  }
  // A new document replaces the live one of its kind for future runs; the old
  // stays stored (retracted by supersession is not needed: latest live wins).
  result.upload_id = begin_upload(*writer_, key, kind, meta);
  writer_->prepare("INSERT INTO documents(upload_id, site_key, kind, content) VALUES(?, ?, ?, ?)")
      .bind(1, result.upload_id)
      .bind(2, key)
      .bind(3, kind)
      .bind(4, content)
      .run();
  result.inserted = 1;
  end_upload(*writer_, result);
  record_change(*writer_, key, std::nullopt, result.upload_id);
  tx.commit();
  return result;
}

// ---------------------------------------------------------------- listing, retraction

namespace {
constexpr const char* kUploadColumns =
    "SELECT u.id, u.kind, u.received_at, u.uploaded_by, u.content_type, u.sha256, u.rows_received, "
    "u.rows_inserted, u.rows_duplicate, u.rows_rejected, r.retracted_at, r.retracted_by, r.reason, r.purged_at "
    "FROM uploads u LEFT JOIN retractions r ON r.upload_id = u.id ";

UploadInfo read_upload(const Statement& q) {
  UploadInfo u;
  u.id = q.integer(0);
  u.kind = q.text(1);
  u.received_at = q.text(2);
  u.uploaded_by = q.text(3);
  u.content_type = q.text(4);
  u.sha256 = q.text(5);
  u.received = q.integer(6);
  u.inserted = q.integer(7);
  u.duplicates = q.integer(8);
  u.rejected = q.integer(9);
  if (!q.is_null(10)) u.retraction = Retraction{q.text(10), q.text(11), q.text(12)};
  u.purged_at = q.optional_text(13);
  return u;
}
}  // namespace

std::vector<UploadInfo> SqliteStore::uploads(const std::string& site_id, std::int64_t before_id, int limit) {
  auto db = reader();
  const auto key = site_key(*db, site_id);
  auto q = db->prepare(std::string(kUploadColumns) + "WHERE u.site_key = ? AND u.id < ? ORDER BY u.id DESC LIMIT ?");
  q.bind(1, key).bind(2, before_id > 0 ? before_id : INT64_MAX).bind(3, limit);
  std::vector<UploadInfo> out;
  while (q.step()) out.push_back(read_upload(q));
  return out;
}

std::optional<UploadInfo> SqliteStore::upload(const std::string& site_id, std::int64_t upload_id) {
  auto db = reader();
  const auto key = site_key(*db, site_id);
  auto q = db->prepare(std::string(kUploadColumns) + "WHERE u.site_key = ? AND u.id = ?");
  q.bind(1, key).bind(2, upload_id);
  if (!q.step()) return std::nullopt;
  UploadInfo u = read_upload(q);
  auto rows = db->prepare(
      "SELECT line, key, field, value, reason FROM upload_rejected_rows WHERE upload_id = ? ORDER BY line");
  rows.bind(1, upload_id);
  while (rows.step()) u.rejected_rows.push_back({rows.integer(0), rows.text(1), rows.text(2), rows.text(3), rows.text(4)});
  return u;
}

bool SqliteStore::retract_upload(const std::string& site_id, std::int64_t upload_id, const Retraction& r) {
  std::lock_guard lock(writer_mutex_);
  Transaction tx(*writer_);
  const auto key = site_key(*writer_, site_id);
  std::string kind;
  {
    auto q = writer_->prepare(
        "SELECT u.kind, r.upload_id FROM uploads u LEFT JOIN retractions r ON r.upload_id = u.id "
        "WHERE u.site_key = ? AND u.id = ?");
    q.bind(1, key).bind(2, upload_id);
    if (!q.step()) throw NotFound("upload " + std::to_string(upload_id) + " not found in site \"" + site_id + "\"");
    if (!q.is_null(1)) return false;
    kind = q.text(0);
  }
  writer_->prepare("INSERT INTO retractions(upload_id, retracted_at, retracted_by, reason) VALUES(?, ?, ?, ?)")
      .bind(1, upload_id)
      .bind(2, r.at.empty() ? now_utc_text() : r.at)
      .bind(3, r.by)
      .bind(4, r.reason)
      .run();
  const std::string table = table_of(kind);
  if (table == "observations") {
    // The upload's rows are its recorded rowid range (see schema version 2).
    std::vector<std::string> transects;
    {
      auto q = writer_->prepare(
          "SELECT DISTINCT n.name FROM uploads u JOIN observations o ON o.id BETWEEN u.first_row_id AND u.last_row_id "
          "JOIN interned_ids n ON n.id_key = o.transect_key "
          "WHERE u.id = ?1 AND o.upload_id = ?1 AND o.live = 1 ORDER BY n.name");
      q.bind(1, upload_id);
      while (q.step()) transects.push_back(q.text(0));
    }
    for (const auto& t : transects) record_change(*writer_, key, t, upload_id);
    writer_
        ->prepare(
            "UPDATE observations SET live = 0 WHERE upload_id = ?1 AND id BETWEEN "
            "(SELECT first_row_id FROM uploads WHERE id = ?1) AND (SELECT last_row_id FROM uploads WHERE id = ?1)")
        .bind(1, upload_id)
        .run();
  } else if (table == "slopes") {
    std::vector<std::string> transects;
    {
      auto q = writer_->prepare("SELECT DISTINCT transect_id FROM slopes WHERE upload_id = ? AND live = 1");
      q.bind(1, upload_id);
      while (q.step()) transects.push_back(q.text(0));
    }
    for (const auto& t : transects) record_change(*writer_, key, t, upload_id);
    writer_->prepare("UPDATE slopes SET live = 0 WHERE upload_id = ?").bind(1, upload_id).run();
  } else {
    record_change(*writer_, key, std::nullopt, upload_id);
    writer_->prepare("UPDATE " + table + " SET live = 0 WHERE upload_id = ?").bind(1, upload_id).run();
  }
  tx.commit();
  return true;
}

std::int64_t SqliteStore::purge_retracted(const std::string& site_id) {
  std::lock_guard lock(writer_mutex_);
  Transaction tx(*writer_);
  const auto key = site_key(*writer_, site_id);
  std::int64_t erased = 0;
  for (const char* table : {"observations", "water_levels", "waves", "slopes", "documents"}) {
    writer_
        ->prepare(std::string("DELETE FROM ") + table +
                  " WHERE live = 0 AND site_key = ? AND upload_id IN (SELECT upload_id FROM retractions)")
        .bind(1, key)
        .run();
    erased += writer_->changes();
  }
  writer_
      ->prepare(
          "UPDATE retractions SET purged_at = ? WHERE purged_at IS NULL AND upload_id IN "
          "(SELECT id FROM uploads WHERE site_key = ?)")
      .bind(1, now_utc_text())
      .bind(2, key)
      .run();
  tx.commit();
  return erased;
}

// ---------------------------------------------------------------- live inputs

std::vector<ObservationRow> SqliteStore::live_observations(const std::string& site_id,
                                                           const std::set<std::string>& transects) {
  auto db = reader();
  const auto key = site_key(*db, site_id);
  std::vector<ObservationRow> out;
  auto read_all = [&](Statement& q) {
    while (q.step()) {
      ObservationRow r;
      r.line = q.integer(0);
      r.transect_id = q.text(1);
      r.image_id = q.text(2);
      r.time_s = q.real(3);
      r.chainage_m = q.real(4);
      r.sensor = q.text(5);
      r.cloud_fraction = q.real(6);
      r.georef_rmse_m = q.real(7);
      out.push_back(std::move(r));
    }
  };
  const std::string columns =
      "SELECT o.id, t.name, i.name, o.time_s, o.chainage_m, o.sensor, o.cloud_fraction, o.georef_rmse_m "
      "FROM observations o JOIN interned_ids t ON t.id_key = o.transect_key "
      "JOIN interned_ids i ON i.id_key = o.image_key ";
  if (transects.empty()) {
    auto q = db->prepare(columns + "WHERE o.site_key = ? AND o.live = 1");
    q.bind(1, key);
    read_all(q);
  } else {
    auto q = db->prepare(columns +
                         "WHERE o.site_key = ?1 AND o.live = 1 AND o.transect_key = "
                         "(SELECT id_key FROM interned_ids WHERE site_key = ?1 AND kind = 'transect' AND name = ?2)");
    for (const auto& t : transects) {
      q.bind(1, key).bind(2, t);
      read_all(q);
      q.reset();
    }
  }
  return out;
}

std::vector<WaterLevelRow> SqliteStore::live_water_levels(const std::string& site_id) {
  auto db = reader();
  const auto key = site_key(*db, site_id);
  auto q = db->prepare("SELECT id, time_s, level_m FROM water_levels WHERE site_key = ? AND live = 1 ORDER BY time_s");
  q.bind(1, key);
  std::vector<WaterLevelRow> out;
  while (q.step()) out.push_back({q.integer(0), q.real(1), q.real(2)});
  return out;
}

std::vector<WaveRow> SqliteStore::live_waves(const std::string& site_id) {
  auto db = reader();
  const auto key = site_key(*db, site_id);
  auto q = db->prepare(
      "SELECT id, time_s, hs_m, tp_s, dir_deg, depth_m FROM waves WHERE site_key = ? AND live = 1 ORDER BY time_s");
  q.bind(1, key);
  std::vector<WaveRow> out;
  while (q.step()) out.push_back({q.integer(0), q.real(1), q.real(2), q.real(3), q.real(4), q.real(5)});
  return out;
}

std::vector<SlopeRow> SqliteStore::live_slopes(const std::string& site_id) {
  auto db = reader();
  const auto key = site_key(*db, site_id);
  auto q = db->prepare(
      "SELECT id, transect_id, slope, slope_sigma FROM slopes WHERE site_key = ? AND live = 1 ORDER BY transect_id");
  q.bind(1, key);
  std::vector<SlopeRow> out;
  while (q.step()) out.push_back({q.integer(0), q.text(1), q.real(2), q.real(3)});
  return out;
}

// Images are interned per site: an id never interned has no rows (the common
// case of new images costs one index probe). For the others, one live row is
// found through the (site, transect, image) index, transect by transect.
std::vector<StoredImage> SqliteStore::stored_images(const std::string& site_id,
                                                    const std::vector<std::string>& image_ids) {
  auto db = reader();
  const auto key = site_key(*db, site_id);
  auto image_key = db->prepare("SELECT id_key FROM interned_ids WHERE site_key = ? AND kind = 'image' AND name = ?");
  auto live_row = db->prepare(
      "SELECT o.time_s, o.sensor FROM interned_ids t JOIN observations o "
      "ON o.site_key = t.site_key AND o.transect_key = t.id_key AND o.image_key = ? AND o.live = 1 "
      "WHERE t.site_key = ? AND t.kind = 'transect' LIMIT 1");
  std::vector<StoredImage> out;
  for (const auto& id : image_ids) {
    image_key.bind(1, key).bind(2, id);
    const bool interned = image_key.step();
    const std::int64_t k = interned ? image_key.integer(0) : 0;
    image_key.reset();
    if (!interned) continue;
    live_row.bind(1, k).bind(2, key);
    if (live_row.step()) out.push_back({id, live_row.real(0), live_row.text(1)});
    live_row.reset();
  }
  return out;
}

std::optional<std::string> SqliteStore::live_document(const std::string& site_id, const std::string& kind) {
  auto db = reader();
  const auto key = site_key(*db, site_id);
  auto q = db->prepare("SELECT content FROM documents WHERE site_key = ? AND kind = ? AND live = 1 ORDER BY id DESC LIMIT 1");
  q.bind(1, key).bind(2, kind);
  if (!q.step()) return std::nullopt;
  return q.text(0);
}

std::int64_t SqliteStore::input_seq(const std::string& site_id) {
  auto db = reader();
  const auto key = site_key(*db, site_id);
  auto q = db->prepare("SELECT COALESCE(MAX(seq), 0) FROM input_changes WHERE site_key = ?");
  q.bind(1, key);
  q.step();
  return q.integer(0);
}

std::optional<std::set<std::string>> SqliteStore::changed_transects(const std::string& site_id, std::int64_t since) {
  auto db = reader();
  const auto key = site_key(*db, site_id);
  auto q = db->prepare("SELECT DISTINCT transect_id FROM input_changes WHERE site_key = ? AND seq > ?");
  q.bind(1, key).bind(2, since);
  std::set<std::string> out;
  while (q.step()) {
    if (q.is_null(0)) return std::nullopt;
    out.insert(q.text(0));
  }
  return out;
}

}  // namespace strandline::store
