// Command-line options of one subcommand, parsed with CLI11. Each command
// declares every option it accepts before parsing; the help text is generated
// from those declarations, and an option no one declared is refused at parse
// time (naming the closest declared option), before any input file is opened.
#pragma once

#include <map>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace CLI {
class App;
class Option;
}  // namespace CLI

namespace strandline::cli {

class Args {
 public:
  // `usage`: the usage line(s); `description`: the paragraph under them (may be empty).
  Args(std::string usage, std::string description);
  ~Args();
  Args(const Args&) = delete;
  Args& operator=(const Args&) = delete;

  // `--name PLACEHOLDER`: an option taking one value. `help` may span lines ("\n").
  Args& add_value(const std::string& name, const std::string& placeholder, const std::string& help);
  // `--name`: a switch taking no value.
  Args& add_switch(const std::string& name, const std::string& help);
  // Text printed after the option list.
  Args& add_epilogue(const std::string& text);

  // Parses `argv`. Returns false when -h/--help was given (the help has been
  // printed to standard output; the command exits 0). Throws UsageError for an
  // unknown option, a missing value, an option given twice or a stray argument.
  bool parse(const std::vector<std::string>& argv);

  std::string help() const;

  // Getters for declared options (an undeclared name is a programming error).
  std::optional<std::string> get(const std::string& name) const;
  std::string require(const std::string& name) const;
  bool flag(const std::string& name) const;
  bool has(const std::string& name) const;
  std::optional<double> number(const std::string& name) const;
  double number_or(const std::string& name, double fallback) const;

 private:
  struct Declared {
    std::string name, placeholder, help;
    bool takes_value;
  };
  const Declared& declared(const std::string& name) const;

  std::unique_ptr<CLI::App> app_;
  std::string usage_, description_, epilogue_;
  std::vector<Declared> declared_;
  std::map<std::string, std::string> values_;
  std::map<std::string, CLI::Option*> options_;
};

// The candidate closest to `word` by edit distance (transpositions count as
// one edit), when close enough to be a plausible misspelling.
std::optional<std::string> closest_name(const std::string& word, const std::vector<std::string>& candidates);

// A time option's text for the engine's strict parser: a date alone
// (YYYY-MM-DD) means midnight UTC and becomes YYYY-MM-DDT00:00:00Z; anything
// else is returned unchanged.
std::string expand_date_only(const std::string& text);

}  // namespace strandline::cli
