#include "server/io/gzip_document.h"

#include <cctype>
#include <cstdint>
#include <cstdlib>
#include <memory>
#include <stdexcept>

#include <libdeflate.h>

namespace strandline {

namespace {
constexpr int kLevel = 6;  // libdeflate's default: ~7x on series JSON, compressed once per run

std::string lower_trimmed(std::string_view s) {
  while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
  while (!s.empty() && (s.back() == ' ' || s.back() == '\t')) s.remove_suffix(1);
  std::string out(s);
  for (auto& c : out) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return out;
}
}  // namespace

std::string gzip_compress(std::string_view text) {
  std::unique_ptr<libdeflate_compressor, decltype(&libdeflate_free_compressor)> c(
      libdeflate_alloc_compressor(kLevel), &libdeflate_free_compressor);
  if (!c) throw std::runtime_error("gzip: cannot allocate a compressor");
  std::string out(libdeflate_gzip_compress_bound(c.get(), text.size()), '\0');
  const std::size_t n = libdeflate_gzip_compress(c.get(), text.data(), text.size(), out.data(), out.size());
  if (n == 0) throw std::runtime_error("gzip: compression failed");
  out.resize(n);
  return out;
}

std::string gzip_decompress(std::string_view member) {
  if (member.size() < 18) throw std::runtime_error("gzip: member too short");
  // ISIZE, the last four bytes (little-endian), is the text length modulo 2^32.
  const auto* p = reinterpret_cast<const unsigned char*>(member.data() + member.size() - 4);
  const std::size_t size = p[0] | (p[1] << 8) | (p[2] << 16) | (static_cast<std::size_t>(p[3]) << 24);
  std::unique_ptr<libdeflate_decompressor, decltype(&libdeflate_free_decompressor)> d(
      libdeflate_alloc_decompressor(), &libdeflate_free_decompressor);
  if (!d) throw std::runtime_error("gzip: cannot allocate a decompressor");
  std::string out(size, '\0');
  std::size_t actual = 0;
  if (libdeflate_gzip_decompress(d.get(), member.data(), member.size(), out.data(), out.size(), &actual) !=
          LIBDEFLATE_SUCCESS ||
      actual != size)
    throw std::runtime_error("gzip: damaged member");
  return out;
}

bool accepts_gzip(std::string_view header) {
  bool gzip = false, star = false;
  bool gzip_named = false;
  while (!header.empty()) {
    const auto comma = header.find(',');
    const std::string_view item = header.substr(0, comma);
    header = comma == std::string_view::npos ? std::string_view() : header.substr(comma + 1);
    const auto semicolon = item.find(';');
    const std::string coding = lower_trimmed(item.substr(0, semicolon));
    double q = 1;
    if (semicolon != std::string_view::npos) {
      const std::string param = lower_trimmed(item.substr(semicolon + 1));
      if (param.rfind("q=", 0) == 0) q = std::strtod(param.c_str() + 2, nullptr);
    }
    if (coding == "gzip" || coding == "x-gzip") {
      gzip_named = true;
      gzip = q > 0;
    } else if (coding == "*") {
      star = q > 0;
    }
  }
  return gzip_named ? gzip : star;
}

}  // namespace strandline
