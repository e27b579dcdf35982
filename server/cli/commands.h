// The subcommands of `strandline`, listed explicitly in main.cpp (no static
// self-registration). Each takes its own arguments (after the subcommand name)
// and returns the process exit code; errors are thrown and mapped in main.
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace strandline::cli {

using CommandArgs = std::vector<std::string>;

struct Command {
  std::string_view name;
  std::string_view summary;
  int (*run)(const CommandArgs& args);
};

int run_correct(const CommandArgs& args);
int run_slope(const CommandArgs& args);
int run_serve(const CommandArgs& args);
int run_keys(const CommandArgs& args);
int run_backup(const CommandArgs& args);
int run_restore(const CommandArgs& args);
int run_intersect(const CommandArgs& args);
int run_transects(const CommandArgs& args);
int run_polylines(const CommandArgs& args);
int run_geoexport(const CommandArgs& args);
int run_runup(const CommandArgs& args);
int run_tide_predict(const CommandArgs& args);
int run_tide_fit(const CommandArgs& args);

}  // namespace strandline::cli
