// The SQLite store: migrations, idempotent uploads, conflicts rolling back,
// retraction and purge, incremental-run bookkeeping, results and changes, keys.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <set>
#include <unistd.h>

#include "corrections/core/errors.h"
#include "corrections/core/time_utc.h"
#include "server/store/api_keys.h"
#include "server/store/sqlite_connection.h"
#include "server/store/sqlite_schema.h"
#include "server/store/store.h"
#include "server/store/sqlite_store.h"
#include "server/store/serve_lock.h"

using namespace strandline;
using namespace strandline::store;

namespace {

class StoreTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = std::filesystem::temp_directory_path() / ("strandline-store-" + std::to_string(getpid()) + "-" +
                                                      ::testing::UnitTest::GetInstance()->current_test_info()->name());
    std::filesystem::remove_all(dir_);
    std::filesystem::create_directories(dir_);
    path_ = (dir_ / "test.db").string();
    store_ = open_sqlite_store(path_);
    Site site;
    site.id = "s1";
    site.name = "Invented Cove";
    site.crs = "EPSG:32631";
    store_->create_site(site);
    store_->replace_transects("s1", {{"T1", {0, 0, 90, 300}, {}}, {"T2", {0, 100, 90, 300}, {}}});
  }
  void TearDown() override {
    store_.reset();
    std::filesystem::remove_all(dir_);
  }
  static ObservationRow obs(const std::string& transect, const std::string& image, double chainage_m) {
    return {2, transect, image, "landsat8", 1.6e9, chainage_m, 0.1, kUnknown};
  }
  static UploadMeta meta(std::int64_t received) {
    UploadMeta m;
    m.content_type = "text/csv";
    m.sha256 = "x";
    m.uploaded_by = "tester";
    m.received = received;
    return m;
  }

  std::filesystem::path dir_;
  std::string path_;
  std::unique_ptr<Store> store_;
};

TEST_F(StoreTest, MigratesOnceAndReopens) {
  store_.reset();
  Connection db(path_, false);
  EXPECT_EQ(migrate_sqlite_schema(db), latest_sqlite_schema_version());
  auto q = db.prepare("SELECT COUNT(*) FROM schema_migrations");
  ASSERT_TRUE(q.step());
  EXPECT_EQ(q.integer(0), latest_sqlite_schema_version());
  auto mode = db.prepare("PRAGMA journal_mode");
  ASSERT_TRUE(mode.step());
  EXPECT_EQ(mode.text(0), "wal");
  store_ = open_sqlite_store(path_);
  EXPECT_TRUE(store_->site("s1").has_value());
}

TEST_F(StoreTest, DuplicateSiteIsRefused) {
  Site again;
  again.id = "s1";
  again.name = "x";
  again.crs = "EPSG:32631";
  EXPECT_THROW(store_->create_site(again), AlreadyExists);
}

TEST_F(StoreTest, ResentRowsAreDuplicatesAndChangeNothing) {
  const std::vector<ObservationRow> rows = {obs("T1", "A", 100), obs("T1", "B", 101), obs("T2", "A", 90)};
  auto first = store_->add_observations("s1", meta(3), rows);
  EXPECT_EQ(first.inserted, 3);
  EXPECT_EQ(first.duplicates, 0);
  auto second = store_->add_observations("s1", meta(3), rows);
  EXPECT_EQ(second.inserted, 0);
  EXPECT_EQ(second.duplicates, 3);
  EXPECT_EQ(store_->live_observations("s1", {}).size(), 3u);
}

TEST_F(StoreTest, ConflictRollsBackTheWholeUpload) {
  store_->add_observations("s1", meta(1), {obs("T1", "A", 100)});
  const auto uploads_before = store_->uploads("s1", 0, 100).size();
  // One new row and one contradicting the stored (T1, A): nothing may be stored.
  try {
    store_->add_observations("s1", meta(2), {obs("T2", "Z", 50), obs("T1", "A", 100.5)});
    FAIL() << "expected a conflict";
  } catch (const ConflictError& e) {
    ASSERT_EQ(e.rows.size(), 1u);
    EXPECT_EQ(e.rows[0].key, "T1/A");
    EXPECT_EQ(e.rows[0].field, "chainage_m");
  }
  EXPECT_EQ(store_->live_observations("s1", {}).size(), 1u);
  EXPECT_EQ(store_->uploads("s1", 0, 100).size(), uploads_before);
}

TEST_F(StoreTest, RetractionHidesRowsRecordsWhoAndPurgeErases) {
  auto up = store_->add_observations("s1", meta(2), {obs("T1", "A", 100), obs("T1", "B", 101)});
  ASSERT_TRUE(store_->retract_upload("s1", up.upload_id, {"2026-01-01T00:00:00Z", "alice", "wrong georeference"}));
  EXPECT_FALSE(store_->retract_upload("s1", up.upload_id, {"", "alice", "again"}));
  EXPECT_TRUE(store_->live_observations("s1", {}).empty());
  const auto info = store_->upload("s1", up.upload_id);
  ASSERT_TRUE(info && info->retraction);
  EXPECT_EQ(info->retraction->by, "alice");
  EXPECT_EQ(info->retraction->reason, "wrong georeference");
  EXPECT_EQ(info->inserted, 2);  // the upload record itself is unchanged
  // The same rows may be stored again after a retraction (a corrected upload).
  EXPECT_EQ(store_->add_observations("s1", meta(1), {obs("T1", "A", 99)}).inserted, 1);
  EXPECT_EQ(store_->purge_retracted("s1"), 2);
  EXPECT_TRUE(store_->upload("s1", up.upload_id)->purged_at.has_value());
  EXPECT_EQ(store_->live_observations("s1", {}).size(), 1u);
  EXPECT_THROW(store_->retract_upload("s1", 9999, {"", "a", "b"}), NotFound);
}

TEST_F(StoreTest, ChangedTransectsFollowUploadsAndSiteWideInputs) {
  const auto seq0 = store_->input_seq("s1");
  store_->add_observations("s1", meta(1), {obs("T2", "A", 10)});
  auto changed = store_->changed_transects("s1", seq0);
  ASSERT_TRUE(changed.has_value());
  EXPECT_EQ(*changed, (std::set<std::string>{"T2"}));
  const auto seq1 = store_->input_seq("s1");
  EXPECT_TRUE(store_->changed_transects("s1", seq1)->empty());
  // A resent (duplicate-only) upload changes nothing.
  store_->add_observations("s1", meta(1), {obs("T2", "A", 10)});
  EXPECT_TRUE(store_->changed_transects("s1", seq1)->empty());
  // A water-level record affects every transect.
  store_->add_water_levels("s1", meta(1), {{2, 1.6e9, 0.4}});
  EXPECT_FALSE(store_->changed_transects("s1", seq1).has_value());
}

TEST_F(StoreTest, SeriesIdempotentByTimeWithConflicts) {
  EXPECT_EQ(store_->add_water_levels("s1", meta(2), {{2, 100, 0.5}, {3, 200, 0.6}}).inserted, 2);
  auto again = store_->add_water_levels("s1", meta(1), {{2, 100, 0.5}});
  EXPECT_EQ(again.duplicates, 1);
  EXPECT_THROW(store_->add_water_levels("s1", meta(1), {{2, 200, 0.7}}), ConflictError);
  EXPECT_EQ(store_->live_water_levels("s1").size(), 2u);
}

TEST_F(StoreTest, DocumentsAreIdempotentByContentHash) {
  UploadMeta m = meta(1);
  m.sha256 = "abc";
  auto first = store_->add_document("s1", "tide_constituents", m, "{}");
  EXPECT_FALSE(first.replay);
  auto second = store_->add_document("s1", "tide_constituents", m, "{}");
  EXPECT_TRUE(second.replay);
  EXPECT_EQ(second.upload_id, first.upload_id);
  EXPECT_EQ(store_->uploads("s1", 0, 100).size(), 1u);
}

TEST_F(StoreTest, ResultsAreVersionedByRunAndChangesSkipIdenticalResults) {
  RunInfo run;
  run.site_id = "s1";
  run.scope = "all";
  const auto r1 = store_->create_run(run);
  store_->mark_run_started(r1, 2);
  const auto rows = [](const char* transect, double chainage_m) {
    CleanedRow r;
    r.transect_id = transect;
    r.image_id = "IMG,7";
    r.chainage_m = chainage_m;
    return std::vector<CleanedRow>{r};
  };
  store_->finish_run(r1, {{"k", 1}}, {{0, r1, "T1", rows("T1", 1), {}, ""}, {0, r1, "T2", rows("T2", 2), {}, ""}});
  const auto r2 = store_->create_run(run);
  store_->finish_run(r2, {}, {{0, r2, "T1", rows("T1", 1), {}, ""}, {0, r2, "T2", rows("T2", 3), {}, ""}});
  EXPECT_EQ(store_->result("s1", "T2", 0, {})->rows.at(0).chainage_m, 3);
  EXPECT_EQ(store_->result("s1", "T2", r1, {})->rows.at(0).chainage_m, 2);
  EXPECT_EQ(store_->result("s1", "T2", r1, {})->rows.at(0).image_id, "IMG,7");
  EXPECT_TRUE(store_->result("s1", "T2", r1, {false, false})->rows.empty());  // only what is asked is read
  EXPECT_EQ(store_->run(r1)->state, "done");
  const auto all = store_->changes("s1", 0, 100);
  ASSERT_EQ(all.size(), 3u);  // T1 and T2 of run 1, T2 of run 2 (T1 unchanged in run 2)
  const auto after_first = store_->changes("s1", all[1].seq, 100);
  ASSERT_EQ(after_first.size(), 1u);
  EXPECT_EQ(after_first[0].transect_id, "T2");
  EXPECT_EQ(after_first[0].run_id, r2);
  EXPECT_EQ(store_->latest_done_run("s1")->id, r2);
}

TEST_F(StoreTest, InterruptedRunsBecomeFailed) {
  RunInfo run;
  run.site_id = "s1";
  run.scope = "all";
  const auto id = store_->create_run(run);
  EXPECT_EQ(store_->fail_interrupted_runs(), 1);
  EXPECT_EQ(store_->run(id)->state, "failed");
}

TEST_F(StoreTest, KeysAreStoredHashedAndVerified) {
  const auto key = generate_api_key("pipeline", "write");
  store_->add_key(key.record);
  EXPECT_THROW(store_->add_key(generate_api_key("pipeline", "read").record), AlreadyExists);
  for (const auto& k : store_->keys()) EXPECT_EQ(k.hash_hex.find(key.secret), std::string::npos);
  EXPECT_EQ(store_->keys()[0].hash_hex, sha256_hex(key.secret));
  ASSERT_TRUE(verify_api_key(*store_, key.secret).has_value());
  std::string wrong = key.secret;
  wrong.back() = wrong.back() == 'a' ? 'b' : 'a';
  EXPECT_FALSE(verify_api_key(*store_, wrong).has_value());
  EXPECT_FALSE(verify_api_key(*store_, "not-a-key").has_value());
  EXPECT_TRUE(store_->revoke_key("pipeline"));
  EXPECT_FALSE(verify_api_key(*store_, key.secret).has_value());
}

// The clock is passed in: a key is accepted before its expiry and refused from it on.
TEST_F(StoreTest, ExpiredKeysAreRefused) {
  const TimeS t0 = parse_time_utc("2026-03-01T12:00:00Z");
  const auto key = generate_api_key("nightly", "write", {.site_id = std::nullopt, .expires = t0 + 3600});
  store_->add_key(key.record);
  const auto forever = generate_api_key("forever", "read");
  store_->add_key(forever.record);
  EXPECT_EQ(store_->keys()[0].expires_at, std::optional<std::string>("2026-03-01T13:00:00Z"));
  EXPECT_FALSE(store_->keys()[1].expires_at.has_value());
  EXPECT_TRUE(verify_api_key(*store_, key.secret, t0).has_value());
  EXPECT_TRUE(verify_api_key(*store_, key.secret, t0 + 3599).has_value());
  EXPECT_FALSE(verify_api_key(*store_, key.secret, t0 + 3600).has_value());
  EXPECT_FALSE(verify_api_key(*store_, key.secret, t0 + 86400).has_value());
  EXPECT_TRUE(verify_api_key(*store_, forever.secret, t0 + 1e9).has_value());
  // The default clock is the system's: a key that expired a minute ago is refused now.
  const auto stale = generate_api_key("stale", "write", {.site_id = std::nullopt, .expires = utc_now_s() - 60});
  store_->add_key(stale.record);
  EXPECT_FALSE(verify_api_key(*store_, stale.secret).has_value());
  EXPECT_TRUE(verify_api_key(*store_, forever.secret).has_value());
  // An expiry that cannot be read is treated as passed.
  ApiKey odd = store_->keys()[0];
  odd.expires_at = "not a time";
  EXPECT_TRUE(key_expired(odd, t0));
}

TEST(KeyExpiry, TimesAndDurations) {
  const TimeS now = parse_time_utc("2026-03-01T12:00:00Z");
  EXPECT_DOUBLE_EQ(parse_key_expiry("90d", now), now + 90 * 86400.0);
  EXPECT_DOUBLE_EQ(parse_key_expiry("12h", now), now + 12 * 3600.0);
  EXPECT_DOUBLE_EQ(parse_key_expiry("2w", now), now + 14 * 86400.0);
  EXPECT_DOUBLE_EQ(parse_key_expiry("2027-01-01T00:00:00Z", now), parse_time_utc("2027-01-01T00:00:00Z"));
  for (const char* bad : {"", "0d", "d", "90", "90y", "-3d", "2020-01-01T00:00:00Z", "2026-03-01T12:00:00Z",
                          "2027-01-01T00:00:00", "tomorrow", "1234567d"})
    EXPECT_THROW(parse_key_expiry(bad, now), FieldError) << bad;
}

TEST_F(StoreTest, SiteScopeOfAKeyIsRecorded) {
  const auto scoped = generate_api_key("cove-writer", "write", {.site_id = "s1", .expires = std::nullopt});
  const auto wide = generate_api_key("admin", "write");
  store_->add_key(scoped.record);
  store_->add_key(wide.record);
  const auto keys = store_->keys();
  ASSERT_EQ(keys.size(), 2u);
  EXPECT_EQ(keys[0].site_id, std::optional<std::string>("s1"));
  EXPECT_FALSE(keys[1].site_id.has_value());
  const auto verified = verify_api_key(*store_, scoped.secret);
  ASSERT_TRUE(verified.has_value());
  EXPECT_EQ(verified->site_id, std::optional<std::string>("s1"));
  EXPECT_TRUE(key_covers_site(*verified, "s1"));
  EXPECT_FALSE(key_covers_site(*verified, "s2"));
  EXPECT_FALSE(key_covers_site(*verified, "s"));
  EXPECT_TRUE(key_covers_site(keys[1], "s1"));
  EXPECT_TRUE(key_covers_site(keys[1], "anything"));
  EXPECT_THROW(generate_api_key("empty", "read", {.site_id = "", .expires = std::nullopt}), StoreError);
}

// Schema version 5 adds a site scope and an expiry to keys: keys made under
// version 4 keep working, unscoped and without expiry.
TEST_F(StoreTest, KeysMadeBeforeSiteScopesSurviveTheMigration) {
  const std::string old_path = (dir_ / "v4.db").string();
  const auto old_key = generate_api_key("old-writer", "write");
  {
    Connection db(old_path, false);
    ASSERT_EQ(migrate_sqlite_schema(db, 4), 4);
    EXPECT_THROW(db.exec("SELECT site_id FROM api_keys"), StoreError);  // the column is new in version 5
    db.prepare("INSERT INTO api_keys(name, prefix, hash, role, created_at) VALUES(?, ?, ?, ?, ?)")
        .bind(1, old_key.record.name)
        .bind(2, old_key.record.prefix)
        .bind(3, old_key.record.hash_hex)
        .bind(4, old_key.record.role)
        .bind(5, "2026-01-01T00:00:00Z")
        .run();
  }
  auto migrated = open_sqlite_store(old_path);
  const auto keys = migrated->keys();
  ASSERT_EQ(keys.size(), 1u);
  EXPECT_EQ(keys[0].name, "old-writer");
  EXPECT_EQ(keys[0].created_at, "2026-01-01T00:00:00Z");
  EXPECT_FALSE(keys[0].site_id.has_value());
  EXPECT_FALSE(keys[0].expires_at.has_value());
  const auto verified = verify_api_key(*migrated, old_key.secret, parse_time_utc("2100-01-01T00:00:00Z"));
  ASSERT_TRUE(verified.has_value());
  EXPECT_TRUE(key_covers_site(*verified, "any-site"));
  const auto scoped = generate_api_key("new-reader", "read", {.site_id = "old", .expires = utc_now_s() + 3600});
  migrated->add_key(scoped.record);
  EXPECT_EQ(migrated->keys()[1].site_id, std::optional<std::string>("old"));
  EXPECT_TRUE(verify_api_key(*migrated, scoped.secret).has_value());
  migrated.reset();
  Connection db(old_path, false);
  auto version = db.prepare("SELECT MAX(version) FROM schema_migrations");
  ASSERT_TRUE(version.step());
  EXPECT_EQ(version.integer(0), latest_sqlite_schema_version());
}

// FIPS 180-2 test vector (SHA-256 of "abc").
// Uploads insert many rows per statement: duplicates inside one upload, across
// statement boundaries and against stored rows must still be counted row by row.
TEST_F(StoreTest, BatchedInsertsCountEveryRowAcrossStatementBoundaries) {
  std::vector<ObservationRow> first;
  for (int i = 0; i < 300; ++i) first.push_back(obs(i % 2 ? "T1" : "T2", "IMG" + std::to_string(i), 100 + i));
  first.push_back(first[5]);    // identical repeat of a row in the first statement
  first.push_back(first[299]);  // ... and of one in the last
  const auto a = store_->add_observations("s1", meta(302), first);
  EXPECT_EQ(a.inserted, 300);
  EXPECT_EQ(a.duplicates, 2);

  std::vector<ObservationRow> second(first.begin() + 150, first.begin() + 300);  // stored already
  for (int i = 300; i < 450; ++i) second.push_back(obs("T1", "IMG" + std::to_string(i), 100 + i));
  const auto b = store_->add_observations("s1", meta(300), second);
  EXPECT_EQ(b.inserted, 150);
  EXPECT_EQ(b.duplicates, 150);
  EXPECT_EQ(store_->live_observations("s1", {}).size(), 450u);
  EXPECT_EQ(store_->live_observations("s1", {"T2"}).size(), 150u);

  // A contradiction deep in a large upload rolls back everything before it.
  std::vector<ObservationRow> third;
  for (int i = 450; i < 700; ++i) third.push_back(obs("T2", "IMG" + std::to_string(i), 100 + i));
  third.push_back(obs("T1", "IMG301", 5));
  EXPECT_THROW(store_->add_observations("s1", meta(251), third), ConflictError);
  EXPECT_EQ(store_->live_observations("s1", {}).size(), 450u);

  // Retracting the second upload hides exactly its 150 new rows.
  const auto seq = store_->input_seq("s1");
  ASSERT_TRUE(store_->retract_upload("s1", b.upload_id, {"", "alice", "duplicate scene"}));
  EXPECT_EQ(store_->live_observations("s1", {}).size(), 300u);
  const auto changed = store_->changed_transects("s1", seq);
  ASSERT_TRUE(changed.has_value());
  EXPECT_EQ(*changed, (std::set<std::string>{"T1"}));
}

// Schema version 2 re-keys stored observations by interned integers, version 3
// moves series documents to their own table, version 4 turns them into typed
// rows: rows, results and the retraction of an upload written under version 1
// survive all three.
TEST_F(StoreTest, MigrationsKeepStoredObservationsAndResults) {
  const std::string old_path = (dir_ / "v1.db").string();
  {
    Connection db(old_path, false);
    ASSERT_EQ(migrate_sqlite_schema(db, 1), 1);
    db.exec(
        "INSERT INTO sites VALUES(1, 'old', 'Old Cove', 'EPSG:32631', 0, NULL, '{}', '2026-01-01T00:00:00Z');"
        "INSERT INTO transects VALUES(1, 'T1', 0, 0, 90, 300, '{}');"
        "INSERT INTO uploads(id, site_key, kind, content_type, sha256, received_at, uploaded_by, rows_received, "
        "  rows_inserted, rows_duplicate, rows_rejected) VALUES"
        "  (1, 1, 'observations', 'text/csv', 'a', '2026-01-01T00:00:00Z', 'x', 2, 2, 0, 0),"
        "  (2, 1, 'observations', 'text/csv', 'b', '2026-01-02T00:00:00Z', 'x', 1, 1, 0, 0);"
        "INSERT INTO observations(id, upload_id, site_key, transect_id, image_id, time_s, chainage_m, sensor, "
        "  cloud_fraction, georef_rmse_m) VALUES"
        "  (1, 1, 1, 'T1', 'A', 1.6e9, 100, 'landsat8', 0.1, NULL),"
        "  (2, 1, 1, 'T1', 'B', 1.7e9, 101, 'landsat8', NULL, 4),"
        "  (3, 2, 1, 'T1', 'C', 1.8e9, 102, 'sentinel2a', NULL, NULL);"
        "INSERT INTO runs(id, site_key, state, options, scope, input_seq, created_at, requested_by) VALUES"
        "  (1, 1, 'done', '{}', 'all', 0, '2026-01-03T00:00:00Z', 'x');"
        "INSERT INTO results(run_id, site_key, transect_id, rows_json, rows_csv, summary, sha256, changed) VALUES"
        "  (1, 1, 'T1', '{\"rows\":[{\"transect_id\":\"T1\",\"time\":\"2020-09-13T12:26:40Z\",\"sensor\":"
        "\"landsat8\",\"image_id\":\"A\",\"chainage_raw_m\":100.0,\"water_level_m\":0.5,\"setup_m\":null,"
        "\"runup_m\":null,\"wave_level_m\":null,\"z_ref_m\":0.0,\"slope\":0.1,\"correction_m\":5.0,\"chainage_m\":"
        "105.0,\"sigma_m\":12.0,\"sigma_sensor_m\":11.0,\"sigma_water_level_m\":1.0,\"sigma_slope_m\":null,"
        "\"sigma_wave_m\":null,\"cloud_fraction\":0.1,\"georef_rmse_m\":null,\"flags\":[\"cloudy_image\"],"
        "\"accepted\":false}]}', 'transect_id\n', '{\"points\":3}', 'h1', 1);");
  }
  auto migrated = open_sqlite_store(old_path);
  auto rows = migrated->live_observations("old", {"T1"});
  ASSERT_EQ(rows.size(), 3u);
  std::sort(rows.begin(), rows.end(), [](const auto& x, const auto& y) { return x.image_id < y.image_id; });
  EXPECT_EQ(rows[0].image_id, "A");
  EXPECT_EQ(rows[2].sensor, "sentinel2a");
  EXPECT_DOUBLE_EQ(rows[1].chainage_m, 101);
  EXPECT_DOUBLE_EQ(rows[1].georef_rmse_m, 4);
  // Identity and idempotency carry over: the stored row is a duplicate, a changed one a conflict.
  EXPECT_EQ(migrated->add_observations("old", meta(1), {{2, "T1", "C", "sentinel2a", 1.8e9, 102, kUnknown, kUnknown}})
                .duplicates,
            1);
  EXPECT_THROW(migrated->add_observations("old", meta(1), {{2, "T1", "A", "landsat8", 1.6e9, 99, 0.1, kUnknown}}),
               ConflictError);
  // Version 4 turns the stored series document into typed rows, every value kept.
  const auto result = migrated->result("old", "T1", 0, {});
  ASSERT_TRUE(result.has_value());
  ASSERT_EQ(result->rows.size(), 1u);
  const CleanedRow& row = result->rows[0];
  EXPECT_EQ(row.image_id, "A");
  EXPECT_DOUBLE_EQ(row.time_s, 1.6e9);
  EXPECT_DOUBLE_EQ(row.chainage_m, 105.0);
  EXPECT_DOUBLE_EQ(row.correction_m, 5.0);
  EXPECT_TRUE(std::isnan(row.setup_m));
  EXPECT_EQ(row.flags, flag_bit(Flag::cloudy_image));
  EXPECT_FALSE(row.accepted);
  EXPECT_EQ(result->summary["points"], 3);
  ASSERT_TRUE(migrated->retract_upload("old", 1, {"", "alice", "wrong scene"}));
  rows = migrated->live_observations("old", {});
  ASSERT_EQ(rows.size(), 1u);
  EXPECT_EQ(rows[0].image_id, "C");
}

TEST(ApiKeyHash, MatchesThePublishedSha256Vector) {
  EXPECT_EQ(sha256_hex("abc"), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
}

}  // namespace

// A full disk (here: a size limit the file reaches) fails the write as
// StorageFull, rolls the upload back whole, and the store keeps working.
TEST_F(StoreTest, FullStoreRefusesTheWholeUploadAndKeepsWhatItHad) {
  store_->add_observations("s1", meta(1), {obs("T1", "A", 100)});
  const auto uploads_before = store_->uploads("s1", 0, 100).size();
  auto* sqlite = dynamic_cast<SqliteStore*>(store_.get());
  ASSERT_NE(sqlite, nullptr);
  sqlite->limit_size(std::filesystem::file_size(path_) + 8192);
  std::vector<ObservationRow> many;
  for (int i = 0; i < 20000; ++i) many.push_back(obs(i % 2 ? "T1" : "T2", "IMG-" + std::to_string(i), 100 + i % 7));
  EXPECT_THROW(store_->add_observations("s1", meta(static_cast<std::int64_t>(many.size())), many), StorageFull);
  EXPECT_EQ(store_->uploads("s1", 0, 100).size(), uploads_before);
  EXPECT_EQ(store_->live_observations("s1", {}).size(), 1u);
  sqlite->limit_size(0);  // space freed: the same upload goes through
  EXPECT_EQ(store_->add_observations("s1", meta(static_cast<std::int64_t>(many.size())), many).inserted, 20000);
}

// One server per database: a second lock on the same file is refused and names the holder.
TEST_F(StoreTest, SecondServeLockIsRefused) {
  EXPECT_EQ(ServeLock::holder(path_), "");
  {
    ServeLock first(path_);
    EXPECT_NE(ServeLock::holder(path_).find("pid " + std::to_string(getpid())), std::string::npos);
    try {
      ServeLock second(path_);
      FAIL() << "a second lock was granted";
    } catch (const AlreadyServed& e) {
      EXPECT_NE(std::string(e.what()).find("already being served by pid"), std::string::npos) << e.what();
    }
  }
  EXPECT_EQ(ServeLock::holder(path_), "");
  ServeLock again(path_);  // released with its holder
}
