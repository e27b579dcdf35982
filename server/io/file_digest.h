// SHA-256 of input files, recorded in every run's provenance.
#pragma once

#include <string>
#include <string_view>

namespace strandline {

std::string sha256_hex_of_file(const std::string& path);
std::string sha256_hex(std::string_view data);

}  // namespace strandline
