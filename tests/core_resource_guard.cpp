// The resource guard (src/core/resource_guard.hpp): refuse over the limit with
// the estimate and the lifting option; --allow-large lifts time, never memory.
#include "core/resource_guard.hpp"

#include <catch2/catch.hpp>
#include <cstdlib>

#include "core/error.hpp"

using circlet::require_resources;
using circlet::ResourceEstimate;
using circlet::UserError;

TEST_CASE("an estimate above the time limit is refused unless allowed", "[core][guard]") {
  ResourceEstimate e;
  e.what = "a test request";
  e.seconds = circlet::time_limit_seconds() * 2;
  circlet::set_allow_large(false);
  CHECK_THROWS_WITH(require_resources(e), Catch::StartsWith("a test request would take about") &&
                                              Catch::Contains("(give --allow-large to run it anyway)"));
  circlet::set_allow_large(true);
  CHECK_NOTHROW(require_resources(e));
  circlet::set_allow_large(false);
  e.seconds = -1;  // unbounded
  CHECK_THROWS_WITH(require_resources(e), Catch::Contains("may take unbounded time"));
  e.seconds = 0.5;
  CHECK_NOTHROW(require_resources(e));
}

TEST_CASE("memory beyond the budget is refused even with --allow-large", "[core][guard]") {
  ::setenv("CIRCLET_MEMORY_AVAILABLE", "1000000", 1);
  ResourceEstimate e;
  e.what = "a big request";
  e.bytes = 2e6;
  circlet::set_allow_large(true);
  CHECK_THROWS_WITH(require_resources(e), Catch::Contains("more than the 0.00 GB available (CIRCLET_MEMORY_AVAILABLE)"));
  circlet::set_allow_large(false);
  ::unsetenv("CIRCLET_MEMORY_AVAILABLE");
}

TEST_CASE("CIRCLET_TIME_LIMIT sets the limit", "[core][guard]") {
  ::setenv("CIRCLET_TIME_LIMIT", "7", 1);
  CHECK(circlet::time_limit_seconds() == 7);
  ::setenv("CIRCLET_TIME_LIMIT", "junk", 1);
  CHECK(circlet::time_limit_seconds() == circlet::kDefaultTimeLimitSeconds);
  ::unsetenv("CIRCLET_TIME_LIMIT");
}
