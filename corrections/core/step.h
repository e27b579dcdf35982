// The one interface every correction and QC filter implements.
//
// A step is immutable after construction (its Params are validated then), so a
// single instance is shared by every thread of a run and by concurrent runs of
// the server. Two scopes:
//   - TransectStep sees one transect's rows [begin, end) of the SiteTable and may
//     write only those rows and that TransectInfo; transects run in parallel.
//   - SiteStep sees the whole compact table (e.g. residuals by image) for
//     alongshore and whole-image checks.
// Each run writes what it did into a StepLog (counts, thresholds) that ends up in
// the run's provenance.
#pragma once

#include <cstdint>
#include <map>
#include <mutex>
#include <string>
#include <string_view>

#include <nlohmann/json.hpp>

#include "corrections/core/run_inputs.h"
#include "corrections/core/site_table.h"

namespace strandline {

enum class StepScope { transect, site };

// What a step did during a run. Counts add up across transects; notes are kept
// per key (last write wins) for computed thresholds and summaries.
class StepLog {
 public:
  // Called per point on hot paths: a key already counted costs a lookup, no allocation.
  void count(std::string_view key, std::int64_t n = 1) {
    if (auto it = counts_.find(key); it != counts_.end()) it->second += n;
    else counts_.emplace(std::string(key), n);
  }
  void note(const std::string& key, nlohmann::json value) { notes_[key] = std::move(value); }
  void merge(const StepLog& other);
  nlohmann::json to_json() const;
  std::int64_t count_of(std::string_view key) const;

 private:
  std::map<std::string, std::int64_t, std::less<>> counts_;
  nlohmann::json notes_ = nlohmann::json::object();
};

class Step {
 public:
  virtual ~Step() = default;
  Step(const Step&) = delete;
  Step& operator=(const Step&) = delete;

  const std::string& name() const { return name_; }
  virtual StepScope scope() const = 0;
  // The effective parameters (defaults filled in), recorded in provenance.
  const nlohmann::json& parameters() const { return parameters_; }

 protected:
  Step(std::string name, nlohmann::json parameters)
      : name_(std::move(name)), parameters_(std::move(parameters)) {}

 private:
  std::string name_;
  nlohmann::json parameters_;
};

class TransectStep : public Step {
 public:
  StepScope scope() const final { return StepScope::transect; }
  void run(SiteTable& table, std::size_t transect, const RunInputs& inputs, StepLog& log) const {
    process(table, transect, inputs, log);
  }

 protected:
  using Step::Step;

 private:
  virtual void process(SiteTable& table, std::size_t transect, const RunInputs& inputs,
                       StepLog& log) const = 0;
};

class SiteStep : public Step {
 public:
  StepScope scope() const final { return StepScope::site; }
  void run(SiteTable& table, const RunInputs& inputs, StepLog& log) const {
    process(table, inputs, log);
  }

 protected:
  using Step::Step;

 private:
  virtual void process(SiteTable& table, const RunInputs& inputs, StepLog& log) const = 0;
};

}  // namespace strandline
