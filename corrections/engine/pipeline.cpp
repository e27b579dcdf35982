#include "corrections/engine/pipeline.h"

#include <chrono>
#include <mutex>
#include <thread>

#include "corrections/core/param_reader.h"

namespace strandline {

nlohmann::json RunRecord::to_json() const {
  nlohmann::json j = nlohmann::json::array();
  for (const auto& s : steps)
    j.push_back({{"step", s.step}, {"parameters", s.parameters}, {"result", s.log.to_json()},
                 {"seconds", s.seconds}});
  return j;
}

Pipeline Pipeline::from_config(const nlohmann::json& config, const StepList& registry) {
  ParamReader top(config, "");
  long long schema = kConfigSchemaVersion;
  top.integer("schema_version", schema);
  if (schema != kConfigSchemaVersion)
    top.fail("schema_version", "unsupported configuration schema " + std::to_string(schema) +
                                   " (this build reads " + std::to_string(kConfigSchemaVersion) + ")");
  long long threads = 0;
  top.integer("threads", threads);
  if (threads < 0 || threads > 256) top.fail("threads", "expected 0 (automatic) to 256");
  const nlohmann::json* steps_json = top.raw("steps");
  top.finish();
  if (steps_json && !steps_json->is_object()) throw ConfigError("/steps", "expected a JSON object");

  if (steps_json) {
    for (auto it = steps_json->begin(); it != steps_json->end(); ++it) {
      bool found = false;
      for (const auto& e : registry) found = found || e.name == it.key();
      if (!found) {
        std::string names;
        for (const auto& e : registry) names += (names.empty() ? "" : ", ") + e.name;
        throw ConfigError("/steps/" + json_pointer_escape(it.key()), "unknown step (known: " + names + ")");
      }
    }
  }

  Pipeline p;
  p.threads_ = threads > 0 ? static_cast<unsigned>(threads)
                           : std::max(1u, std::thread::hardware_concurrency());
  p.config_ = {{"schema_version", kConfigSchemaVersion}, {"threads", threads}, {"steps", nlohmann::json::object()}};
  for (const auto& e : registry) {
    const std::string pointer = "/steps/" + json_pointer_escape(e.name);
    nlohmann::json params = nullptr;
    bool enabled = e.enabled_by_default;
    if (steps_json && steps_json->contains(e.name)) {
      params = (*steps_json)[e.name];
      if (!params.is_object()) throw ConfigError(pointer, "expected a JSON object");
      if (params.contains("enabled")) {
        if (!params["enabled"].is_boolean()) throw ConfigError(pointer + "/enabled", "expected true or false");
        enabled = params["enabled"].get<bool>();
        params.erase("enabled");
        if (!enabled && !e.can_disable)
          throw ConfigError(pointer + "/enabled", "step \"" + e.name + "\" is required and cannot be disabled");
      }
    }
    auto step = e.make(params, pointer);  // validates even when disabled
    nlohmann::json effective = step->parameters();
    effective["enabled"] = enabled;
    p.config_["steps"][e.name] = effective;
    if (enabled) p.steps_.push_back(std::move(step));
  }
  return p;
}

std::vector<std::string> Pipeline::step_names() const {
  std::vector<std::string> names;
  for (const auto& s : steps_) names.push_back(s->name());
  return names;
}

const Step* Pipeline::find(const std::string& name) const {
  for (const auto& s : steps_)
    if (s->name() == name) return s.get();
  return nullptr;
}

RunRecord Pipeline::run(SiteTable& table, const RunInputs& inputs, const ProgressFn& progress) const {
  using clock = std::chrono::steady_clock;
  table.reset_derived();
  for (auto& t : table.transects) {
    t.slope = t.slope_sigma = t.slope_ci95_low = t.slope_ci95_high = kUnknown;
    t.slope_source = SlopeSource::none;
    t.slope_identifiable = true;
    t.slope_details = nullptr;
    t.z_ref_m = inputs.z_ref_for(t.id);
  }

  RunRecord record;
  for (const auto& s : steps_) record.steps.push_back({s->name(), s->parameters(), {}, 0.0});

  const std::size_t n_transects = table.transects.size();
  std::size_t i = 0;
  while (i < steps_.size()) {
    if (steps_[i]->scope() == StepScope::site) {
      const auto start = clock::now();
      static_cast<const SiteStep&>(*steps_[i]).run(table, inputs, record.steps[i].log);
      record.steps[i].seconds = std::chrono::duration<double>(clock::now() - start).count();
      ++i;
      continue;
    }
    // A block of consecutive transect steps: each worker takes whole transects
    // and runs the block on them, which keeps a transect's columns in cache.
    std::size_t block_end = i;
    while (block_end < steps_.size() && steps_[block_end]->scope() == StepScope::transect) ++block_end;
    const unsigned workers = static_cast<unsigned>(std::min<std::size_t>(threads_, std::max<std::size_t>(1, n_transects)));
    std::atomic<std::size_t> next{0}, done{0};
    std::mutex merge_mutex;
    std::exception_ptr failure;
    auto work = [&] {
      std::vector<StepLog> logs(block_end - i);
      std::vector<double> seconds(block_end - i, 0.0);
      try {
        for (std::size_t t; (t = next.fetch_add(1)) < n_transects;) {
          for (std::size_t k = i; k < block_end; ++k) {
            const auto start = clock::now();
            static_cast<const TransectStep&>(*steps_[k]).run(table, t, inputs, logs[k - i]);
            seconds[k - i] += std::chrono::duration<double>(clock::now() - start).count();
          }
          const std::size_t d = done.fetch_add(1) + 1;
          if (progress) {
            std::lock_guard lock(merge_mutex);
            progress(d, n_transects);
          }
        }
      } catch (...) {
        std::lock_guard lock(merge_mutex);
        if (!failure) failure = std::current_exception();
        next = n_transects;  // stop the other workers
      }
      std::lock_guard lock(merge_mutex);
      for (std::size_t k = i; k < block_end; ++k) {
        record.steps[k].log.merge(logs[k - i]);
        record.steps[k].seconds += seconds[k - i];
      }
    };
    if (workers <= 1) {
      work();
    } else {
      std::vector<std::thread> pool;
      for (unsigned w = 0; w < workers; ++w) pool.emplace_back(work);
      for (auto& th : pool) th.join();
    }
    if (failure) std::rethrow_exception(failure);
    i = block_end;
  }
  return record;
}

}  // namespace strandline
