#include "scan/scan_plan.hpp"

#include <catch2/catch.hpp>
#include <set>

#include "core/error.hpp"

using namespace circlet;

TEST_CASE("jobs enumerate every pair once in a fixed order", "[scan][plan]") {
  ScanSpec s;
  s.t_lo = 6;
  s.t_hi = 8;
  s.M = 4;
  CHECK(s.progressions() == 10);
  CHECK(s.job_count() == 300);
  std::set<std::tuple<int, long, long, long, long>> seen;
  for (long i = 0; i < s.job_count(); ++i) {
    ScanJob j = scan_job(s, i);
    CHECK(j.index == i);
    CHECK((j.ap.A >= 1 && j.ap.A <= 4 && j.ap.B >= 0 && j.ap.B < j.ap.A));
    CHECK((j.ap2.A >= 1 && j.ap2.A <= 4 && j.ap2.B >= 0 && j.ap2.B < j.ap2.A));
    seen.insert({j.t, j.ap.A, j.ap.B, j.ap2.A, j.ap2.B});
  }
  CHECK(seen.size() == 300);
  CHECK(scan_job(s, 0).t == 6);
  CHECK(scan_job(s, 299).t == 8);
  CHECK(scan_job(s, 299).ap.A == 4);
  CHECK(scan_job(s, 299).ap.B == 3);
}

TEST_CASE("k shards cover the jobs exactly once", "[scan][plan]") {
  for (long k : {1L, 3L, 7L}) {
    std::vector<int> hits(100, 0);
    for (long i = 0; i < k; ++i) {
      ShardSpec sh = ShardSpec::parse(std::to_string(i) + "/" + std::to_string(k));
      for (long j = 0; j < 100; ++j) hits[j] += sh.owns(j);
    }
    for (int h : hits) CHECK(h == 1);
  }
  CHECK_THROWS_WITH(ShardSpec::parse("3/3"), Catch::Contains("0 <= i < k"));
  CHECK_THROWS_WITH(ShardSpec::parse("1"), Catch::Contains("--shard expects i/k"));
  int lo, hi;
  ScanSpec::parse_t_range("6..12", &lo, &hi);
  CHECK((lo == 6 && hi == 12));
  CHECK_THROWS_WITH(ScanSpec::parse_t_range("9..6", &lo, &hi), Catch::Contains("--t expects a range"));
}
