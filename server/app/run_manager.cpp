#include "server/app/run_manager.h"

#include <sys/resource.h>
#include <sys/syscall.h>
#include <unistd.h>

#include <algorithm>
#include <exception>

#include "server/app/run_executor.h"

namespace strandline::app {

namespace {

// Share of a run's time each stage takes (measured on the demo: correcting dominates).
constexpr double kStageWeight[kRunStageCount] = {0.1, 0.7, 0.1, 0.1};

}  // namespace

std::string_view run_stage_name(RunStage stage) {
  switch (stage) {
    case RunStage::reading_inputs: return "reading inputs";
    case RunStage::correcting: return "correcting transects";
    case RunStage::storing_results: return "storing results";
    case RunStage::rendering_documents: return "rendering documents";
  }
  return "unknown";
}

RunStatus run_status(const store::RunInfo& run, const std::optional<RunProgress>& active) {
  RunStatus s{run.state, nullptr};
  std::int64_t done = run.state == "done" ? run.transects_total : run.transects_done;
  std::int64_t total = run.transects_total;
  std::string stage = run.state == "done" ? "finished" : run.state;  // queued, running, failed
  int index = run.state == "done" ? kRunStageCount : 0;
  nlohmann::json fraction = run.state == "done" ? nlohmann::json(1.0)
                            : run.state == "failed" ? nlohmann::json(nullptr)
                                                    : nlohmann::json(0.0);
  // The store says "done" once results are stored; the worker still renders documents then.
  if (active && (run.state == "running" || run.state == "done")) {
    s.state = "running";
    done = active->done;
    total = std::max(active->total, total);
    const int k = static_cast<int>(active->stage);
    stage = run_stage_name(active->stage);
    index = k + 1;
    double f = 0;
    for (int i = 0; i < k; ++i) f += kStageWeight[i];
    if (active->stage == RunStage::correcting && total > 0)
      f += kStageWeight[k] * static_cast<double>(done) / static_cast<double>(total);
    fraction = f;
  }
  s.progress = {{"transects_done", done}, {"transects_total", total}, {"stage", stage},
                {"stage_index", index},   {"stage_count", kRunStageCount}, {"fraction", fraction}};
  return s;
}

RunManager::RunManager(store::Store& store, RunEndedFn on_run_ended, unsigned workers, std::size_t max_queued)
    : store_(store), on_run_ended_(std::move(on_run_ended)), max_queued_(max_queued) {
  for (unsigned i = 0; i < std::max(1u, workers); ++i) threads_.emplace_back([this] { work(); });
}

RunManager::~RunManager() {
  {
    std::lock_guard lock(mutex_);
    stopping_ = true;
  }
  wake_.notify_all();
  for (auto& t : threads_) t.join();
}

bool RunManager::enqueue(std::int64_t run_id) {
  {
    std::lock_guard lock(mutex_);
    if (queue_.size() >= max_queued_) return false;
    queue_.push_back(run_id);
  }
  wake_.notify_one();
  return true;
}

std::optional<RunProgress> RunManager::progress(std::int64_t run_id) const {
  std::lock_guard lock(mutex_);
  auto it = running_.find(run_id);
  if (it == running_.end()) return std::nullopt;
  return it->second;
}

std::size_t RunManager::active() const {
  std::lock_guard lock(mutex_);
  return running_.size() + queue_.size();
}

void RunManager::wait_idle() {
  std::unique_lock lock(mutex_);
  idle_.wait(lock, [&] { return queue_.empty() && running_.empty(); });
}

void RunManager::work() {
  // Linux keeps a nice value per thread; threads the pipeline starts inherit it.
  setpriority(PRIO_PROCESS, static_cast<id_t>(syscall(SYS_gettid)), 10);
  for (;;) {
    std::int64_t run_id = 0;
    {
      std::unique_lock lock(mutex_);
      wake_.wait(lock, [&] { return stopping_ || !queue_.empty(); });
      if (stopping_) return;
      run_id = queue_.front();
      queue_.pop_front();
      running_[run_id] = {};
    }
    execute(run_id);
    {
      std::lock_guard lock(mutex_);
      running_.erase(run_id);
    }
    idle_.notify_all();
  }
}

void RunManager::set_progress(std::int64_t run_id, RunProgress progress) {
  std::lock_guard lock(mutex_);
  running_[run_id] = progress;
}

void RunManager::execute(std::int64_t run_id) {
  RunEnded ended;
  ended.run_id = run_id;
  try {
    const auto run = store_.run(run_id);
    if (!run) return;
    ended.site_id = run->site_id;
    const auto transects = transects_in_scope(store_, *run);
    const auto total = static_cast<std::int64_t>(transects.size());
    store_.mark_run_started(run_id, total);
    set_progress(run_id, {RunStage::reading_inputs, 0, total});
    auto output = execute_run(store_, *run, transects, [&](std::size_t done, std::size_t of) {
      set_progress(run_id, {RunStage::correcting, static_cast<std::int64_t>(done), static_cast<std::int64_t>(of)});
    });
    set_progress(run_id, {RunStage::storing_results, total, total});
    store_.finish_run(run_id, output.provenance, output.results);
    ended.state = "done";
    for (const auto& r : output.results) ended.transects.push_back(r.transect_id);
    set_progress(run_id, {RunStage::rendering_documents, total, total});
  } catch (const std::exception& e) {
    try {
      store_.mark_run_failed(run_id, e.what());
    } catch (...) {
    }
    ended.state = "failed";
  }
  if (!on_run_ended_) return;
  try {
    on_run_ended_(ended);
  } catch (...) {  // an observer's failure is not the run's
  }
}

}  // namespace strandline::app
