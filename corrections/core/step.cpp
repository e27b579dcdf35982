#include "corrections/core/step.h"

namespace strandline {

void StepLog::merge(const StepLog& other) {
  for (const auto& [k, v] : other.counts_) counts_[k] += v;
  for (auto it = other.notes_.begin(); it != other.notes_.end(); ++it) notes_[it.key()] = it.value();
}

nlohmann::json StepLog::to_json() const {
  nlohmann::json j = nlohmann::json::object();
  j["counts"] = counts_;
  if (!notes_.empty()) j["notes"] = notes_;
  return j;
}

std::int64_t StepLog::count_of(std::string_view key) const {
  auto it = counts_.find(key);
  return it == counts_.end() ? 0 : it->second;
}

}  // namespace strandline
