// API keys: `sl_<prefix>_<secret>`, shown once when created. The store keeps the
// prefix (for lookup) and the SHA-256 of the whole key, never the key itself; a
// presented key is checked by hashing it and comparing in constant time. Keys
// carry 256 random bits, so a fast hash suffices (no password stretching needed).
#pragma once

#include <optional>
#include <string>
#include <string_view>

#include "server/store/store.h"

namespace strandline::store {

struct NewKey {
  ApiKey record;       // what the store keeps
  std::string secret;  // the full key, to show the user once
};

// Random key of a role ("read" or "write"); throws StoreError if the system RNG fails.
NewKey generate_api_key(const std::string& name, const std::string& role);

std::string sha256_hex(std::string_view data);

// The stored key matching `presented` (not revoked), or nothing.
std::optional<ApiKey> verify_api_key(Store& store, std::string_view presented);

}  // namespace strandline::store
