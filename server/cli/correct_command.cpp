#include "server/cli/commands.h"

#include <iostream>

#include "corrections/core/errors.h"

namespace strandline::cli {

int run_correct(const CommandArgs&) {
  throw UsageError("correct: not wired yet");
}

}  // namespace strandline::cli
