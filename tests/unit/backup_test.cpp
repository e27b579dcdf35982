// Backup and restore of the SQLite store: a copy made while uploads keep
// arriving is one consistent snapshot; outputs are never overwritten by
// accident nor left half-written; a restore checks what it installs, keeps the
// replaced file and refuses a database in use.
#include <gtest/gtest.h>

#include <unistd.h>

#include <algorithm>
#include <atomic>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <string>
#include <thread>
#include <vector>

#include "corrections/core/site_table.h"
#include "server/store/serve_lock.h"
#include "server/store/sqlite_backup.h"
#include "server/store/sqlite_connection.h"
#include "server/store/sqlite_schema.h"
#include "server/store/store.h"

using namespace strandline;
using namespace strandline::store;
namespace fs = std::filesystem;

namespace {

constexpr int kRowsPerUpload = 120;

class BackupTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() / ("strandline-backup-" + std::to_string(getpid()) + "-" +
                                        ::testing::UnitTest::GetInstance()->current_test_info()->name());
    fs::remove_all(dir_);
    fs::create_directories(dir_);
    db_ = (dir_ / "live.db").string();
    store_ = open_sqlite_store(db_);
    add_site("s1");
  }
  void TearDown() override {
    store_.reset();
    fs::remove_all(dir_);
  }
  void add_site(const std::string& id) {
    Site site;
    site.id = id;
    site.name = "Invented Cove " + id;
    site.crs = "EPSG:32631";
    store_->create_site(site);
    store_->replace_transects(id, {{"T1", {0, 0, 90, 300}, {}}, {"T2", {0, 100, 90, 300}, {}}});
  }
  // One upload of kRowsPerUpload new observations (image ids unique to `n`).
  static UploadResult upload(Store& store, int n) {
    std::vector<ObservationRow> rows;
    for (int i = 0; i < kRowsPerUpload; ++i)
      rows.push_back({i + 2, i % 2 ? "T1" : "T2", "IMG-" + std::to_string(n) + "-" + std::to_string(i), "landsat8",
                      1.6e9 + n * 1000.0 + i, 100.0 + i, 0.1, kUnknown});
    UploadMeta meta;
    meta.content_type = "text/csv";
    meta.sha256 = "upload-" + std::to_string(n);
    meta.uploaded_by = "tester";
    meta.received = kRowsPerUpload;
    return store.add_observations("s1", meta, rows);
  }
  static std::int64_t count(Connection& db, const std::string& sql) {
    auto q = db.prepare(sql);
    EXPECT_TRUE(q.step());
    return q.integer(0);
  }
  std::vector<std::string> files_in_dir() const {
    std::vector<std::string> names;
    for (const auto& e : fs::directory_iterator(dir_)) names.push_back(e.path().filename().string());
    std::sort(names.begin(), names.end());
    return names;
  }
  static std::string contents(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    return {std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
  }
  static void write_file(const std::string& path, const std::string& text) {
    std::ofstream(path, std::ios::binary) << text;
  }

  fs::path dir_;
  std::string db_;
  std::unique_ptr<Store> store_;
};

// While another thread keeps uploading, the copy holds a prefix of the
// uploads, each whole: its rows all there and its counts matching them.
TEST_F(BackupTest, CopyOfALiveDatabaseIsOneConsistentSnapshot) {
  for (int n = 0; n < 20; ++n) ASSERT_EQ(upload(*store_, n).inserted, kRowsPerUpload);
  std::atomic<int> acknowledged{20};
  std::atomic<bool> stop{false};
  std::string writer_error;
  std::thread writer([&] {
    try {
      for (int n = 20; !stop; ++n) {
        if (upload(*store_, n).inserted != kRowsPerUpload) throw std::runtime_error("upload not whole");
        acknowledged = n + 1;
      }
    } catch (const std::exception& e) {
      writer_error = e.what();
    }
  });
  while (acknowledged < 23) std::this_thread::sleep_for(std::chrono::milliseconds(1));
  const int before = acknowledged;
  BackupOptions options;
  options.pages_per_step = 2;  // many steps, so uploads commit between them
  options.pause_between_steps = std::chrono::milliseconds(2);
  const std::string out = (dir_ / "copy.db").string();
  BackupReport report;
  try {
    report = backup_sqlite_database(db_, out, options);
  } catch (...) {
    stop = true;
    writer.join();
    throw;
  }
  const int after = acknowledged;
  // Let the writer go on a little: the copy must not change after it is written.
  std::this_thread::sleep_for(std::chrono::milliseconds(50));
  stop = true;
  writer.join();
  ASSERT_EQ(writer_error, "");
  EXPECT_GT(after, before) << "no upload committed during the backup: the test did not exercise a live copy";
  EXPECT_GT(report.steps, 10);
  EXPECT_EQ(report.copy.schema_version, latest_sqlite_schema_version());
  EXPECT_EQ(report.copy.sites, 1);
  EXPECT_GT(report.copy.bytes, 0);
  EXPECT_EQ(report.copy.bytes, report.copy.pages * report.copy.page_size);
  EXPECT_FALSE(fs::exists(out + "-wal"));

  const auto check = check_strandline_database(out);
  Connection copy(out, false);
  const auto uploads = count(copy, "SELECT COUNT(*) FROM uploads");
  EXPECT_GE(uploads, before);
  EXPECT_LE(uploads, after + 1);  // the upload in flight when the backup ended may be in it
  EXPECT_EQ(check.uploads, uploads);
  EXPECT_EQ(count(copy, "SELECT COALESCE(MAX(id), 0) FROM uploads"), uploads) << "uploads are not a prefix";
  EXPECT_EQ(count(copy, "SELECT COUNT(*) FROM observations"), uploads * kRowsPerUpload);
  EXPECT_EQ(count(copy, "SELECT COUNT(*) FROM uploads WHERE rows_inserted != " + std::to_string(kRowsPerUpload)), 0);
  EXPECT_EQ(count(copy,
                  "SELECT COUNT(*) FROM uploads u WHERE (SELECT COUNT(*) FROM observations o "
                  "WHERE o.id BETWEEN u.first_row_id AND u.last_row_id AND o.upload_id = u.id) != u.rows_inserted"),
            0)
      << "an upload in the copy lacks some of its rows";
  EXPECT_EQ(count(copy, "SELECT COUNT(DISTINCT upload_id) FROM input_changes"), uploads);
  // The live database went on past the copy.
  Connection live(db_, true);
  EXPECT_GT(count(live, "SELECT COUNT(*) FROM uploads"), uploads);
}

TEST_F(BackupTest, ExistingOutputIsRefusedUnlessForced) {
  upload(*store_, 1);
  const std::string out = (dir_ / "copy.db").string();
  write_file(out, "an earlier file");
  EXPECT_THROW(backup_sqlite_database(db_, out), BackupRefused);
  EXPECT_EQ(contents(out), "an earlier file");
  BackupOptions force;
  force.force = true;
  const auto report = backup_sqlite_database(db_, out, force);
  EXPECT_EQ(report.copy.uploads, 1);
  EXPECT_EQ(check_strandline_database(out).uploads, 1);
  // Refusals name their file, and nothing half-written is left beside the output.
  try {
    backup_sqlite_database(db_, out);
    FAIL() << "an existing output was overwritten";
  } catch (const BackupRefused& e) {
    EXPECT_NE(std::string(e.what()).find(out), std::string::npos) << e.what();
  }
  EXPECT_THROW(backup_sqlite_database(db_, db_, force), BackupRefused);
  EXPECT_THROW(backup_sqlite_database((dir_ / "missing.db").string(), (dir_ / "x.db").string()), BackupRefused);
  EXPECT_THROW(backup_sqlite_database(db_, (dir_ / "no-folder" / "x.db").string()), BackupRefused);
  for (const auto& name : files_in_dir()) EXPECT_EQ(name.find(".partial"), std::string::npos) << name;
}

TEST_F(BackupTest, BackupOfAFileThatIsNotAStrandlineDatabaseIsRefused) {
  const std::string text = (dir_ / "notes.txt").string();
  write_file(text, std::string(8192, 'x'));
  EXPECT_THROW(backup_sqlite_database(text, (dir_ / "a.db").string()), BackupRefused);
  EXPECT_FALSE(fs::exists(dir_ / "a.db"));
}

TEST_F(BackupTest, RestoreRoundTripKeepsTheReplacedDatabase) {
  upload(*store_, 1);
  upload(*store_, 2);
  const std::string backup = (dir_ / "backup.db").string();
  backup_sqlite_database(db_, backup);
  add_site("s2");  // after the backup: gone once restored
  upload(*store_, 3);
  store_.reset();

  const auto report = restore_sqlite_database(backup, db_);
  EXPECT_EQ(report.restored.uploads, 2);
  EXPECT_EQ(report.restored.sites, 1);
  ASSERT_TRUE(report.kept_as.has_value());
  EXPECT_NE(report.kept_as->find("live.db.before-restore-"), std::string::npos) << *report.kept_as;
  EXPECT_EQ(check_strandline_database(*report.kept_as).sites, 2);
  EXPECT_EQ(check_strandline_database(*report.kept_as).uploads, 3);

  store_ = open_sqlite_store(db_);
  EXPECT_TRUE(store_->site("s1").has_value());
  EXPECT_FALSE(store_->site("s2").has_value());
  EXPECT_EQ(store_->live_observations("s1", {}).size(), 2u * kRowsPerUpload);
  EXPECT_EQ(store_->upload("s1", 3), std::nullopt);
  // The restored database takes new uploads after the restored ones.
  EXPECT_EQ(upload(*store_, 4).upload_id, 3);
  store_.reset();

  // A second restore within the same second keeps both replaced files; --no-keep keeps none.
  const auto again = restore_sqlite_database(backup, db_);
  ASSERT_TRUE(again.kept_as.has_value());
  EXPECT_NE(*again.kept_as, *report.kept_as);
  EXPECT_EQ(check_strandline_database(*again.kept_as).uploads, 3);
  RestoreOptions no_keep;
  no_keep.keep_old = false;
  EXPECT_FALSE(restore_sqlite_database(backup, db_, no_keep).kept_as.has_value());
  for (const auto& name : files_in_dir()) EXPECT_EQ(name.find(".restoring"), std::string::npos) << name;

  // Into a path that does not exist yet.
  const std::string fresh = (dir_ / "fresh.db").string();
  EXPECT_FALSE(restore_sqlite_database(backup, fresh).kept_as.has_value());
  EXPECT_EQ(open_sqlite_store(fresh)->live_observations("s1", {}).size(), 2u * kRowsPerUpload);
}

TEST_F(BackupTest, RestoreIsRefusedWhileTheDatabaseIsInUse) {
  upload(*store_, 1);
  const std::string backup = (dir_ / "backup.db").string();
  backup_sqlite_database(db_, backup);
  upload(*store_, 2);
  RestoreOptions quick;
  quick.busy_timeout = std::chrono::milliseconds(200);
  // An open store (its connections) ...
  EXPECT_TRUE(sqlite_database_in_use(db_).has_value());
  EXPECT_THROW(restore_sqlite_database(backup, db_, quick), BackupRefused);
  EXPECT_EQ(store_->live_observations("s1", {}).size(), 2u * kRowsPerUpload);
  store_.reset();
  EXPECT_FALSE(sqlite_database_in_use(db_).has_value());
  // ... and a serving process's lock keep a restore out.
  {
    ServeLock serving(db_);
    EXPECT_TRUE(sqlite_database_in_use(db_).has_value());
    EXPECT_THROW(restore_sqlite_database(backup, db_, quick), BackupRefused);
  }
  EXPECT_EQ(check_strandline_database(db_).uploads, 2);
  EXPECT_EQ(restore_sqlite_database(backup, db_, quick).restored.uploads, 1);
}

TEST_F(BackupTest, RestoreRefusesFilesThatAreNotStrandlineDatabases) {
  upload(*store_, 1);
  store_.reset();
  const std::string before = contents(db_);
  const auto refused = [&](const std::string& path, const std::string& words) {
    try {
      restore_sqlite_database(path, db_);
      ADD_FAILURE() << path << " was restored";
    } catch (const BackupRefused& e) {
      EXPECT_NE(std::string(e.what()).find(words), std::string::npos) << e.what();
      EXPECT_NE(std::string(e.what()).find(path), std::string::npos) << "the message names no file: " << e.what();
    }
    EXPECT_EQ(contents(db_), before) << "the database changed after refusing " << path;
  };
  const std::string text = (dir_ / "notes.db").string();
  write_file(text, std::string(8192, 'x'));
  refused(text, "not a SQLite database");

  const std::string other = (dir_ / "other.db").string();
  {
    Connection db(other, false);
    db.exec("CREATE TABLE things(id INTEGER PRIMARY KEY, name TEXT); INSERT INTO things(name) VALUES('a');");
  }
  refused(other, "not a Strandline database");

  const std::string newer = (dir_ / "newer.db").string();
  backup_sqlite_database(db_, newer);
  {
    Connection db(newer, false);
    db.exec("INSERT INTO schema_migrations VALUES(999, '2030-01-01T00:00:00Z'); PRAGMA journal_mode=DELETE;");
  }
  refused(newer, "newer than this build");
  refused((dir_ / "missing.db").string(), "does not exist");
  for (const auto& name : files_in_dir()) EXPECT_EQ(name.find(".restoring"), std::string::npos) << name;
}

TEST_F(BackupTest, RestoreRefusesADamagedBackup) {
  for (int n = 0; n < 10; ++n) upload(*store_, n);
  const std::string backup = (dir_ / "backup.db").string();
  const auto report = backup_sqlite_database(db_, backup);
  ASSERT_GT(report.copy.pages, 8);
  store_.reset();
  const std::string before = contents(db_);
  {
    // Garbage over a page in the middle of the file (the header stays valid).
    std::fstream f(backup, std::ios::in | std::ios::out | std::ios::binary);
    f.seekp((report.copy.pages / 2) * report.copy.page_size);
    const std::string garbage(static_cast<std::size_t>(report.copy.page_size), '\xA5');
    f.write(garbage.data(), static_cast<std::streamsize>(garbage.size()));
  }
  try {
    restore_sqlite_database(backup, db_);
    FAIL() << "a damaged backup was restored";
  } catch (const BackupRefused& e) {
    EXPECT_NE(std::string(e.what()).find("damaged"), std::string::npos) << e.what();
  }
  EXPECT_THROW(check_strandline_database(backup), BackupRefused);
  EXPECT_EQ(contents(db_), before);
  for (const auto& name : files_in_dir()) EXPECT_EQ(name.find(".restoring"), std::string::npos) << name;
}

}  // namespace
