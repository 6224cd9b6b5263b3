#pragma once
// "circlet <command>: <stage> 42.0% (1200/s, ETA 3 s)" on standard error, only
// when standard error is a terminal and the run has lasted two seconds; the line
// is rewritten in place at most five times a second and cleared at the end.
// CIRCLET_PROGRESS_AFTER=<milliseconds> changes the delay of two seconds.
#include <chrono>
#include <string>

namespace circlet {

class ProgressLine {
 public:
  /// `command` names the command in the line, e.g. "ratio".
  explicit ProgressLine(std::string command);
  ~ProgressLine();
  ProgressLine(const ProgressLine&) = delete;
  ProgressLine& operator=(const ProgressLine&) = delete;
  /// fraction in [0, 1] of `stage` done; `done`/`total` items for the rate (0: not shown).
  void update(const std::string& stage, double fraction, long done = 0);
  void finish();

 private:
  using Clock = std::chrono::steady_clock;
  std::string command_;
  bool enabled_;
  bool shown_ = false;
  Clock::time_point start_, last_;
  Clock::duration delay_ = std::chrono::seconds(2);
};

/// True when standard error is a terminal.
bool stderr_is_a_terminal();

}  // namespace circlet
