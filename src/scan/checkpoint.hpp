#pragma once
// The checkpoint of a scan: an append-only file of JSON lines. The first line
// is the header (the scan's parameters); every further line is one finished
// job. Each line is written with one write(2) before the next job starts, so a
// process killed at any moment loses at most the job in progress, which a
// resumed run recomputes; the file is fsync'd at most 0.2 s after a write (and
// on close), which bounds what a crash of the whole machine can lose. A torn last line (no newline, or not JSON)
// is cut off on resume.
#include <chrono>
#include <map>
#include <nlohmann/json.hpp>
#include <string>

namespace circlet {

class Checkpoint {
 public:
  /// Opens `path`. Without `resume` the file must not exist (UserError otherwise).
  /// With `resume` an existing file must carry the same header (UserError
  /// naming the difference otherwise); a missing file starts fresh.
  Checkpoint(std::string path, const nlohmann::json& header, bool resume);
  Checkpoint(const Checkpoint&) = delete;
  Checkpoint& operator=(const Checkpoint&) = delete;
  ~Checkpoint();

  /// Finished jobs read on resume, and appended since, by job index.
  const std::map<long, nlohmann::json>& done() const { return done_; }
  /// Appends one finished job (must carry an integer "job" field) and fsyncs.
  void append(const nlohmann::json& record);
  const std::string& path() const { return path_; }

 private:
  std::string path_;
  int fd_ = -1;
  std::chrono::steady_clock::time_point last_sync_;
  std::map<long, nlohmann::json> done_;
};

}  // namespace circlet
