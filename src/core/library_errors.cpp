#include "core/library_errors.hpp"

#include <unistd.h>

#include <NTL/tools.h>
#include <flint/flint.h>

#include <cstring>

namespace circlet {

namespace {

void write_stderr(const char* s) {
  for (size_t left = std::strlen(s); left > 0;) {
    const ssize_t w = ::write(STDERR_FILENO, s, left);
    if (w <= 0) return;
    s += w;
    left -= static_cast<size_t>(w);
  }
}

// Only async-signal-safe calls: the heap may be exhausted.
void ntl_message(const char* msg) {
  const bool memory = msg && (std::strstr(msg, "out of memory") || std::strstr(msg, "memory"));
  write_stderr(memory ? "circlet: error: out of memory (NTL: " : "circlet: internal error: NTL: ");
  write_stderr(msg ? msg : "");
  write_stderr(memory ? "; see the memory limits in README)\n" : "\n");
  ::_exit(memory ? 2 : 3);
}

// FLINT calls its abort handler after printing its own message; allocation
// failures are by far the common cause of a FLINT abort in this program.
FLINT_NORETURN void flint_abort_handler() {  // FLINT_NORETURN: clang needs the GNU attribute in the type
  write_stderr("circlet: error: out of memory or a fatal FLINT error (see the message above)\n");
  ::_exit(2);
}

}  // namespace

void install_library_error_handlers() {
  NTL::ErrorMsgCallback = ntl_message;
  flint_set_abort(flint_abort_handler);
}

}  // namespace circlet
