// The service's persistence, as an interface so that a PostgreSQL backend can
// follow the SQLite one (sqlite_store.h). Rules every backend keeps:
//   - one transaction per upload: an upload is stored whole or not at all;
//   - raw rows are never rewritten; a retraction is recorded (who, when, why)
//     and takes the upload's rows out of future runs, and only an explicit
//     purge erases them;
//   - idempotency: observations by (transect, image id), series by time,
//     slopes by transect, whole files by content hash;
//   - derived results are versioned by run; reads never wait for a run.
#pragma once

#include <cstdint>
#include <memory>
#include <optional>
#include <set>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "corrections/core/cleaned_row.h"
#include "corrections/core/site_table.h"
#include "corrections/core/time_utc.h"
#include "server/store/store_error.h"

namespace strandline::store {

struct Site {
  std::string id;
  std::string name;
  std::string crs;                    // e.g. "EPSG:32631": the work CRS of transect geometry
  double reference_elevation_m = 0;  // z_ref on the site datum
  double default_slope = kUnknown;   // tan(beta), unknown when none
  nlohmann::json processing_defaults = nlohmann::json::object();  // a run configuration object
  std::string created_at;
};

struct Transect {
  std::string id;
  TransectGeometry geometry;
  nlohmann::json feature;  // the GeoJSON feature as received
};

struct ObservationRow {
  std::int64_t line = 0;  // where it came from in the upload (CSV line or JSON index)
  std::string transect_id;
  std::string image_id;
  std::string sensor;
  TimeS time_s = 0;
  double chainage_m = kUnknown;
  double cloud_fraction = kUnknown;
  double georef_rmse_m = kUnknown;
};

struct WaterLevelRow {
  std::int64_t line = 0;
  TimeS time_s = 0;
  double level_m = kUnknown;
};

struct WaveRow {
  std::int64_t line = 0;
  TimeS time_s = 0;
  double hs_m = kUnknown;
  double tp_s = kUnknown;
  double dir_deg = kUnknown;
  double depth_m = kUnknown;
};

struct SlopeRow {
  std::int64_t line = 0;
  std::string transect_id;
  double slope = kUnknown;
  double slope_sigma = kUnknown;
};

// One row named in an upload report: rejected, duplicate or conflicting.
struct RowIssue {
  std::int64_t line = 0;
  std::string key;     // e.g. "T001/IMG-2019-001" or a time
  std::string field;   // empty when the whole row is at fault
  std::string value;   // the offending text, when one field is at fault
  std::string reason;
};

// An image as stored for a site (live observations, any transect).
struct StoredImage {
  std::string image_id;
  TimeS time_s = 0;
  std::string sensor;
};

// What the caller knows about an upload before storing it.
// Rows refused by an upload that are kept with it, for its later readers.
inline constexpr std::size_t kStoredRejectedRows = 1000;

struct UploadMeta {
  std::string content_type;
  std::string sha256;       // of the request body
  std::string uploaded_by;  // key name
  std::int64_t received = 0;
  std::vector<RowIssue> rejected;  // rows the parser refused (kept with ?on_invalid=skip)
};

struct UploadResult {
  std::int64_t upload_id = 0;
  std::int64_t received = 0;
  std::int64_t inserted = 0;
  std::int64_t duplicates = 0;
  std::vector<RowIssue> duplicate_rows;  // the first few, for the report
  std::vector<RowIssue> rejected;
  bool replay = false;  // a whole file already stored (same content hash): nothing new
};

// Rows that contradict stored ones: the upload was rolled back.
class ConflictError : public StoreError {
 public:
  explicit ConflictError(std::vector<RowIssue> rows)
      : StoreError("rows conflict with stored values"), rows(std::move(rows)) {}
  std::vector<RowIssue> rows;
};

class AlreadyExists : public StoreError {
 public:
  using StoreError::StoreError;
};

class NotFound : public StoreError {
 public:
  using StoreError::StoreError;
};

struct Retraction {
  std::string at;
  std::string by;
  std::string reason;
};

struct UploadInfo {
  std::int64_t id = 0;
  std::string kind;  // observations, water_levels, waves, slopes, tide_constituents
  std::string received_at;
  std::string uploaded_by;
  std::string content_type;
  std::string sha256;
  std::int64_t received = 0, inserted = 0, duplicates = 0, rejected = 0;
  std::optional<Retraction> retraction;
  std::optional<std::string> purged_at;
  std::vector<RowIssue> rejected_rows;  // the first kStoredRejectedRows refused rows (`upload` only, not lists)
};

struct RunInfo {
  std::int64_t id = 0;
  std::string site_id;
  std::string state;  // queued, running, done, failed
  std::string reason;  // why it failed
  nlohmann::json options = nlohmann::json::object();
  std::string scope;  // "changed" or "all"
  std::int64_t input_seq = 0;  // input changes up to this sequence number are in the run
  std::string created_at, started_at, finished_at;
  std::int64_t transects_total = 0, transects_done = 0;
  nlohmann::json provenance;
  std::string requested_by;
};

// One transect's cleaned series from one run: typed rows, never a reply body
// (the faces render and compress what they send).
struct TransectResult {
  std::int64_t seq = 0;  // change cursor position
  std::int64_t run_id = 0;
  std::string transect_id;
  std::vector<CleanedRow> rows;
  nlohmann::json summary;
  std::string sha256;  // of the rows alone (not the run id): the ETag and change test
};

struct ApiKey {
  std::int64_t id = 0;
  std::string name;
  std::string prefix;  // the public part of the key, for lookup
  std::string role;    // "read" or "write"
  std::string created_at;
  std::optional<std::string> revoked_at;
  std::string hash_hex;  // SHA-256 of the whole key
  std::optional<std::string> site_id;     // the one site the key may act on; none = every site
  std::optional<std::string> expires_at;  // RFC 3339 UTC; none = never expires
};

class Store {
 public:
  virtual ~Store() = default;

  // ---- sites and transects ----
  virtual void create_site(const Site& site) = 0;  // AlreadyExists
  virtual std::optional<Site> site(const std::string& id) = 0;
  // Sites in id order after `after_id`, at most `limit`.
  virtual std::vector<Site> sites(const std::string& after_id, int limit) = 0;
  // Replaces the transect set of a site in one transaction.
  virtual void replace_transects(const std::string& site_id, const std::vector<Transect>& transects) = 0;
  virtual std::vector<Transect> transects(const std::string& site_id) = 0;

  // ---- uploads (ConflictError rolls everything back) ----
  virtual UploadResult add_observations(const std::string& site_id, const UploadMeta& meta,
                                        const std::vector<ObservationRow>& rows) = 0;
  virtual UploadResult add_water_levels(const std::string& site_id, const UploadMeta& meta,
                                        const std::vector<WaterLevelRow>& rows) = 0;
  virtual UploadResult add_waves(const std::string& site_id, const UploadMeta& meta,
                                 const std::vector<WaveRow>& rows) = 0;
  virtual UploadResult add_slopes(const std::string& site_id, const UploadMeta& meta,
                                  const std::vector<SlopeRow>& rows) = 0;
  // A whole document (e.g. tide constituents, JSON text), idempotent by content hash.
  virtual UploadResult add_document(const std::string& site_id, const std::string& kind, const UploadMeta& meta,
                                    const std::string& content) = 0;

  // Uploads of a site with id < `before_id` (0 = newest first), at most `limit`.
  virtual std::vector<UploadInfo> uploads(const std::string& site_id, std::int64_t before_id, int limit) = 0;
  virtual std::optional<UploadInfo> upload(const std::string& site_id, std::int64_t upload_id) = 0;
  // False when already retracted.
  virtual bool retract_upload(const std::string& site_id, std::int64_t upload_id, const Retraction& r) = 0;
  // Physically erases the rows of retracted uploads; returns rows erased.
  virtual std::int64_t purge_retracted(const std::string& site_id) = 0;

  // ---- live inputs for a run ----
  // `transects` empty = every transect.
  virtual std::vector<ObservationRow> live_observations(const std::string& site_id,
                                                        const std::set<std::string>& transects) = 0;
  // The stored time and sensor of those of `image_ids` that have live
  // observations (one image, one time and one sensor: the upload checks new rows against it).
  virtual std::vector<StoredImage> stored_images(const std::string& site_id,
                                                 const std::vector<std::string>& image_ids) = 0;
  virtual std::vector<WaterLevelRow> live_water_levels(const std::string& site_id) = 0;
  virtual std::vector<WaveRow> live_waves(const std::string& site_id) = 0;
  virtual std::vector<SlopeRow> live_slopes(const std::string& site_id) = 0;
  virtual std::optional<std::string> live_document(const std::string& site_id, const std::string& kind) = 0;
  // The current input sequence number, and what changed after `since`:
  // transect ids, or nullopt when a site-wide input changed (everything).
  virtual std::int64_t input_seq(const std::string& site_id) = 0;
  virtual std::optional<std::set<std::string>> changed_transects(const std::string& site_id, std::int64_t since) = 0;

  // ---- runs and results ----
  virtual std::int64_t create_run(const RunInfo& run) = 0;  // state "queued"
  virtual std::optional<RunInfo> run(std::int64_t run_id) = 0;
  virtual std::vector<RunInfo> runs(const std::string& site_id, std::int64_t before_id, int limit) = 0;
  virtual void mark_run_started(std::int64_t run_id, std::int64_t transects_total) = 0;
  virtual void mark_run_failed(std::int64_t run_id, const std::string& reason) = 0;
  // Stores every result and marks the run done, in one transaction.
  virtual void finish_run(std::int64_t run_id, const nlohmann::json& provenance,
                          const std::vector<TransectResult>& results) = 0;
  // The last run that finished, if any (its input_seq is the incremental baseline).
  virtual std::optional<RunInfo> latest_done_run(const std::string& site_id) = 0;
  // Runs left queued or running by a previous process become failed.
  virtual int fail_interrupted_runs() = 0;

  // `run_id` 0 = the latest finished run containing the transect. The rows
  // and the summary are read only when asked (a revalidation needs neither).
  struct ResultParts {
    bool rows = true;
    bool summary = true;
  };
  virtual std::optional<TransectResult> result(const std::string& site_id, const std::string& transect_id,
                                               std::int64_t run_id, ResultParts parts) = 0;
  // The latest result of every transect (summaries only; rows left empty).
  virtual std::vector<TransectResult> latest_summaries(const std::string& site_id) = 0;
  // Results whose content changed, with seq > since, oldest first, at most `limit`.
  virtual std::vector<TransectResult> changes(const std::string& site_id, std::int64_t since, int limit) = 0;

  // ---- API keys ----
  virtual void add_key(const ApiKey& key) = 0;  // AlreadyExists on a duplicate name
  virtual std::vector<ApiKey> keys() = 0;
  virtual bool revoke_key(const std::string& name) = 0;
  virtual std::optional<ApiKey> key_by_prefix(const std::string& prefix) = 0;
};

// Opens (creating and migrating) a SQLite database file. With `max_size_bytes`,
// writes that would grow the file past it fail with StorageFull, as on a full disk.
std::unique_ptr<Store> open_sqlite_store(const std::string& path, std::int64_t max_size_bytes = 0);

// Current UTC time as RFC 3339 text.
std::string now_utc_text();

}  // namespace strandline::store
