// Background runs: a bounded queue served by a few worker threads at lower
// CPU priority (nice +10), so request handlers stay responsive while a run
// computes. Progress lives in memory while a run is active; states and results
// go to the store.
#pragma once

#include <condition_variable>
#include <cstdint>
#include <deque>
#include <functional>
#include <map>
#include <mutex>
#include <optional>
#include <string>
#include <thread>
#include <string_view>
#include <vector>

#include <nlohmann/json.hpp>

#include "server/store/store.h"

namespace strandline::app {

// The stages of a run, in order. A run is reported "running" until the last
// one ends, though its results are in the store from the third on.
enum class RunStage { reading_inputs, correcting, storing_results, rendering_documents };
inline constexpr int kRunStageCount = 4;
std::string_view run_stage_name(RunStage stage);

struct RunProgress {
  RunStage stage = RunStage::reading_inputs;
  std::int64_t done = 0;   // transects corrected (stage correcting)
  std::int64_t total = 0;  // transects in the run's scope
};

// A run as clients see it: the store's record, overlaid with the worker's stage
// while the run is active. `progress` holds transects_done/total, stage,
// stage_index (1-based), stage_count and fraction (0..1; null once failed).
struct RunStatus {
  std::string state;
  nlohmann::json progress;
};
RunStatus run_status(const store::RunInfo& run, const std::optional<RunProgress>& active);

class RunManager {
 public:
  // What a run that ended left: its final state ("done" or "failed") and, when
  // done, the transects it stored results for. Called on the run's worker thread.
  struct RunEnded {
    std::int64_t run_id = 0;
    std::string site_id;
    std::string state;
    std::vector<std::string> transects;
  };
  using RunEndedFn = std::function<void(const RunEnded&)>;

  RunManager(store::Store& store, RunEndedFn on_run_ended, unsigned workers, std::size_t max_queued);
  ~RunManager();  // finishes the active runs, leaves queued ones for fail_interrupted_runs

  // False when the queue is full (the caller answers 503).
  bool enqueue(std::int64_t run_id);
  std::optional<RunProgress> progress(std::int64_t run_id) const;
  std::size_t active() const;
  // Blocks until no run is queued or running (tests and `serve --demo`).
  void wait_idle();

 private:
  void work();
  void execute(std::int64_t run_id);
  void set_progress(std::int64_t run_id, RunProgress progress);

  store::Store& store_;
  RunEndedFn on_run_ended_;
  std::size_t max_queued_;
  mutable std::mutex mutex_;
  std::condition_variable wake_, idle_;
  std::deque<std::int64_t> queue_;
  std::map<std::int64_t, RunProgress> running_;
  bool stopping_ = false;
  std::vector<std::thread> threads_;
};

}  // namespace strandline::app
