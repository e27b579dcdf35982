// A configured chain of steps and the runner that applies it to a SiteTable.
//
// Configuration JSON (the same object for batch runs and service runs):
//   {"schema_version": 1,
//    "threads": 0,                         // 0 = hardware concurrency
//    "steps": {"<step>": {"enabled": true, ...step parameters...}}}
// Unknown keys anywhere are ConfigErrors naming their JSON pointer.
#pragma once

#include <atomic>
#include <functional>
#include <memory>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "corrections/core/step.h"
#include "corrections/engine/step_entry.h"

namespace strandline {

inline constexpr int kConfigSchemaVersion = 1;

// Called after each transect finishes a block of transect steps:
// (transects done, transects total).
using ProgressFn = std::function<void(std::size_t done, std::size_t total)>;

struct StepRunRecord {
  std::string step;
  nlohmann::json parameters;
  StepLog log;
  double seconds = 0.0;
};

struct RunRecord {
  std::vector<StepRunRecord> steps;
  nlohmann::json to_json() const;
};

class Pipeline {
 public:
  // The steps of `steps` (in that order) configured by `config`. Throws ConfigError.
  static Pipeline from_config(const nlohmann::json& config, const StepList& steps);

  // Runs every step. Consecutive transect steps run transect by transect across
  // `threads` workers; site steps run alone between them. Per-transect state is
  // reset first, so running twice gives the same result.
  RunRecord run(SiteTable& table, const RunInputs& inputs, const ProgressFn& progress = {}) const;

  std::vector<std::string> step_names() const;
  const nlohmann::json& config() const { return config_; }
  const Step* find(const std::string& name) const;
  unsigned threads() const { return threads_; }

 private:
  std::vector<std::shared_ptr<const Step>> steps_;
  nlohmann::json config_;  // effective configuration
  unsigned threads_ = 1;
};

}  // namespace strandline
