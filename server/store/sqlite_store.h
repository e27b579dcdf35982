// The SQLite backend of Store: one writer connection behind a mutex (SQLite
// allows one writer at a time; queuing here keeps busy-waits out of the
// database), and a pool of reader connections that WAL mode lets read a
// consistent snapshot while a write is in progress.
#pragma once

#include <condition_variable>
#include <memory>
#include <mutex>
#include <thread>
#include <string>
#include <vector>

#include "server/store/sqlite_connection.h"
#include "server/store/store.h"

namespace strandline::store {

class SqliteStore final : public Store {
 public:
  explicit SqliteStore(const std::string& path);
  ~SqliteStore() override;

  // Writes that would grow the database file past `max_bytes` fail with
  // StorageFull (rolled back), as on a full disk; 0 lifts the limit.
  void limit_size(std::int64_t max_bytes);

  void create_site(const Site& site) override;
  std::optional<Site> site(const std::string& id) override;
  std::vector<Site> sites(const std::string& after_id, int limit) override;
  void replace_transects(const std::string& site_id, const std::vector<Transect>& transects) override;
  std::vector<Transect> transects(const std::string& site_id) override;

  UploadResult add_observations(const std::string& site_id, const UploadMeta& meta,
                                const std::vector<ObservationRow>& rows) override;
  UploadResult add_water_levels(const std::string& site_id, const UploadMeta& meta,
                                const std::vector<WaterLevelRow>& rows) override;
  UploadResult add_waves(const std::string& site_id, const UploadMeta& meta, const std::vector<WaveRow>& rows) override;
  UploadResult add_slopes(const std::string& site_id, const UploadMeta& meta,
                          const std::vector<SlopeRow>& rows) override;
  UploadResult add_document(const std::string& site_id, const std::string& kind, const UploadMeta& meta,
                            const std::string& content) override;

  std::vector<UploadInfo> uploads(const std::string& site_id, std::int64_t before_id, int limit) override;
  std::optional<UploadInfo> upload(const std::string& site_id, std::int64_t upload_id) override;
  bool retract_upload(const std::string& site_id, std::int64_t upload_id, const Retraction& r) override;
  std::int64_t purge_retracted(const std::string& site_id) override;

  std::vector<ObservationRow> live_observations(const std::string& site_id,
                                                const std::set<std::string>& transects) override;
  std::vector<WaterLevelRow> live_water_levels(const std::string& site_id) override;
  std::vector<WaveRow> live_waves(const std::string& site_id) override;
  std::vector<SlopeRow> live_slopes(const std::string& site_id) override;
  std::vector<StoredImage> stored_images(const std::string& site_id,
                                         const std::vector<std::string>& image_ids) override;
  std::optional<std::string> live_document(const std::string& site_id, const std::string& kind) override;
  std::int64_t input_seq(const std::string& site_id) override;
  std::optional<std::set<std::string>> changed_transects(const std::string& site_id, std::int64_t since) override;

  std::int64_t create_run(const RunInfo& run) override;
  std::optional<RunInfo> run(std::int64_t run_id) override;
  std::vector<RunInfo> runs(const std::string& site_id, std::int64_t before_id, int limit) override;
  void mark_run_started(std::int64_t run_id, std::int64_t transects_total) override;
  void mark_run_failed(std::int64_t run_id, const std::string& reason) override;
  void finish_run(std::int64_t run_id, const nlohmann::json& provenance,
                  const std::vector<TransectResult>& results) override;
  std::optional<RunInfo> latest_done_run(const std::string& site_id) override;
  int fail_interrupted_runs() override;

  std::optional<TransectResult> result(const std::string& site_id, const std::string& transect_id,
                                       std::int64_t run_id, ResultParts parts) override;
  std::vector<TransectResult> latest_summaries(const std::string& site_id) override;
  std::vector<TransectResult> changes(const std::string& site_id, std::int64_t since, int limit) override;

  void add_key(const ApiKey& key) override;
  std::vector<ApiKey> keys() override;
  bool revoke_key(const std::string& name) override;
  std::optional<ApiKey> key_by_prefix(const std::string& prefix) override;

 private:
  // A reader connection borrowed from the pool for one call.
  class ReaderLease {
   public:
    ReaderLease(SqliteStore& store, std::unique_ptr<Connection> c) : store_(&store), c_(std::move(c)) {}
    ReaderLease(ReaderLease&&) = default;
    ~ReaderLease() {
      if (c_) store_->give_back(std::move(c_));
    }
    Connection& operator*() { return *c_; }
    Connection* operator->() { return c_.get(); }

   private:
    SqliteStore* store_;
    std::unique_ptr<Connection> c_;
  };
  ReaderLease reader();
  void give_back(std::unique_ptr<Connection> c);

  std::string path_;
  std::mutex writer_mutex_;
  std::unique_ptr<Connection> writer_;
  std::mutex readers_mutex_;
  std::vector<std::unique_ptr<Connection>> idle_readers_;
  // Copies the write-ahead log back into the database in the background
  // (passive: never blocks readers or the writer).
  void checkpoint_loop();
  std::mutex checkpoint_mutex_;
  std::condition_variable checkpoint_wake_;
  bool stopping_ = false;
  std::thread checkpointer_;
};

}  // namespace strandline::store
