#include "corrections/tide/constituent_file.h"

#include <cmath>
#include <fstream>
#include <set>

#include "corrections/core/errors.h"
#include "corrections/tide/constituent_table.h"
#include "corrections/core/json_text.h"

namespace strandline::tide {

namespace {

using nlohmann::json;

// Reads one object's keys, reporting problems with the file and JSON pointer.
class EntryReader {
 public:
  EntryReader(const json& object, std::string file, std::string pointer)
      : object_(object), file_(std::move(file)), pointer_(std::move(pointer)) {
    if (!object_.is_object()) fail("", object_.dump(), "expected a JSON object");
  }

  [[noreturn]] void fail(const std::string& key, const std::string& value, const std::string& reason) const {
    throw InputError(file_, 0, pointer_ + "/" + key, value, reason);
  }

  const json* find(const std::string& key) {
    known_.insert(key);
    auto it = object_.find(key);
    return it == object_.end() ? nullptr : &*it;
  }

  // A finite number; nothing when absent (or null when `null_ok`).
  std::optional<double> number(const std::string& key, bool required, bool null_ok = false) {
    const json* v = find(key);
    if (!v) {
      if (required) fail(key, "", "missing required field");
      return std::nullopt;
    }
    if (v->is_null() && null_ok) return std::nullopt;
    if (!v->is_number()) fail(key, v->dump(), "expected a number");
    const double x = v->get<double>();
    if (!std::isfinite(x)) fail(key, v->dump(), "not a finite number");
    return x;
  }

  std::optional<std::string> text(const std::string& key, bool required) {
    const json* v = find(key);
    if (!v) {
      if (required) fail(key, "", "missing required field");
      return std::nullopt;
    }
    if (!v->is_string()) fail(key, v->dump(), "expected a string");
    return v->get<std::string>();
  }

  void finish() const {
    for (auto it = object_.begin(); it != object_.end(); ++it)
      if (!known_.count(it.key())) fail(it.key(), it.value().dump(), "unknown field");
  }

 private:
  const json& object_;
  std::string file_;
  std::string pointer_;
  std::set<std::string> known_;
};

}  // namespace

ConstituentSet parse_constituent_json(const json& document, const std::string& file) {
  ConstituentSet set;
  EntryReader top(document, file, "");
  if (auto datum = top.text("datum", false)) set.datum = *datum;
  if (auto z0 = top.number("z0_m", false)) set.z0_m = *z0;
  if (auto rate = top.number("z0_rate_m_per_yr", false)) set.z0_rate_m_per_yr = *rate;
  if (auto epoch = top.text("z0_epoch", false)) {
    try {
      set.z0_epoch_s = parse_time_utc(*epoch);
    } catch (const FieldError& e) {
      top.fail("z0_epoch", *epoch, e.what());
    }
  }
  if (auto sigma = top.number("residual_std_m", false, true)) {
    if (*sigma < 0) top.fail("residual_std_m", std::to_string(*sigma), "must not be negative");
    set.residual_std_m = *sigma;
  }
  if (const json* record = top.find("record")) set.record = *record;
  top.find("comment");  // free text, kept out of the model
  const json* list = top.find("constituents");
  if (!list) top.fail("constituents", "", "missing required field");
  if (!list->is_array()) top.fail("constituents", list->dump(), "expected an array");
  top.finish();

  std::set<std::string> seen;
  for (std::size_t k = 0; k < list->size(); ++k) {
    EntryReader entry((*list)[k], file, "/constituents/" + std::to_string(k));
    HarmonicConstant c;
    const std::string name = *entry.text("name", true);
    const ConstituentDefinition* def = find_constituent(name);
    if (!def) entry.fail("name", name, "unknown constituent (known: " + known_constituent_names() + ")");
    c.name = std::string(def->name);
    if (!seen.insert(c.name).second) entry.fail("name", name, "constituent listed twice");
    c.amplitude_m = *entry.number("amplitude_m", true);
    if (c.amplitude_m < 0) entry.fail("amplitude_m", std::to_string(c.amplitude_m), "amplitude must not be negative");
    c.phase_deg = *entry.number("phase_deg", true);
    if (auto se = entry.number("amplitude_se_m", false, true)) c.amplitude_se_m = *se;
    if (auto se = entry.number("phase_se_deg", false, true)) c.phase_se_deg = *se;
    if (const json* r = entry.find("resolvable")) {
      if (!r->is_boolean()) entry.fail("resolvable", r->dump(), "expected true or false");
      c.resolvable = r->get<bool>();
    }
    // Written for readers; a different value means a different convention.
    if (auto speed = entry.number("speed_deg_per_h", false)) {
      const double ours = speed_deg_per_h(*def);
      if (std::abs(*speed - ours) > 1e-4)
        entry.fail("speed_deg_per_h", std::to_string(*speed),
                   "does not match " + c.name + " (" + std::to_string(ours) + " deg/h)");
    }
    entry.finish();
    set.constituents.push_back(std::move(c));
  }
  return set;
}

ConstituentSet read_constituent_file(std::istream& in, const std::string& file) {
  return parse_constituent_json(parse_json_stream(in, file), file);
}

ConstituentSet read_constituent_file(const std::string& path) {
  std::ifstream in(path);
  if (!in) throw InputError(path + ": cannot open the constituent file");
  return read_constituent_file(in, path);
}

nlohmann::ordered_json constituent_json(const ConstituentSet& set) {
  using ojson = nlohmann::ordered_json;
  auto number_or_null = [](double x) { return std::isfinite(x) ? ojson(x) : ojson(nullptr); };
  ojson list = ojson::array();
  for (const auto& c : set.constituents) {
    ojson entry = {{"name", c.name}, {"amplitude_m", c.amplitude_m}, {"phase_deg", c.phase_deg}};
    if (known(c.amplitude_se_m) || c.resolvable) entry["amplitude_se_m"] = number_or_null(c.amplitude_se_m);
    if (known(c.phase_se_deg) || c.resolvable) entry["phase_se_deg"] = number_or_null(c.phase_se_deg);
    if (c.resolvable) entry["resolvable"] = *c.resolvable;
    if (const ConstituentDefinition* d = find_constituent(c.name)) entry["speed_deg_per_h"] = speed_deg_per_h(*d);
    list.push_back(std::move(entry));
  }
  ojson doc = {{"datum", set.datum},
               {"z0_m", set.z0_m},
               {"z0_rate_m_per_yr", set.z0_rate_m_per_yr},
               {"z0_epoch", format_time_utc(set.z0_epoch_s)}};
  if (known(set.residual_std_m)) doc["residual_std_m"] = set.residual_std_m;
  if (!set.record.is_null()) doc["record"] = ojson::parse(set.record.dump());
  doc["constituents"] = std::move(list);
  return doc;
}

void write_constituent_file(const ConstituentSet& set, const std::string& path) {
  std::ofstream out(path);
  if (!out) throw InputError(path + ": cannot open for writing");
  out << constituent_json(set).dump(2) << "\n";
  if (!out) throw InputError(path + ": write failed");
}

}  // namespace strandline::tide
