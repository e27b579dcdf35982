// API keys: `sl_<prefix>_<secret>`, shown once when created. The store keeps the
// prefix (for lookup) and the SHA-256 of the whole key, never the key itself; a
// presented key is checked by hashing it and comparing in constant time. Keys
// carry 256 random bits, so a fast hash suffices (no password stretching needed).
#pragma once

#include <optional>
#include <string>
#include <string_view>

#include "corrections/core/time_utc.h"
#include "server/store/store.h"

namespace strandline::store {

struct NewKey {
  ApiKey record;       // what the store keeps
  std::string secret;  // the full key, to show the user once
};

// What a key may do besides its role: the one site it acts on (none: every
// site) and when it stops being accepted (none: never).
struct KeyLimits {
  std::optional<std::string> site_id;
  std::optional<TimeS> expires;
};

// Random key of a role ("read" or "write"); throws StoreError if the system RNG fails.
NewKey generate_api_key(const std::string& name, const std::string& role, const KeyLimits& limits = {});

std::string sha256_hex(std::string_view data);

// An expiry as text: an RFC 3339 time, or a duration from `now` — a positive
// whole number of weeks, days or hours (`2w`, `90d`, `12h`). Throws FieldError
// naming what is wrong, also for a time that is not after `now`.
TimeS parse_key_expiry(std::string_view text, TimeS now);

// True when the key has an expiry at or before `now` (an expiry that cannot be
// read counts as passed: a key is refused rather than trusted by mistake).
bool key_expired(const ApiKey& key, TimeS now);

// True when the key may act on `site_id`: it has no site scope, or that site.
bool key_covers_site(const ApiKey& key, std::string_view site_id);

// The current UTC time in seconds (the clock verify_api_key uses by default).
TimeS utc_now_s();

// The stored key matching `presented` (not revoked, not expired at `now`), or nothing.
std::optional<ApiKey> verify_api_key(Store& store, std::string_view presented, TimeS now);
// The same at the current time.
std::optional<ApiKey> verify_api_key(Store& store, std::string_view presented);

}  // namespace strandline::store
