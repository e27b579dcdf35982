// `strandline backup` and `strandline restore`: copies of the service's
// database. The work is in the store (server/store/sqlite_backup.h); this file
// parses the options, calls it and reports.
#include <iomanip>
#include <iostream>
#include <sstream>

#include "corrections/core/errors.h"
#include "server/cli/args.h"
#include "server/cli/commands.h"
#include "server/store/sqlite_backup.h"

namespace strandline::cli {

namespace {

std::string size_text(std::int64_t bytes) {
  std::ostringstream out;
  out << std::fixed << std::setprecision(1) << static_cast<double>(bytes) / (1 << 20) << " MiB";
  return out.str();
}

void print_check(std::ostream& out, const store::DatabaseCheck& c) {
  out << "schema version " << c.schema_version << ", " << c.pages << " pages of " << c.page_size << " bytes ("
      << size_text(c.bytes) << "), " << c.sites << " sites, " << c.uploads << " uploads, " << c.keys
      << " keys; integrity check ok";
}

}  // namespace

int run_backup(const CommandArgs& argv) {
  Args args("strandline backup --db FILE --out BACKUP [--force]",
            "Copies the service's database while it runs (SQLite online backup, a few pages at a time,\n"
            "one consistent snapshot), into a temporary file beside BACKUP that is checked and renamed\n"
            "into place only when complete.");
  args.add_value("db", "FILE", "SQLite database of the service (may be in use by `strandline serve`)")
      .add_value("out", "BACKUP", "the copy to write (refused when it exists, unless --force)")
      .add_switch("force", "replace an existing BACKUP")
      .add_value("pages-per-step", "N", "pages copied per step (default 256)");
  if (!args.parse(argv)) return kExitOk;
  const std::string db = args.require("db");
  const std::string out = args.require("out");
  store::BackupOptions options;
  options.force = args.flag("force");
  const double pages = args.number_or("pages-per-step", 256);
  if (pages < 1 || pages > 1e6 || pages != static_cast<int>(pages))
    throw UsageError("option --pages-per-step: expected an integer from 1 to 1000000");
  options.pages_per_step = static_cast<int>(pages);
  try {
    const auto report = store::backup_sqlite_database(db, out, options);
    std::cout << "backup of " << db << " written to " << out << ": ";
    print_check(std::cout, report.copy);
    std::cout << " (" << report.steps << " steps, " << report.busy_retries << " busy retries)\n";
  } catch (const store::BackupRefused& e) {
    std::string message = std::string("backup refused: ") + e.what();
    if (!options.force && message.ends_with(" already exists")) message += " (--force replaces it)";
    throw InputError(message);
  }
  return kExitOk;
}

int run_restore(const CommandArgs& argv) {
  Args args("strandline restore --from BACKUP --db FILE [--no-keep]",
            "Replaces the service's database by a backup, which is first copied beside FILE and\n"
            "checked (a Strandline database this build can open, integrity check ok). Refused while\n"
            "a server uses FILE. The replaced database is kept as FILE.before-restore-<UTC time>\n"
            "unless --no-keep. FILE may not exist yet.");
  args.add_value("from", "BACKUP", "the backup to restore (written by `strandline backup`)")
      .add_value("db", "FILE", "SQLite database of the service, replaced atomically")
      .add_switch("no-keep", "do not keep the replaced database");
  if (!args.parse(argv)) return kExitOk;
  const std::string from = args.require("from");
  const std::string db = args.require("db");
  store::RestoreOptions options;
  options.keep_old = !args.flag("no-keep");
  try {
    const auto report = store::restore_sqlite_database(from, db, options);
    std::cout << "restored " << from << " into " << db << ": ";
    print_check(std::cout, report.restored);
    std::cout << "\n";
    if (report.kept_as) std::cout << "the replaced database is kept as " << *report.kept_as << "\n";
  } catch (const store::BackupRefused& e) {
    throw InputError(std::string("restore refused: ") + e.what());
  }
  return kExitOk;
}

}  // namespace strandline::cli
