#pragma once
// The three error channels (see DEVELOPERS.md):
//  1. circlet::UserError  -- bad input from the user; the message is one clear line.
//  2. CIRCLET_ASSERT      -- a broken internal invariant: a bug, never user input.
//  3. "unknown" results   -- mathematics out of reach is reported as a value
//                            (e.g. Verdict::Undecided), not thrown.
#include <stdexcept>
#include <string>

namespace circlet {

/// Bad user input. The CLI prints `circlet: error: <what()>` and exits with status 2.
class UserError : public std::runtime_error {
 public:
  explicit UserError(const std::string& message) : std::runtime_error(message) {}
};

/// Thrown by CIRCLET_ASSERT; the CLI reports it as an internal error (status 3).
class InternalError : public std::logic_error {
 public:
  explicit InternalError(const std::string& message) : std::logic_error(message) {}
};

[[noreturn]] void assertion_failed(const char* expr, const char* file, int line, const std::string& msg);

}  // namespace circlet

#define CIRCLET_ASSERT(cond, msg)                                              \
  do {                                                                         \
    if (!(cond)) ::circlet::assertion_failed(#cond, __FILE__, __LINE__, (msg)); \
  } while (0)
