// The memory budget (src/core/memory_limit.hpp): the least of MemAvailable,
// the cgroup limit and RLIMIT_AS; CIRCLET_MEMORY_AVAILABLE overrides.
#include "core/memory_limit.hpp"

#include <sys/resource.h>

#include <catch2/catch.hpp>
#include <cstdlib>

#include "cli_run.hpp"

TEST_CASE("the environment override wins and is named", "[core][memory]") {
  ::setenv("CIRCLET_MEMORY_AVAILABLE", "12345", 1);
  const auto b = circlet::memory_budget();
  ::unsetenv("CIRCLET_MEMORY_AVAILABLE");
  CHECK(b.bytes == 12345);
  CHECK(b.source == "CIRCLET_MEMORY_AVAILABLE");
}

TEST_CASE("the budget is known on Linux and never above MemAvailable", "[core][memory]") {
  const auto b = circlet::memory_budget();
  REQUIRE(b.bytes >= 0);
  // MemAvailable read independently of the code under test.
  const std::string meminfo = circlet::testing::slurp_file("/proc/meminfo");
  const auto at = meminfo.find("MemAvailable:");
  REQUIRE(at != std::string::npos);
  const double avail_kb = std::strtod(meminfo.c_str() + at + 13, nullptr);
  // Memory may be freed between the two reads: allow the later reading's value plus 10 %.
  CHECK(b.bytes <= avail_kb * 1024.0 * 1.1);
}

TEST_CASE("RLIMIT_AS lowers the budget and is named as the source", "[core][memory]") {
  struct rlimit old {};
  REQUIRE(::getrlimit(RLIMIT_AS, &old) == 0);
  // Limit the address space to what is mapped now plus 64 MB (the test then allocates nothing large).
  double vm_kb = 0;
  const std::string status = circlet::testing::slurp_file("/proc/self/status");
  const auto at = status.find("VmSize:");
  REQUIRE(at != std::string::npos);
  vm_kb = std::strtod(status.c_str() + at + 7, nullptr);
  struct rlimit lim = old;
  lim.rlim_cur = static_cast<rlim_t>(vm_kb * 1024.0 + 64e6);
  REQUIRE(::setrlimit(RLIMIT_AS, &lim) == 0);
  const auto b = circlet::memory_budget();
  REQUIRE(::setrlimit(RLIMIT_AS, &old) == 0);
  CHECK(b.bytes <= 64e6 + 1e6);
  CHECK(b.source == "RLIMIT_AS (ulimit -v)");
}
