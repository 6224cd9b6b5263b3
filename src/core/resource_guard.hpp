#pragma once
// The resource guard shared by every command: before a long computation
// starts, the command states what it is about to do as an estimate (seconds
// and bytes, from a cost model of the request: precision × terms, rank × rows,
// digits of X to factor, ...). require_resources() refuses, with one line
// naming the estimate, the limit and the option that lifts it, when
//   * the memory estimate exceeds memory_budget() (core/memory_limit.hpp), or
//   * the time estimate exceeds the time limit (kDefaultTimeLimitSeconds, or
//     CIRCLET_TIME_LIMIT=<seconds>),
// unless the user gave --allow-large (or CIRCLET_ALLOW_LARGE=1). A request that
// goes ahead with an estimate above kNoteSeconds says so on standard error, so
// a long run is never silent. Estimates are deliberately rough (within a small
// factor on the development machine); they decide only whether to ask, never a result.
#include <string>

namespace circlet {

struct ResourceEstimate {
  std::string what;      // "certify at --prec 100000", shown in the message
  double seconds = 0;    // estimated wall time; negative: cannot be bounded
  double bytes = 0;      // estimated peak memory
  std::string reason;    // what the estimate rests on, e.g. "time grows like prec^2"
};

constexpr double kDefaultTimeLimitSeconds = 60;
constexpr double kNoteSeconds = 5;

/// The option that lifts the guard.
inline const char* allow_large_option() { return "--allow-large"; }

/// Set from the command line (--allow-large); CIRCLET_ALLOW_LARGE=1 has the same effect.
void set_allow_large(bool allow);
bool allow_large();

/// The time limit in seconds (CIRCLET_TIME_LIMIT overrides the default).
double time_limit_seconds();

/// Throws UserError when the estimate is over a limit and --allow-large was not
/// given; otherwise returns, printing a note on stderr when the run will be long.
void require_resources(const ResourceEstimate& e);

/// "12 s", "3.5 min", "2.1 h", "unbounded".
std::string format_seconds(double s);

}  // namespace circlet
