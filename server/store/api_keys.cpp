#include "server/store/api_keys.h"

#include <openssl/crypto.h>
#include <openssl/evp.h>
#include <openssl/rand.h>

#include <chrono>
#include <cmath>

#include "corrections/core/errors.h"

namespace strandline::store {

namespace {
constexpr std::string_view kKeyTag = "sl_";
constexpr std::size_t kPrefixBytes = 6;   // 12 hex digits
constexpr std::size_t kSecretBytes = 32;  // 256 bits

std::string hex(const unsigned char* data, std::size_t n) {
  static const char digits[] = "0123456789abcdef";
  std::string out(2 * n, '0');
  for (std::size_t i = 0; i < n; ++i) {
    out[2 * i] = digits[data[i] >> 4];
    out[2 * i + 1] = digits[data[i] & 15];
  }
  return out;
}

std::string random_hex(std::size_t bytes) {
  unsigned char buffer[64];
  if (bytes > sizeof buffer || RAND_bytes(buffer, static_cast<int>(bytes)) != 1)
    throw StoreError("the system random number generator failed");
  return hex(buffer, bytes);
}
}  // namespace

std::string sha256_hex(std::string_view data) {
  unsigned char digest[EVP_MAX_MD_SIZE];
  unsigned int length = 0;
  if (EVP_Digest(data.data(), data.size(), digest, &length, EVP_sha256(), nullptr) != 1)
    throw StoreError("SHA-256 failed");
  return hex(digest, length);
}

NewKey generate_api_key(const std::string& name, const std::string& role, const KeyLimits& limits) {
  if (role != "read" && role != "write") throw StoreError("role must be \"read\" or \"write\"");
  if (limits.site_id && limits.site_id->empty()) throw StoreError("a key's site id may not be empty");
  NewKey k;
  k.record.name = name;
  k.record.role = role;
  k.record.site_id = limits.site_id;
  if (limits.expires) k.record.expires_at = format_time_utc(std::floor(*limits.expires));
  k.record.prefix = random_hex(kPrefixBytes);
  k.secret = std::string(kKeyTag) + k.record.prefix + "_" + random_hex(kSecretBytes);
  k.record.hash_hex = sha256_hex(k.secret);
  return k;
}

TimeS parse_key_expiry(std::string_view text, TimeS now) {
  if (text.empty()) throw FieldError("empty expiry (a time such as 2027-01-01T00:00:00Z, or 90d, 12h, 2w)");
  const char unit = text.back();
  const std::string_view digits = text.substr(0, text.size() - 1);
  const bool all_digits = !digits.empty() && digits.find_first_not_of("0123456789") == std::string_view::npos;
  TimeS expires = 0;
  if (all_digits && (unit == 'd' || unit == 'h' || unit == 'w')) {
    if (digits.size() > 6) throw FieldError("duration \"" + std::string(text) + "\" is too long");
    const double count = std::stod(std::string(digits));
    if (count <= 0) throw FieldError("duration \"" + std::string(text) + "\" must be positive");
    const double unit_s = unit == 'h' ? 3600.0 : unit == 'd' ? kSecondsPerDay : 7 * kSecondsPerDay;
    expires = now + count * unit_s;
  } else {
    try {
      expires = parse_time_utc(text);
    } catch (const FieldError& e) {
      throw FieldError("\"" + std::string(text) + "\" is neither a time nor a duration (90d, 12h, 2w): " + e.what());
    }
    if (expires <= now)
      throw FieldError("\"" + std::string(text) + "\" is not in the future (now " + format_time_utc(std::floor(now)) +
                       ")");
  }
  return expires;
}

bool key_expired(const ApiKey& key, TimeS now) {
  if (!key.expires_at) return false;
  try {
    return parse_time_utc(*key.expires_at) <= now;
  } catch (const FieldError&) {
    return true;
  }
}

bool key_covers_site(const ApiKey& key, std::string_view site_id) {
  return !key.site_id || *key.site_id == site_id;
}

TimeS utc_now_s() {
  const auto since_epoch = std::chrono::system_clock::now().time_since_epoch();
  return std::chrono::duration<double>(since_epoch).count();
}

std::optional<ApiKey> verify_api_key(Store& store, std::string_view presented) {
  return verify_api_key(store, presented, utc_now_s());
}

std::optional<ApiKey> verify_api_key(Store& store, std::string_view presented, TimeS now) {
  if (presented.substr(0, kKeyTag.size()) != kKeyTag) return std::nullopt;
  const std::string_view rest = presented.substr(kKeyTag.size());
  const auto sep = rest.find('_');
  if (sep == std::string_view::npos) return std::nullopt;
  auto key = store.key_by_prefix(std::string(rest.substr(0, sep)));
  if (!key || key->revoked_at) return std::nullopt;
  const std::string hash = sha256_hex(presented);
  if (hash.size() != key->hash_hex.size() ||
      CRYPTO_memcmp(hash.data(), key->hash_hex.data(), hash.size()) != 0)
    return std::nullopt;
  if (key_expired(*key, now)) return std::nullopt;
  return key;
}

}  // namespace strandline::store
