#include "scan/scan_runner.hpp"

#include <flint/flint.h>
#include <sys/stat.h>

#include <atomic>
#include <chrono>
#include <condition_variable>
#include <deque>
#include <exception>
#include <mutex>
#include <thread>

#include "core/error.hpp"
#include "scan/results_db.hpp"
#include "scan/scan_output.hpp"

namespace circlet {

int scan_thread_count(int requested) {
  if (requested > 0) return requested;
  unsigned n = std::thread::hardware_concurrency();
  return n == 0 ? 1 : static_cast<int>(n);
}

namespace {

// Finished rows on their way from the workers to the writer. Bounded, so that
// memory does not grow when the writer is slower than the workers.
class RowQueue {
 public:
  explicit RowQueue(size_t capacity) : capacity_(capacity) {}
  void push(nlohmann::json row) {
    std::unique_lock<std::mutex> lock(mu_);
    space_.wait(lock, [&] { return rows_.size() < capacity_ || closed_; });
    if (closed_) return;
    rows_.push_back(std::move(row));
    ready_.notify_one();
  }
  /// Waits up to `wait` for rows; takes all there are (at most `max`). Empty when none came.
  std::vector<nlohmann::json> take(size_t max, std::chrono::milliseconds wait) {
    std::unique_lock<std::mutex> lock(mu_);
    ready_.wait_for(lock, wait, [&] { return !rows_.empty() || producers_ == 0; });
    std::vector<nlohmann::json> out;
    while (!rows_.empty() && out.size() < max) {
      out.push_back(std::move(rows_.front()));
      rows_.pop_front();
    }
    space_.notify_all();
    return out;
  }
  void set_producers(int n) {
    std::lock_guard<std::mutex> lock(mu_);
    producers_ = n;
  }
  void producer_done() {
    std::lock_guard<std::mutex> lock(mu_);
    --producers_;
    ready_.notify_all();
  }
  /// No producer left and nothing queued.
  bool finished() {
    std::lock_guard<std::mutex> lock(mu_);
    return producers_ == 0 && rows_.empty();
  }
  /// Stops producers waiting for space (on an error of the writer).
  void close() {
    std::lock_guard<std::mutex> lock(mu_);
    closed_ = true;
    space_.notify_all();
  }

 private:
  std::mutex mu_;
  std::condition_variable ready_, space_;
  std::deque<nlohmann::json> rows_;
  size_t capacity_;
  int producers_ = 0;
  bool closed_ = false;
};

bool file_exists(const std::string& path) {
  struct stat st;
  return ::stat(path.c_str(), &st) == 0;
}

}  // namespace

ScanRunReport run_scan(const ScanSettings& settings, const ShardSpec& shard, const std::string& dir,
                       const ScanRunOptions& options) {
  using Clock = std::chrono::steady_clock;
  ScanRunReport rep;
  const ScanSpec& spec = settings.spec;
  const std::string db_path = dir + "/scan.db";
  const nlohmann::json header = settings.header();
  const bool resuming = options.resume && file_exists(db_path);
  ResultsDb db(db_path, resuming ? ResultsDb::Mode::Resume : ResultsDb::Mode::Create, header, shard.str());
  ScanContext ctx(settings);

  const long total = spec.job_count();
  rep.owned = shard.owned(total);
  std::vector<bool> done(static_cast<size_t>(rep.owned), false);  // by (job − i)/k
  auto slot = [&](long job) { return static_cast<size_t>((job - shard.i) / shard.k); };

  if (resuming) {
    std::vector<long> drop;
    std::vector<nlohmann::json> recheck;
    auto note = [&](const std::string& s) {
      if (rep.notes.size() < 10) rep.notes.push_back(s);
    };
    db.for_each_row([&](const nlohmann::json& r, const std::string& problem) {
      const long job = r.at("job").get<long>();
      std::string bad = problem.empty() ? check_row_against_plan(r, spec, shard) : "job " + std::to_string(job) + ": " + problem;
      if (!bad.empty()) {
        drop.push_back(job);
        note("dropped and recomputed: " + bad);
        return;
      }
      if (row_needs_recomputation(r)) recheck.push_back(r);
      else done[slot(job)] = true;
    });
    SqliteTransaction tx(db.db());
    for (long job : drop) db.erase(job);
    rep.dropped = static_cast<long>(drop.size());
    for (const auto& r : recheck) {
      const long job = r["job"].get<long>();
      nlohmann::json again = run_scan_job(ctx, scan_job(spec, job));
      if (again != r) {
        db.replace(again);
        ++rep.corrected;
        note("corrected: job " + std::to_string(job) + " claimed " + r["verdict"].get<std::string>() +
             ", recomputation gives " + again["verdict"].get<std::string>());
      }
      done[slot(job)] = true;
    }
    tx.commit();
    for (bool d : done) rep.from_db += d;
  }

  rep.threads = scan_thread_count(options.threads);
  RowQueue queue(1024);
  queue.set_producers(rep.threads);
  std::atomic<long> next{0};
  std::atomic<bool> stop{false};
  std::mutex error_mu;
  std::exception_ptr error;
  auto fail = [&](std::exception_ptr e) {
    std::lock_guard<std::mutex> lock(error_mu);
    if (!error) error = e;
    stop = true;
  };
  const auto start = Clock::now();
  std::vector<std::thread> workers;
  for (int w = 0; w < rep.threads; ++w)
    workers.emplace_back([&] {
      try {
        for (;;) {
          if (stop) break;
          const long o = next++;
          if (o >= rep.owned) break;
          if (done[static_cast<size_t>(o)]) continue;
          queue.push(run_scan_job(ctx, scan_job(spec, shard.i + o * shard.k)));
        }
      } catch (...) {
        fail(std::current_exception());
      }
      flint_cleanup();  // this thread's FLINT/Arb caches
      queue.producer_done();
    });

  auto last_report = start;
  auto report = [&](bool force) {
    if (!options.progress) return;
    auto now = Clock::now();
    if (!force && now - last_report < std::chrono::milliseconds(250)) return;
    last_report = now;
    ScanProgress p;
    p.total = rep.owned;
    p.computed = rep.computed;
    p.done = rep.from_db + rep.computed;
    p.seconds = std::chrono::duration<double>(now - start).count();
    options.progress(p);
  };
  try {
    while (!queue.finished()) {
      std::vector<nlohmann::json> rows = queue.take(1024, std::chrono::milliseconds(200));
      if (!rows.empty()) {
        SqliteTransaction tx(db.db());
        for (const auto& r : rows)
          CIRCLET_ASSERT(db.insert(r), "job " + r["job"].dump() + " written twice");
        tx.commit();
        rep.computed += static_cast<long>(rows.size());
      }
      report(false);
    }
  } catch (...) {
    fail(std::current_exception());
    queue.close();
  }
  for (auto& t : workers) t.join();
  if (error) std::rethrow_exception(error);
  report(true);
  rep.seconds = std::chrono::duration<double>(Clock::now() - start).count();
  CIRCLET_ASSERT(rep.from_db + rep.computed == rep.owned, "scan finished with jobs missing");
  write_scan_outputs(dir, db, &ctx, options.csv);
  return rep;
}

}  // namespace circlet
