// Whole-document gzip (RFC 1952) for stored series replies: compressed once when
// a run stores its results, sent as is to every client that accepts gzip.
#pragma once

#include <string>
#include <string_view>

namespace strandline {

// A gzip member of `text` (libdeflate, level 6).
std::string gzip_compress(std::string_view text);

// The text of a gzip member made by gzip_compress; throws std::runtime_error
// on a damaged member.
std::string gzip_decompress(std::string_view member);

// Whether an Accept-Encoding header value admits gzip (RFC 9110 §12.5.3:
// "gzip", "x-gzip" or "*" with a q-value above zero).
bool accepts_gzip(std::string_view accept_encoding);

}  // namespace strandline
