#include "server/store/api_keys.h"

#include <openssl/crypto.h>
#include <openssl/evp.h>
#include <openssl/rand.h>

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

NewKey generate_api_key(const std::string& name, const std::string& role) {
  if (role != "read" && role != "write") throw StoreError("role must be \"read\" or \"write\"");
  NewKey k;
  k.record.name = name;
  k.record.role = role;
  k.record.prefix = random_hex(kPrefixBytes);
  k.secret = std::string(kKeyTag) + k.record.prefix + "_" + random_hex(kSecretBytes);
  k.record.hash_hex = sha256_hex(k.secret);
  return k;
}

std::optional<ApiKey> verify_api_key(Store& store, std::string_view presented) {
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
  return key;
}

}  // namespace strandline::store
