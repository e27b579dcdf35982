// `strandline serve` (the HTTP service) and `strandline keys` (its API keys).
#include <unistd.h>

#include <csignal>
#include <cstdlib>
#include <filesystem>
#include <iostream>
#include <optional>
#include <thread>

#include "corrections/core/errors.h"
#include "server/cli/args.h"
#include "server/cli/commands.h"
#include "server/app/demo_site.h"
#include "server/http/service.h"
#include "server/io/id_rules.h"
#include "server/store/api_keys.h"
#include "server/store/serve_lock.h"

namespace strandline::cli {

namespace {

std::sig_atomic_t volatile g_stop = 0;
void on_signal(int) { g_stop = 1; }

int positive_int(const Args& args, const std::string& name, int fallback, int max) {
  const double v = args.number_or(name, fallback);
  if (v < 0 || v > max || v != static_cast<int>(v))
    throw UsageError("option --" + name + ": expected an integer from 0 to " + std::to_string(max));
  return static_cast<int>(v);
}

}  // namespace

int run_serve(const CommandArgs& argv) {
  Args args("strandline serve --db FILE [--port 8600] [options]\n"
            "       strandline serve --demo [--port 8600]", "");
  args.add_value("db", "FILE", "SQLite database (created and migrated when new)")
      .add_switch("demo", "temporary database with the invented demo site and one finished run")
      .add_value("host", "ADDRESS", "listen address (default 127.0.0.1)")
      .add_value("port", "N", "TCP port (default 8600; 0 = any free port, printed)")
      .add_value("static", "DIR", "serve the dashboard from DIR (index.html, assets/, vendor/) instead of the built-in copy")
      .add_switch("read-key-required", "reads need an API key too (writes always do)")
      .add_value("threads", "N", "handler threads = connections served at once (default 96)")
      .add_value("max-concurrent", "N", "requests in progress before 503 + Retry-After (default 80)")
      .add_value("max-body-mb", "N", "request body limit in MiB (default 512)")
      .add_value("run-workers", "N", "background run threads (default 1)")
      .add_value("max-db-mb", "N", "refuse writes (507) that would grow the database past N MiB (default: no limit)")
      .add_epilogue("Keys: `strandline keys add --db FILE --name NAME --role write`.\n");
  if (!args.parse(argv)) return kExitOk;
  const bool demo = args.flag("demo");
  http::ServiceOptions options;
  options.read_key_required = args.flag("read-key-required");
  options.static_dir = args.get("static").value_or("");
  options.http_threads = static_cast<unsigned>(positive_int(args, "threads", 96, 4096));
  options.max_concurrent_requests = static_cast<std::size_t>(positive_int(args, "max-concurrent", 80, 100000));
  options.max_body_bytes = static_cast<std::size_t>(positive_int(args, "max-body-mb", 512, 65536)) << 20;
  options.run_workers = static_cast<unsigned>(std::max(1, positive_int(args, "run-workers", 1, 64)));
  if (!options.static_dir.empty() && !std::filesystem::is_directory(options.static_dir))
    throw UsageError("--static " + options.static_dir +
                     ": not a folder (without --static the dashboard built into the program is served)");
  if (options.max_concurrent_requests >= options.http_threads)
    throw UsageError("--max-concurrent must be below --threads so that overload answers always have a thread");
  const std::string host = args.get("host").value_or("127.0.0.1");
  const int port = positive_int(args, "port", 8600, 65535);
  std::string db_path;
  std::filesystem::path demo_dir;
  if (demo) {
    if (args.has("db")) throw UsageError("--demo uses a temporary database; drop --db");
    char dir[] = "/tmp/strandline-demo-XXXXXX";
    if (!mkdtemp(dir)) throw std::runtime_error("cannot create a temporary folder");
    demo_dir = dir;
    db_path = (demo_dir / "demo.db").string();
  } else {
    db_path = args.require("db");
  }

  const int max_db_mb = positive_int(args, "max-db-mb", 0, 1 << 24);
  std::optional<store::ServeLock> lock;
  try {
    lock.emplace(db_path);
  } catch (const store::AlreadyServed& e) {
    throw UsageError(e.what());
  }
  auto store = store::open_sqlite_store(db_path, std::int64_t{max_db_mb} << 20);
  http::Service service(*store, options);
  if (demo) {
    std::cerr << "loading the demo site into " << db_path << " ...\n";
    const auto run = app::load_demo_site(*store, service.runs());
    std::cerr << "demo run " << run << ": " << store->run(run)->state << "\n";
    const auto key = store::generate_api_key("demo-writer", "write");
    store->add_key(key.record);
    std::cout << "demo write key: " << key.secret << "\n";
  }
  const int bound = service.bind(host, port);
  if (bound < 0) throw UsageError("cannot listen on " + host + ":" + std::to_string(port) + " (in use?)");
  std::signal(SIGINT, on_signal);
  std::signal(SIGTERM, on_signal);
  service.start();
  std::cout << "strandline serving http://" << host << ":" << bound << "/  (database " << db_path << ")" << std::endl;
  if (demo)
    std::cout << "  try: curl http://" << host << ":" << bound << "/v1/sites/demo/summary" << std::endl;
  while (!g_stop) std::this_thread::sleep_for(std::chrono::milliseconds(100));
  std::cerr << "stopping\n";
  service.stop();
  if (demo) {
    store.reset();
    std::error_code ignored;
    std::filesystem::remove_all(demo_dir, ignored);
  }
  return kExitOk;
}

int run_keys(const CommandArgs& argv) {
  const char* kKeysUsage =
      "usage: strandline keys add --db FILE --name NAME --role read|write [--site SITE_ID]\n"
      "                           [--expires TIME|DURATION]\n"
      "       strandline keys list --db FILE\n"
      "       strandline keys revoke --db FILE --name NAME\n"
      "The key is printed once by `add`; only its SHA-256 is stored. `add` creates a new database\n"
      "(as `serve --db FILE` does); `list` and `revoke` need an existing one. `--site` limits the key\n"
      "to one site; `--expires` takes a UTC time (2027-01-01, 2027-01-01T12:00:00Z) or a duration\n"
      "from now (90d, 12h, 2w).\n";
  if (argv.empty() || argv[0] == "--help" || argv[0] == "-h") {
    (argv.empty() ? std::cerr : std::cout) << kKeysUsage;
    return argv.empty() ? kExitBadInput : kExitOk;
  }
  const std::string action = argv[0];
  if (action != "add" && action != "list" && action != "revoke")
    throw UsageError("unknown action \"" + action + "\" (add, list, revoke)");
  Args args("strandline keys " + action + " --db FILE" +
                (action == "add"      ? " --name NAME --role read|write [--site SITE_ID] [--expires TIME|DURATION]"
                 : action == "revoke" ? " --name NAME"
                                      : ""),
            "");
  args.add_value("db", "FILE", action == "add" ? "SQLite database of the service (created when new)"
                                                : "SQLite database of the service (must exist)");
  if (action != "list") args.add_value("name", "NAME", "name of the key");
  if (action == "add") {
    args.add_value("role", "ROLE", "read or write (default write)")
        .add_value("site", "SITE_ID", "the one site the key may act on (default: every site)")
        .add_value("expires", "WHEN",
                   "when the key stops being accepted: a UTC time (2027-01-01, 2027-01-01T12:00:00Z)\n"
                   "or a duration from now (90d, 12h, 2w); default never");
  }
  if (!args.parse(CommandArgs(argv.begin() + 1, argv.end()))) return kExitOk;
  const std::string db = args.require("db");
  // Opening creates a database: a misspelt path must not quietly become an empty key list. `add`
  // may create one, since a new site's first key is added before the service first starts.
  if (action != "add" && !std::filesystem::exists(db))
    throw UsageError("database " + db + " does not exist (`strandline serve --db " + db + "` creates one)");
  if (action == "add") {
    const std::string name = args.require("name");
    const std::string role = args.get("role").value_or("write");
    if (role != "read" && role != "write") throw UsageError("option --role: expected read or write");
    store::KeyLimits limits;
    if (const auto site = args.get("site")) {
      if (auto why = site_id_problem(*site)) throw UsageError("option --site: " + *why);
      limits.site_id = *site;
    }
    if (const auto expires = args.get("expires")) {
      try {
        limits.expires = store::parse_key_expiry(expand_date_only(*expires), store::utc_now_s());
      } catch (const FieldError& e) {
        throw UsageError(std::string("option --expires: ") + e.what());
      }
    }
    auto store = store::open_sqlite_store(db);
    const auto key = store::generate_api_key(name, role, limits);
    try {
      store->add_key(key.record);
    } catch (const store::AlreadyExists& e) {
      throw UsageError(e.what());
    }
    std::cout << key.secret << "\n";
    std::cerr << "key \"" << name << "\" (" << role;
    if (key.record.site_id) std::cerr << ", site " << *key.record.site_id;
    if (key.record.expires_at) std::cerr << ", expires " << *key.record.expires_at;
    std::cerr << ") added; it is shown only now\n";
    if (key.record.site_id && !store->site(*key.record.site_id))
      std::cerr << "note: there is no site \"" << *key.record.site_id << "\" yet\n";
    return kExitOk;
  }
  if (action == "list") {
    auto store = store::open_sqlite_store(db);
    std::cout << "name,role,prefix,created_at,revoked_at,site_id,expires_at\n";
    for (const auto& k : store->keys())
      std::cout << k.name << "," << k.role << "," << k.prefix << "," << k.created_at << ","
                << k.revoked_at.value_or("") << "," << k.site_id.value_or("") << "," << k.expires_at.value_or("")
                << "\n";
    return kExitOk;
  }
  if (action == "revoke") {
    const std::string name = args.require("name");
      auto store = store::open_sqlite_store(db);
    if (!store->revoke_key(name)) throw UsageError("no active key named \"" + name + "\"");
    std::cerr << "key \"" << name << "\" revoked\n";
    return kExitOk;
  }
  throw UsageError("unknown action \"" + action + "\" (add, list, revoke)");
}

}  // namespace strandline::cli
