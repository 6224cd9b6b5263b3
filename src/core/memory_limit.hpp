#pragma once
// How much memory a new computation may use: the least of
//   * MemAvailable from /proc/meminfo (what the machine can give),
//   * the cgroup memory limit minus the cgroup's current usage (cgroup v2
//     memory.max / memory.current, or v1 memory.limit_in_bytes /
//     memory.usage_in_bytes), over the process's cgroup and its ancestors
//     (a batch job's or container's limit),
//   * RLIMIT_AS minus the address space already mapped (ulimit -v).
// CIRCLET_MEMORY_AVAILABLE=<bytes> overrides all of them (tests of refusals).
#include <string>

namespace circlet {

struct MemoryBudget {
  double bytes = -1;   // negative: unknown (no source could be read)
  std::string source;  // which limit is the least, e.g. "MemAvailable", "cgroup memory.max", "RLIMIT_AS (ulimit -v)"
};

/// The least of the sources above.
MemoryBudget memory_budget();

/// "1.50 GB".
std::string format_bytes(double bytes);

}  // namespace circlet
