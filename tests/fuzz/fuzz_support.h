// Shared by the libFuzzer targets: an input may be refused only with the
// project's own input errors, and every refusal message must be printable
// UTF-8 (it reaches replies and logs). Anything else — a crash, a sanitizer
// report, another exception type, a message with raw bytes — is a finding.
#pragma once

#include <cstdio>
#include <cstdlib>
#include <string>
#include <string_view>

#include "corrections/core/errors.h"
#include "corrections/core/utf8_text.h"

namespace strandline::fuzz {

inline void require_printable(const char* what) {
  if (auto fault = text_fault(what, true)) {
    std::fprintf(stderr, "refusal message is not printable text (%s): %s\n", fault->reason.c_str(),
                 printable_text(what).c_str());
    std::abort();
  }
}

// Runs `fn`; InputError (and its kinds) and ConfigError are the expected refusals.
template <class Fn>
void expect_accept_or_refuse(Fn&& fn) {
  try {
    fn();
  } catch (const InputError& e) {
    require_printable(e.what());
  } catch (const ConfigError& e) {
    require_printable(e.what());
  }
}

inline std::string_view as_text(const std::uint8_t* data, std::size_t size) {
  return {reinterpret_cast<const char*>(data), size};
}

}  // namespace strandline::fuzz
