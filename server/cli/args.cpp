#include "server/cli/args.h"

#include "corrections/core/csv_reader.h"
#include "corrections/core/errors.h"

namespace strandline::cli {

Args::Args(const std::vector<std::string>& argv, const std::set<std::string>& switches) {
  for (std::size_t i = 0; i < argv.size(); ++i) {
    const std::string& a = argv[i];
    if (a.rfind("--", 0) != 0 || a.size() == 2)
      throw UsageError("unexpected argument \"" + a + "\" (options start with --)");
    std::string name = a.substr(2);
    std::optional<std::string> inline_value;
    if (auto eq = name.find('='); eq != std::string::npos) {
      inline_value = name.substr(eq + 1);
      name = name.substr(0, eq);
    }
    if (values_.count(name) || flags_.count(name)) throw UsageError("option --" + name + " given twice");
    if (switches.count(name)) {
      if (inline_value) throw UsageError("option --" + name + " takes no value");
      flags_.insert(name);
      continue;
    }
    if (inline_value) {
      values_[name] = *inline_value;
    } else {
      if (i + 1 >= argv.size()) throw UsageError("option --" + name + " needs a value");
      values_[name] = argv[++i];
    }
  }
}

std::optional<std::string> Args::get(const std::string& name) {
  used_.insert(name);
  auto it = values_.find(name);
  if (it == values_.end()) return std::nullopt;
  return it->second;
}

std::string Args::require(const std::string& name) {
  auto v = get(name);
  if (!v) throw UsageError("missing required option --" + name);
  return *v;
}

bool Args::flag(const std::string& name) {
  used_.insert(name);
  return flags_.count(name) > 0;
}

std::optional<double> Args::number(const std::string& name) {
  auto v = get(name);
  if (!v) return std::nullopt;
  try {
    return parse_number(*v);
  } catch (const FieldError& e) {
    throw UsageError("option --" + name + " \"" + *v + "\": " + e.what());
  }
}

double Args::number_or(const std::string& name, double fallback) {
  auto v = number(name);
  return v ? *v : fallback;
}

void Args::finish() const {
  for (const auto& [name, value] : values_)
    if (!used_.count(name)) throw UsageError("unknown option --" + name);
  for (const auto& name : flags_)
    if (!used_.count(name)) throw UsageError("unknown option --" + name);
}

}  // namespace strandline::cli
