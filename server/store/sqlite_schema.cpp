#include "server/store/sqlite_schema.h"

#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "server/store/result_rows_codec.h"

namespace strandline::store {

namespace {

struct Migration {
  int version;
  const char* sql;
  void (*then)(Connection&) = nullptr;  // data changes SQL cannot express, same transaction
};

// Schema 4: series documents (JSON and CSV reply bodies, gzip members) become
// typed result rows; the faces render and compress what they send.
void series_documents_to_rows(Connection& db) {
  auto documents = db.prepare("SELECT result_seq, content FROM result_documents WHERE kind = 'json'");
  auto insert = db.prepare("INSERT INTO result_rows(result_seq, content) VALUES(?, ?)");
  while (documents.step()) {
    const auto document = nlohmann::json::parse(documents.blob_view(1));
    insert.bind(1, documents.integer(0)).bind_blob(2, encode_result_rows(rows_from_series_json(document.at("rows"))));
    insert.run();
    insert.reset();
  }
  db.exec("DROP TABLE result_documents");
}

// `live` marks rows of uploads that are not retracted; values are never updated.
// The partial unique indexes make idempotency a single INSERT ... ON CONFLICT.
const std::vector<Migration> kMigrations = {
    {1, R"sql(
CREATE TABLE sites(
  site_key INTEGER PRIMARY KEY,
  id TEXT NOT NULL UNIQUE,
  name TEXT NOT NULL,
  crs TEXT NOT NULL,
  reference_elevation_m REAL NOT NULL,
  default_slope REAL,
  processing_defaults TEXT NOT NULL,
  created_at TEXT NOT NULL);
CREATE TABLE transects(
  site_key INTEGER NOT NULL REFERENCES sites(site_key),
  transect_id TEXT NOT NULL,
  origin_x_m REAL, origin_y_m REAL, azimuth_deg REAL, length_m REAL,
  feature TEXT NOT NULL,
  PRIMARY KEY(site_key, transect_id));
CREATE TABLE uploads(
  id INTEGER PRIMARY KEY,
  site_key INTEGER NOT NULL REFERENCES sites(site_key),
  kind TEXT NOT NULL,
  content_type TEXT NOT NULL,
  sha256 TEXT NOT NULL,
  received_at TEXT NOT NULL,
  uploaded_by TEXT NOT NULL,
  rows_received INTEGER NOT NULL,
  rows_inserted INTEGER NOT NULL,
  rows_duplicate INTEGER NOT NULL,
  rows_rejected INTEGER NOT NULL);
CREATE INDEX uploads_by_site ON uploads(site_key, id);
CREATE INDEX uploads_by_hash ON uploads(site_key, kind, sha256);
CREATE TABLE retractions(
  upload_id INTEGER PRIMARY KEY REFERENCES uploads(id),
  retracted_at TEXT NOT NULL,
  retracted_by TEXT NOT NULL,
  reason TEXT NOT NULL,
  purged_at TEXT);
CREATE TABLE observations(
  id INTEGER PRIMARY KEY,
  upload_id INTEGER NOT NULL REFERENCES uploads(id),
  site_key INTEGER NOT NULL,
  transect_id TEXT NOT NULL,
  image_id TEXT NOT NULL,
  time_s REAL NOT NULL,
  chainage_m REAL NOT NULL,
  sensor TEXT NOT NULL,
  cloud_fraction REAL,
  georef_rmse_m REAL,
  live INTEGER NOT NULL DEFAULT 1);
CREATE UNIQUE INDEX observations_live ON observations(site_key, transect_id, image_id) WHERE live = 1;
CREATE INDEX observations_by_upload ON observations(upload_id);
CREATE TABLE water_levels(
  id INTEGER PRIMARY KEY,
  upload_id INTEGER NOT NULL REFERENCES uploads(id),
  site_key INTEGER NOT NULL,
  time_s REAL NOT NULL,
  level_m REAL NOT NULL,
  live INTEGER NOT NULL DEFAULT 1);
CREATE UNIQUE INDEX water_levels_live ON water_levels(site_key, time_s) WHERE live = 1;
CREATE INDEX water_levels_by_upload ON water_levels(upload_id);
CREATE TABLE waves(
  id INTEGER PRIMARY KEY,
  upload_id INTEGER NOT NULL REFERENCES uploads(id),
  site_key INTEGER NOT NULL,
  time_s REAL NOT NULL,
  hs_m REAL NOT NULL, tp_s REAL NOT NULL, dir_deg REAL, depth_m REAL,
  live INTEGER NOT NULL DEFAULT 1);
CREATE UNIQUE INDEX waves_live ON waves(site_key, time_s) WHERE live = 1;
CREATE INDEX waves_by_upload ON waves(upload_id);
CREATE TABLE slopes(
  id INTEGER PRIMARY KEY,
  upload_id INTEGER NOT NULL REFERENCES uploads(id),
  site_key INTEGER NOT NULL,
  transect_id TEXT NOT NULL,
  slope REAL NOT NULL,
  slope_sigma REAL,
  live INTEGER NOT NULL DEFAULT 1);
CREATE UNIQUE INDEX slopes_live ON slopes(site_key, transect_id) WHERE live = 1;
CREATE INDEX slopes_by_upload ON slopes(upload_id);
CREATE TABLE documents(
  id INTEGER PRIMARY KEY,
  upload_id INTEGER NOT NULL REFERENCES uploads(id),
  site_key INTEGER NOT NULL,
  kind TEXT NOT NULL,
  content TEXT NOT NULL,
  live INTEGER NOT NULL DEFAULT 1);
CREATE INDEX documents_by_upload ON documents(upload_id);
-- Every upload or retraction appends what it touched: a transect, or NULL for
-- a site-wide input. Runs remember the sequence number they saw.
CREATE TABLE input_changes(
  seq INTEGER PRIMARY KEY AUTOINCREMENT,
  site_key INTEGER NOT NULL,
  transect_id TEXT,
  upload_id INTEGER NOT NULL);
CREATE INDEX input_changes_by_site ON input_changes(site_key, seq);
CREATE TABLE runs(
  id INTEGER PRIMARY KEY,
  site_key INTEGER NOT NULL REFERENCES sites(site_key),
  state TEXT NOT NULL,
  reason TEXT NOT NULL DEFAULT '',
  options TEXT NOT NULL,
  scope TEXT NOT NULL,
  input_seq INTEGER NOT NULL,
  created_at TEXT NOT NULL,
  started_at TEXT NOT NULL DEFAULT '',
  finished_at TEXT NOT NULL DEFAULT '',
  transects_total INTEGER NOT NULL DEFAULT 0,
  transects_done INTEGER NOT NULL DEFAULT 0,
  provenance TEXT,
  requested_by TEXT NOT NULL);
CREATE INDEX runs_by_site ON runs(site_key, id);
CREATE TABLE results(
  seq INTEGER PRIMARY KEY AUTOINCREMENT,
  run_id INTEGER NOT NULL REFERENCES runs(id),
  site_key INTEGER NOT NULL,
  transect_id TEXT NOT NULL,
  rows_json TEXT NOT NULL,
  rows_csv TEXT NOT NULL,
  summary TEXT NOT NULL,
  sha256 TEXT NOT NULL,
  changed INTEGER NOT NULL);
CREATE INDEX results_by_transect ON results(site_key, transect_id, run_id);
CREATE INDEX results_by_seq ON results(site_key, seq);
CREATE TABLE api_keys(
  id INTEGER PRIMARY KEY,
  name TEXT NOT NULL UNIQUE,
  prefix TEXT NOT NULL UNIQUE,
  hash TEXT NOT NULL,
  role TEXT NOT NULL CHECK(role IN ('read', 'write')),
  created_at TEXT NOT NULL,
  revoked_at TEXT);
)sql"},
    // Observations keyed by integers: transect and image ids are interned per
    // site, so the idempotency index compares three integers instead of two
    // strings. The rows of one upload are one contiguous rowid range (one
    // transaction, one writer), recorded on the upload; retraction updates
    // that range, so no per-row upload index is kept. The upload reference is
    // kept without a foreign-key check: the row is written in the same
    // transaction by the store itself, and the per-row lookup is not free.
    {2, R"sql(
CREATE TABLE interned_ids(
  id_key INTEGER PRIMARY KEY,
  site_key INTEGER NOT NULL REFERENCES sites(site_key),
  kind TEXT NOT NULL CHECK(kind IN ('transect', 'image')),
  name TEXT NOT NULL,
  UNIQUE(site_key, kind, name));
INSERT INTO interned_ids(site_key, kind, name)
  SELECT DISTINCT site_key, 'transect', transect_id FROM observations ORDER BY 1, 3;
INSERT INTO interned_ids(site_key, kind, name)
  SELECT DISTINCT site_key, 'image', image_id FROM observations ORDER BY 1, 3;
CREATE TABLE observations_keyed(
  id INTEGER PRIMARY KEY,
  upload_id INTEGER NOT NULL,
  site_key INTEGER NOT NULL,
  transect_key INTEGER NOT NULL,
  image_key INTEGER NOT NULL,
  time_s REAL NOT NULL,
  chainage_m REAL NOT NULL,
  sensor TEXT NOT NULL,
  cloud_fraction REAL,
  georef_rmse_m REAL,
  live INTEGER NOT NULL DEFAULT 1);
INSERT INTO observations_keyed(id, upload_id, site_key, transect_key, image_key, time_s, chainage_m, sensor,
                               cloud_fraction, georef_rmse_m, live)
  SELECT o.id, o.upload_id, o.site_key, t.id_key, i.id_key, o.time_s, o.chainage_m, o.sensor,
         o.cloud_fraction, o.georef_rmse_m, o.live
  FROM observations o
  JOIN interned_ids t ON t.site_key = o.site_key AND t.kind = 'transect' AND t.name = o.transect_id
  JOIN interned_ids i ON i.site_key = o.site_key AND i.kind = 'image' AND i.name = o.image_id;
ALTER TABLE uploads ADD COLUMN first_row_id INTEGER;
ALTER TABLE uploads ADD COLUMN last_row_id INTEGER;
UPDATE uploads SET first_row_id = (SELECT MIN(id) FROM observations WHERE upload_id = uploads.id),
                   last_row_id = (SELECT MAX(id) FROM observations WHERE upload_id = uploads.id)
  WHERE kind = 'observations';
DROP TABLE observations;
ALTER TABLE observations_keyed RENAME TO observations;
CREATE UNIQUE INDEX observations_live ON observations(site_key, transect_key, image_key) WHERE live = 1;
)sql"},
    // Series reply documents leave the results row for a table of their own,
    // and gain gzip members compressed once by the run. Inline, ~1 MB of
    // documents sat before a result's summary and hash: every result lookup
    // walked their overflow pages. Results stored before get no gzip member
    // and are sent uncompressed.
    {3, R"sql(
CREATE TABLE result_documents(
  id INTEGER PRIMARY KEY,
  result_seq INTEGER NOT NULL REFERENCES results(seq),
  kind TEXT NOT NULL CHECK(kind IN ('json', 'csv', 'json.gz', 'csv.gz')),
  content BLOB NOT NULL);
CREATE UNIQUE INDEX result_documents_by_result ON result_documents(result_seq, kind);
INSERT INTO result_documents(result_seq, kind, content) SELECT seq, 'json', rows_json FROM results;
INSERT INTO result_documents(result_seq, kind, content) SELECT seq, 'csv', rows_csv FROM results;
ALTER TABLE results DROP COLUMN rows_json;
ALTER TABLE results DROP COLUMN rows_csv;
)sql"},
    {4, R"sql(
CREATE TABLE result_rows(
  result_seq INTEGER PRIMARY KEY REFERENCES results(seq),
  content BLOB NOT NULL);
)sql",
     series_documents_to_rows},
    // API keys scoped to one site (NULL: every site) and with an expiry
    // (NULL: never). The site is a plain id, not a reference: a key may be
    // made before its site exists.
    {5, R"sql(
ALTER TABLE api_keys ADD COLUMN site_id TEXT;
ALTER TABLE api_keys ADD COLUMN expires_at TEXT;
)sql"},
    // The rows an upload refused (with ?on_invalid=skip), kept for its readers:
    // the report of the upload is no longer the only place that names them.
    {6, R"sql(
CREATE TABLE upload_rejected_rows(
  upload_id INTEGER NOT NULL REFERENCES uploads(id),
  line INTEGER NOT NULL,
  key TEXT NOT NULL,
  field TEXT NOT NULL,
  value TEXT NOT NULL,
  reason TEXT NOT NULL);
CREATE INDEX upload_rejected_rows_by_upload ON upload_rejected_rows(upload_id, line);
)sql"},
};

}  // namespace

int latest_sqlite_schema_version() { return kMigrations.back().version; }

int migrate_sqlite_schema(Connection& db, int up_to_version) {
  db.exec("CREATE TABLE IF NOT EXISTS schema_migrations(version INTEGER PRIMARY KEY, applied_at TEXT NOT NULL)");
  int current = 0;
  {
    auto q = db.prepare("SELECT COALESCE(MAX(version), 0) FROM schema_migrations");
    if (q.step()) current = static_cast<int>(q.integer(0));
  }
  if (current > latest_sqlite_schema_version())
    throw StoreError("database schema version " + std::to_string(current) + " is newer than this build (" +
                     std::to_string(latest_sqlite_schema_version()) + ")");
  for (const auto& m : kMigrations) {
    if (m.version <= current || m.version > up_to_version) continue;
    Transaction tx(db);
    db.exec(m.sql);
    if (m.then) m.then(db);
    db.prepare("INSERT INTO schema_migrations(version, applied_at) VALUES(?, strftime('%Y-%m-%dT%H:%M:%SZ','now'))")
        .bind(1, m.version)
        .run();
    tx.commit();
    current = m.version;
  }
  return current;
}

}  // namespace strandline::store
