#pragma once
// A one-line progress display on standard error for long commands (count,
// remainder): "circlet CMD: <stage> <pct>%  <rate>/s  ETA m:ss". Shown only when
// stderr is a terminal and the run has lasted more than two seconds; redrawn at
// most five times a second; cleared at the end. Thread-safe (the series engine
// reports from its worker threads).
#include <chrono>
#include <cstdio>
#include <mutex>
#include <string>

#include "cli/command.hpp"

namespace circlet::cli {

class ProgressLine {
 public:
  /// `units` items (e.g. coefficients) correspond to the whole run (fraction 1).
  ProgressLine(std::string command, double units, std::string unit_name)
      : enabled_(stderr_is_terminal()), command_(std::move(command)), units_(units), unit_name_(std::move(unit_name)),
        start_(Clock::now()) {}
  ~ProgressLine() { finish(); }
  void update(const std::string& stage, double fraction) {
    if (!enabled_) return;
    std::lock_guard<std::mutex> lock(mu_);
    const auto now = Clock::now();
    const double elapsed = std::chrono::duration<double>(now - start_).count();
    if (elapsed < 2) return;
    if (shown_ && now - last_ < std::chrono::milliseconds(200)) return;
    last_ = now;
    shown_ = true;
    char eta[32] = "--:--";
    if (fraction > 0.001) {
      const long left = (long)(elapsed * (1 - fraction) / fraction + 0.5);
      std::snprintf(eta, sizeof eta, "%ld:%02ld", left / 60, left % 60);
    }
    const double rate = fraction * units_ / elapsed;
    std::fprintf(stderr, "\r\033[Kcirclet %s: %-14s %5.1f%%  %.3g %s/s  ETA %s", command_.c_str(), stage.c_str(),
                 100.0 * fraction, rate, unit_name_.c_str(), eta);
    std::fflush(stderr);
  }
  void finish() {
    std::lock_guard<std::mutex> lock(mu_);
    if (shown_) std::fprintf(stderr, "\r\033[K");
    shown_ = false;
  }

 private:
  using Clock = std::chrono::steady_clock;
  bool enabled_;
  std::string command_;
  double units_;
  std::string unit_name_;
  bool shown_ = false;
  Clock::time_point start_, last_;
  std::mutex mu_;
};

}  // namespace circlet::cli
