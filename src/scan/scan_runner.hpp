#pragma once
// Running a scan: its jobs on worker threads (std::thread), every finished row
// funnelled to one writer (the calling thread), which commits them to the
// results database (results_db.hpp) in transactions as they arrive. A killed
// process loses only the jobs in flight: those computed but still queued for
// the writer (at most one transaction's worth, usually a handful), and those
// being computed; `resume` continues from the database.
//
// On resume every stored row is read back (streamed, job order) and checked
// against the plan (check_row_against_plan); rows that fail are deleted and
// recomputed, and rows claiming CONSTANT, PROPORTIONAL or an integer constant
// are recomputed before they are trusted (replaced if they differ). What was
// dropped or corrected is reported. Memory: one bit per job of the shard, the
// queue (bounded), SQLite's page cache, and the series of the weight ≤ 2 jobs.
#include <functional>
#include <string>
#include <vector>

#include "scan/scan_job.hpp"

namespace circlet {

struct ScanProgress {
  long done = 0, total = 0;  // jobs of the shard finished (stored) / owned
  long computed = 0;         // of which computed by this run
  double seconds = 0;        // since the workers started
};

struct ScanRunOptions {
  int threads = 0;           // worker threads; 0: the number of cores
  bool resume = false;
  bool csv = true;           // export scan.csv at the end
  std::function<void(const ScanProgress&)> progress;  // called at most every 0.25 s, and once at the end
};

struct ScanRunReport {
  long owned = 0, from_db = 0, computed = 0, dropped = 0, corrected = 0;
  int threads = 1;
  double seconds = 0;
  std::vector<std::string> notes;  // what resume dropped or corrected, one line each (at most 10)
};

/// Runs (or resumes) the scan into dir/scan.db and writes the exports (scan_output.hpp).
ScanRunReport run_scan(const ScanSettings& settings, const ShardSpec& shard, const std::string& dir,
                       const ScanRunOptions& options);

/// The number of worker threads for `requested` (0: std::thread::hardware_concurrency, at least 1).
int scan_thread_count(int requested);

}  // namespace circlet
