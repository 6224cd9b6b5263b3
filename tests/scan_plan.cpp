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

TEST_CASE("family pairs parse as functions of t and check their weights", "[scan][plan][pair]") {
  FamilyPair d;
  CHECK(d.str() == "ct:sc2t-1");
  CHECK(FamilyPair::parse("ct:sc2t-1") == d);
  FamilyPair p = FamilyPair::parse("sc2t+1:sqt");
  CHECK(p.F.at(6).name() == "sc13");
  CHECK(p.G.at(6).name() == "sq6");
  CHECK(p.str() == "sc2t+1:sqt");
  FamilyPair fixed = FamilyPair::parse("c6:sq5");
  CHECK_FALSE(fixed.depends_on_t());
  CHECK(fixed.F.at(30).name() == "c6");
  CHECK_THROWS_WITH(FamilyPair::parse("ct"), Catch::Contains("--pair expects F:G"));
  CHECK_THROWS_WITH(FamilyPair::parse("xt:ct"), Catch::Contains("family prefix"));
  CHECK_THROWS_WITH(FamilyPair::parse("ct:sct*2"), Catch::Contains("family prefix"));
  CHECK_THROWS_WITH(FamilyPair::parse("ct:sqt-9").G.at(6), Catch::Contains("outside 1..1000"));
  ScanSpec s;
  s.t_lo = 6;
  s.t_hi = 9;
  s.pair = FamilyPair::parse("ct:sqt-1");
  CHECK_NOTHROW(s.validate());
  s.pair = FamilyPair::parse("ct:sqt");
  CHECK_THROWS_WITH(s.validate(), Catch::Contains("at t = 6 c6 has weight 5/2 but sq6 has weight 3"));
  // The default scan's jobs keep their families: c_t against sc_{2t-1}.
  s.pair = FamilyPair{};
  s.M = 2;
  CHECK(scan_job(s, 0).F.name() == "c6");
  CHECK(scan_job(s, 0).G.name() == "sc11");
  CHECK(scan_job(s, s.job_count() - 1).G.name() == "sc17");
  ShardSpec sh = ShardSpec::parse("2/5");
  long n = 0;
  for (long j = 0; j < 23; ++j) n += sh.owns(j);
  CHECK(sh.owned(23) == n);
}
