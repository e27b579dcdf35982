// Command-line options of one subcommand: `--name value` pairs and `--flag`
// switches. Every option a command does not read is an error, so a typo never
// passes silently.
#pragma once

#include <map>
#include <optional>
#include <set>
#include <string>
#include <vector>

namespace strandline::cli {

class Args {
 public:
  // `switches` lists the options that take no value (e.g. "skip-invalid").
  Args(const std::vector<std::string>& argv, const std::set<std::string>& switches);

  std::optional<std::string> get(const std::string& name);
  std::string require(const std::string& name);
  bool flag(const std::string& name);
  std::optional<double> number(const std::string& name);
  double number_or(const std::string& name, double fallback);
  bool has(const std::string& name) const { return values_.count(name) || flags_.count(name); }

  // Throws UsageError naming the first option no one asked for.
  void finish() const;

 private:
  std::map<std::string, std::string> values_;
  std::set<std::string> flags_;
  std::set<std::string> used_;
};

}  // namespace strandline::cli
