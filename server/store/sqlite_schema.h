// Schema migrations of the SQLite store, versioned in code: each entry runs once,
// in order, inside its own transaction, and is recorded in schema_migrations.
#pragma once

#include "server/store/sqlite_connection.h"

namespace strandline::store {

int latest_sqlite_schema_version();

// Brings the database to the newest schema (or to `up_to_version`, for tests of
// a migration); returns the version reached. Refuses a database written by a
// newer build.
int migrate_sqlite_schema(Connection& db, int up_to_version = latest_sqlite_schema_version());

}  // namespace strandline::store
