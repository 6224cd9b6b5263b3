#include "core/progress_line.hpp"

#include <unistd.h>

#include <cstdio>
#include <cstdlib>

namespace circlet {

bool stderr_is_a_terminal() { return ::isatty(STDERR_FILENO) == 1; }

ProgressLine::ProgressLine(std::string command)
    : command_(std::move(command)), enabled_(stderr_is_a_terminal()), start_(Clock::now()) {
  // CIRCLET_PROGRESS_AFTER=<milliseconds> changes the 2 s delay (tests use 0).
  if (const char* env = std::getenv("CIRCLET_PROGRESS_AFTER")) {
    char* end = nullptr;
    const long ms = std::strtol(env, &end, 10);
    if (end != env && *end == '\0' && ms >= 0) delay_ = std::chrono::milliseconds(ms);
  }
}

ProgressLine::~ProgressLine() { finish(); }

void ProgressLine::update(const std::string& stage, double fraction, long done) {
  if (!enabled_) return;
  const auto now = Clock::now();
  if (now - start_ < delay_) return;
  if (shown_ && now - last_ < std::chrono::milliseconds(200)) return;
  last_ = now;
  shown_ = true;
  const double elapsed = std::chrono::duration<double>(now - start_).count();
  char extra[64] = "";
  if (fraction > 0.001) {
    const double eta = elapsed * (1 - fraction) / fraction;
    if (done > 0)
      std::snprintf(extra, sizeof extra, " (%.0f/s, ETA %.0f s)", done / elapsed, eta);
    else
      std::snprintf(extra, sizeof extra, " (ETA %.0f s)", eta);
  }
  std::fprintf(stderr, "\rcirclet %s: %-14s %5.1f%%%s\033[K", command_.c_str(), stage.c_str(), 100.0 * fraction, extra);
  std::fflush(stderr);
}

void ProgressLine::finish() {
  if (shown_) std::fprintf(stderr, "\r\033[K");
  shown_ = false;
}

}  // namespace circlet
