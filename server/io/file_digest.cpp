#include "server/io/file_digest.h"

#include <openssl/evp.h>

#include <fstream>
#include <memory>
#include <stdexcept>
#include <vector>

namespace strandline {

namespace {
struct Digest {
  std::unique_ptr<EVP_MD_CTX, decltype(&EVP_MD_CTX_free)> ctx{EVP_MD_CTX_new(), EVP_MD_CTX_free};
  Digest() {
    if (!ctx || EVP_DigestInit_ex(ctx.get(), EVP_sha256(), nullptr) != 1) throw std::runtime_error("SHA-256 unavailable");
  }
  void update(const void* data, std::size_t n) { EVP_DigestUpdate(ctx.get(), data, n); }
  std::string hex() {
    unsigned char md[EVP_MAX_MD_SIZE];
    unsigned int len = 0;
    EVP_DigestFinal_ex(ctx.get(), md, &len);
    static const char* digits = "0123456789abcdef";
    std::string out;
    for (unsigned i = 0; i < len; ++i) {
      out += digits[md[i] >> 4];
      out += digits[md[i] & 15];
    }
    return out;
  }
};
}  // namespace

std::string sha256_hex_of_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw std::runtime_error("cannot read " + path);
  Digest d;
  std::vector<char> buffer(1 << 16);
  while (in) {
    in.read(buffer.data(), static_cast<std::streamsize>(buffer.size()));
    d.update(buffer.data(), static_cast<std::size_t>(in.gcount()));
  }
  return d.hex();
}

std::string sha256_hex(std::string_view data) {
  Digest d;
  d.update(data.data(), data.size());
  return d.hex();
}

}  // namespace strandline
