#include "server/cli/args.h"

#include <CLI/CLI.hpp>

#include <algorithm>
#include <cctype>
#include <iostream>
#include <stdexcept>

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"

namespace strandline::cli {

namespace {

constexpr std::size_t kNameColumn = 27;  // width of "  --name PLACEHOLDER" before the help text

// Optimal-string-alignment distance: a swapped pair of letters is one edit,
// the commonest typing slip.
std::size_t edit_distance(const std::string& a, const std::string& b) {
  std::vector<std::vector<std::size_t>> d(a.size() + 1, std::vector<std::size_t>(b.size() + 1));
  for (std::size_t i = 0; i <= a.size(); ++i) d[i][0] = i;
  for (std::size_t j = 0; j <= b.size(); ++j) d[0][j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i)
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const std::size_t cost = a[i - 1] == b[j - 1] ? 0 : 1;
      d[i][j] = std::min({d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost});
      if (i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1]) d[i][j] = std::min(d[i][j], d[i - 2][j - 2] + 1);
    }
  return d[a.size()][b.size()];
}

// "--name=value" -> "name"; "-x" -> "x".
std::string option_name_of(const std::string& token) {
  std::string name = token.substr(token.find_first_not_of('-'));
  if (auto eq = name.find('='); eq != std::string::npos) name.resize(eq);
  return name;
}

}  // namespace

std::optional<std::string> closest_name(const std::string& word, const std::vector<std::string>& candidates) {
  std::optional<std::string> best;
  std::size_t best_distance = 0;
  for (const auto& c : candidates) {
    const std::size_t d = edit_distance(word, c);
    if (!best || d < best_distance) best = c, best_distance = d;
  }
  // Up to a third of the word may be wrong (at least 2 edits): beyond that a
  // suggestion is more confusing than none.
  if (!best || best_distance > std::max<std::size_t>(2, word.size() / 3)) return std::nullopt;
  return best;
}

std::string expand_date_only(const std::string& text) {
  const bool date_only = text.size() == 10 && text[4] == '-' && text[7] == '-' &&
                         std::all_of(text.begin(), text.end(), [](char c) { return std::isdigit(static_cast<unsigned char>(c)) || c == '-'; });
  return date_only ? text + "T00:00:00Z" : text;
}

Args::Args(std::string usage, std::string description)
    : app_(std::make_unique<CLI::App>()), usage_(std::move(usage)), description_(std::move(description)) {
  app_->set_help_flag("-h,--help");
  // Unknown options and stray arguments are left in remaining() and reported
  // by parse() with a suggestion, which CLI11 does not offer.
  app_->allow_extras();
}

Args::~Args() = default;

Args& Args::add_value(const std::string& name, const std::string& placeholder, const std::string& help) {
  declared_.push_back({name, placeholder, help, true});
  options_[name] = app_->add_option("--" + name, values_[name]);
  return *this;
}

Args& Args::add_switch(const std::string& name, const std::string& help) {
  declared_.push_back({name, "", help, false});
  options_[name] = app_->add_flag("--" + name);
  return *this;
}

Args& Args::add_epilogue(const std::string& text) {
  epilogue_ += text;
  return *this;
}

bool Args::parse(const std::vector<std::string>& argv) {
  // CLI11 takes the arguments reversed (it pops from the back).
  std::vector<std::string> reversed(argv.rbegin(), argv.rend());
  try {
    app_->parse(reversed);
  } catch (const CLI::CallForHelp&) {
    std::cout << help();
    return false;
  } catch (const CLI::ArgumentMismatch& e) {
    // An option repeated, or a value option at the end with nothing after it.
    for (const auto& d : declared_) {
      const auto given = std::count_if(argv.begin(), argv.end(), [&](const std::string& token) {
        return token == "--" + d.name || token.rfind("--" + d.name + "=", 0) == 0;
      });
      if (given > 1) throw UsageError("option --" + d.name + " given twice");
    }
    for (const auto& d : declared_)
      if (options_.at(d.name)->count() == 0 && std::find(argv.begin(), argv.end(), "--" + d.name) != argv.end())
        throw UsageError("option --" + d.name + (d.takes_value ? " needs a value" : " takes no value"));
    throw UsageError(e.what());
  } catch (const CLI::ParseError& e) {
    throw UsageError(e.what());
  }
  for (const auto& token : app_->remaining()) {
    if (token.size() < 2 || token[0] != '-')
      throw UsageError("unexpected argument \"" + token + "\" (options start with --)");
    const std::string name = option_name_of(token);
    std::vector<std::string> names;
    for (const auto& d : declared_) names.push_back(d.name);
    std::string message = "unknown option --" + name;
    if (auto near = closest_name(name, names)) message += " (did you mean --" + *near + "?)";
    throw UsageError(message);
  }
  for (const auto& d : declared_) {
    const std::size_t given = options_.at(d.name)->count();
    if (given > 1) throw UsageError("option --" + d.name + " given twice");
  }
  return true;
}

std::string Args::help() const {
  std::string out = "usage: " + usage_ + "\n";
  if (!description_.empty()) out += "\n" + description_ + "\n";
  out += "\noptions:\n";
  auto line = [&](const std::string& left, const std::string& text) {
    std::string head = "  " + left;
    if (head.size() + 1 > kNameColumn + 2) {
      out += head + "\n";
      head.clear();
    }
    head.resize(kNameColumn + 2, ' ');
    std::size_t start = 0;
    for (;;) {
      const auto end = text.find('\n', start);
      out += head + text.substr(start, end == std::string::npos ? std::string::npos : end - start) + "\n";
      if (end == std::string::npos) break;
      start = end + 1;
      head.assign(kNameColumn + 2, ' ');
    }
  };
  for (const auto& d : declared_) line("--" + d.name + (d.placeholder.empty() ? "" : " " + d.placeholder), d.help);
  line("-h, --help", "this help");
  if (!epilogue_.empty()) out += "\n" + epilogue_;
  return out;
}

const Args::Declared& Args::declared(const std::string& name) const {
  for (const auto& d : declared_)
    if (d.name == name) return d;
  throw std::logic_error("option --" + name + " read but not declared");
}

std::optional<std::string> Args::get(const std::string& name) const {
  if (!declared(name).takes_value) throw std::logic_error("option --" + name + " is a switch");
  if (options_.at(name)->count() == 0) return std::nullopt;
  return values_.at(name);
}

std::string Args::require(const std::string& name) const {
  auto v = get(name);
  if (!v) throw UsageError("missing required option --" + name);
  return *v;
}

bool Args::flag(const std::string& name) const {
  if (declared(name).takes_value) throw std::logic_error("option --" + name + " takes a value");
  return options_.at(name)->count() > 0;
}

bool Args::has(const std::string& name) const {
  declared(name);
  return options_.at(name)->count() > 0;
}

std::optional<double> Args::number(const std::string& name) const {
  auto v = get(name);
  if (!v) return std::nullopt;
  try {
    return parse_number(*v);
  } catch (const FieldError& e) {
    throw UsageError("option --" + name + " \"" + *v + "\": " + e.what());
  }
}

double Args::number_or(const std::string& name, double fallback) const {
  auto v = number(name);
  return v ? *v : fallback;
}

}  // namespace strandline::cli
