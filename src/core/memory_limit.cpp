#include "core/memory_limit.hpp"

#include <sys/resource.h>

#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <sstream>

namespace circlet {

namespace {

/// A number of bytes from a one-value file; false for "max", a missing file or junk.
bool read_bytes_file(const std::string& path, double& out) {
  std::ifstream in(path);
  std::string s;
  if (!(in >> s) || s == "max") return false;
  char* end = nullptr;
  const double v = std::strtod(s.c_str(), &end);
  if (end == s.c_str() || *end != '\0' || v < 0) return false;
  out = v;
  return true;
}

void consider(MemoryBudget& b, double bytes, const std::string& source) {
  if (bytes < 0) bytes = 0;
  if (b.bytes < 0 || bytes < b.bytes) {
    b.bytes = bytes;
    b.source = source;
  }
}

double mem_available() {
  std::ifstream in("/proc/meminfo");
  std::string key, unit;
  double kb;
  while (in >> key >> kb) {
    std::getline(in, unit);
    if (key == "MemAvailable:") return kb * 1024.0;
  }
  return -1;
}

/// cgroup limits of this process and its ancestors: limit − usage at each level.
void cgroup_limits(MemoryBudget& b) {
  std::ifstream in("/proc/self/cgroup");
  for (std::string line; std::getline(in, line);) {
    // "0::/path" (v2) or "N:controllers:/path" (v1)
    const auto c1 = line.find(':'), c2 = line.find(':', c1 + 1);
    if (c1 == std::string::npos || c2 == std::string::npos) continue;
    const std::string controllers = line.substr(c1 + 1, c2 - c1 - 1);
    std::string rel = line.substr(c2 + 1);
    const bool v2 = controllers.empty();
    bool v1_memory = false;
    std::stringstream cs(controllers);
    for (std::string c; std::getline(cs, c, ',');) v1_memory = v1_memory || c == "memory";
    if (!v2 && !v1_memory) continue;
    const std::string root = v2 ? "/sys/fs/cgroup" : "/sys/fs/cgroup/memory";
    const std::string max_file = v2 ? "/memory.max" : "/memory.limit_in_bytes";
    const std::string cur_file = v2 ? "/memory.current" : "/memory.usage_in_bytes";
    // From the process's own group up to the root (inside a cgroup namespace the path is "/").
    for (;;) {
      const std::string dir = root + (rel == "/" ? "" : rel);
      double limit, used = 0;
      // v1 reports "no limit" as a huge number (about 2^63); it loses to every other source.
      if (read_bytes_file(dir + max_file, limit) && limit < 1e18) {
        read_bytes_file(dir + cur_file, used);
        consider(b, limit - used, v2 ? "cgroup memory.max" : "cgroup memory.limit_in_bytes");
      }
      if (rel.empty() || rel == "/") break;
      const auto slash = rel.find_last_of('/');
      rel = slash == 0 || slash == std::string::npos ? "/" : rel.substr(0, slash);
    }
  }
}

/// RLIMIT_AS minus the address space mapped now (VmSize of /proc/self/status).
void address_space_limit(MemoryBudget& b) {
  struct rlimit rl {};
  if (::getrlimit(RLIMIT_AS, &rl) != 0 || rl.rlim_cur == RLIM_INFINITY) return;
  double vm = 0;
  std::ifstream in("/proc/self/status");
  for (std::string line; std::getline(in, line);)
    if (line.rfind("VmSize:", 0) == 0) vm = std::strtod(line.c_str() + 7, nullptr) * 1024.0;
  consider(b, static_cast<double>(rl.rlim_cur) - vm, "RLIMIT_AS (ulimit -v)");
}

}  // namespace

MemoryBudget memory_budget() {
  MemoryBudget b;
  if (const char* env = std::getenv("CIRCLET_MEMORY_AVAILABLE")) {
    char* end = nullptr;
    const double v = std::strtod(env, &end);
    if (end != env && v >= 0) {
      b.bytes = v;
      b.source = "CIRCLET_MEMORY_AVAILABLE";
      return b;
    }
  }
  const double avail = mem_available();
  if (avail >= 0) consider(b, avail, "MemAvailable");
  cgroup_limits(b);
  address_space_limit(b);
  return b;
}

std::string format_bytes(double bytes) {
  char buf[48];
  std::snprintf(buf, sizeof buf, "%.2f GB", bytes / 1e9);
  return buf;
}

}  // namespace circlet
