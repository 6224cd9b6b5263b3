#include "core/resource_guard.hpp"

#include <cstdio>
#include <cstdlib>
#include <iostream>

#include "core/error.hpp"
#include "core/memory_limit.hpp"

namespace circlet {

namespace {
bool g_allow_large = false;
}

void set_allow_large(bool allow) { g_allow_large = allow; }

bool allow_large() {
  if (g_allow_large) return true;
  const char* env = std::getenv("CIRCLET_ALLOW_LARGE");
  return env && std::string(env) == "1";
}

double time_limit_seconds() {
  if (const char* env = std::getenv("CIRCLET_TIME_LIMIT")) {
    char* end = nullptr;
    const double v = std::strtod(env, &end);
    if (end != env && *end == '\0' && v >= 0) return v;
  }
  return kDefaultTimeLimitSeconds;
}

std::string format_seconds(double s) {
  char buf[48];
  if (s < 0)
    return "unbounded";
  else if (s < 120)
    std::snprintf(buf, sizeof buf, "%.0f s", s);
  else if (s < 7200)
    std::snprintf(buf, sizeof buf, "%.1f min", s / 60);
  else if (s < 3.6e6)
    std::snprintf(buf, sizeof buf, "%.1f h", s / 3600);
  else
    std::snprintf(buf, sizeof buf, "%.2g h", s / 3600);
  return buf;
}

void require_resources(const ResourceEstimate& e) {
  const std::string lift = std::string(" (give ") + allow_large_option() + " to run it anyway)";
  const MemoryBudget budget = memory_budget();
  const std::string why = e.reason.empty() ? "" : "; " + e.reason;
  if (budget.bytes >= 0 && e.bytes > budget.bytes) {
    // Memory beyond the budget cannot be lifted: the run would be killed or fail to allocate.
    throw UserError(e.what + " needs about " + format_bytes(e.bytes) + " of memory, more than the " +
                    format_bytes(budget.bytes) + " available (" + budget.source + ")" + why);
  }
  const double limit = time_limit_seconds();
  const bool over = e.seconds < 0 || e.seconds > limit;
  if (over && !allow_large())
    throw UserError(e.what + (e.seconds < 0 ? " may take unbounded time" : " would take about " + format_seconds(e.seconds)) +
                    ", more than the limit of " + format_seconds(limit) + why + lift);
  if (e.seconds < 0 || e.seconds > kNoteSeconds)
    std::cerr << "circlet: note: " << e.what
              << (e.seconds < 0 ? " may take unbounded time" : " will take about " + format_seconds(e.seconds)) << why
              << "\n";
}

}  // namespace circlet
