#include <catch2/catch.hpp>
#include <climits>

#include "core/error.hpp"
#include "family/progression.hpp"

using namespace circlet;

TEST_CASE("progressions parse as A,B", "[progression_spec]") {
  CHECK(Progression::parse("5,4") == Progression{5, 4});
  CHECK(Progression::parse("1,0").at(7) == 7);
  CHECK(Progression::parse("3,2").at(10) == 32);
}

TEST_CASE("bad progressions are rejected with a clear message", "[progression_spec][errors]") {
  CHECK_THROWS_WITH(Progression::parse("0,1"), Catch::Contains("A must be at least 1"));
  CHECK_THROWS_WITH(Progression::parse("3,-1"), Catch::Contains("must be non-negative"));
  CHECK_THROWS_WITH(Progression::parse("3"), Catch::Contains("must be A,B"));
  CHECK_THROWS_WITH(Progression::parse("3,1,2"), Catch::Contains("must be A,B"));
  CHECK_THROWS_WITH(Progression::parse("x,1"), Catch::Contains("expects a non-negative integer"));
  CHECK_THROWS_WITH(Progression::parse(",1"), Catch::Contains("expects a non-negative integer"));
  CHECK_THROWS_WITH(Progression::parse("99999999999999999999,1"), Catch::Contains("too large"));
  CHECK_THROWS_WITH((Progression{LONG_MAX / 2, 5}.at(3)), Catch::Contains("exceeds 64-bit"));
}

TEST_CASE("non-negative integers are parsed strictly", "[progression_spec][errors]") {
  CHECK(parse_nonnegative("--to", "0", 10) == 0);
  CHECK(parse_nonnegative("--to", "10", 10) == 10);
  CHECK_THROWS_WITH(parse_nonnegative("--to", "11", 10), Catch::Contains("--to = 11 is too large"));
  CHECK_THROWS_WITH(parse_nonnegative("--to", "-3", 10), Catch::Contains("--to must be non-negative"));
  CHECK_THROWS_WITH(parse_nonnegative("--to", "1e5", 10), Catch::Contains("expects a non-negative integer"));
  CHECK_THROWS_WITH(parse_nonnegative("--to", "", 10), Catch::Contains("expects a non-negative integer"));
}

TEST_CASE("row selections follow --to, --at and --ap", "[progression_spec]") {
  RowSelection all = RowSelection::parse("10", "", "");
  CHECK((!all.progression && all.count == 11 && all.n_max == 10 && all.n_of(3) == 3));
  RowSelection one = RowSelection::parse("", "7", "");
  CHECK((one.count == 1 && one.n_of(0) == 7 && one.n_max == 7));
  RowSelection ap = RowSelection::parse("4", "", "5,3");
  CHECK((ap.progression && ap.count == 5 && ap.n_of(4) == 23 && ap.n_max == 23));
}

TEST_CASE("bad row selections are rejected with a clear message", "[progression_spec][errors]") {
  CHECK_THROWS_WITH(RowSelection::parse("", "", ""), "give --to N, --at N or --ap A,B --to K");
  CHECK_THROWS_WITH(RowSelection::parse("", "3", "", false), "give --to N or --ap A,B --to K");
  CHECK_THROWS_WITH(RowSelection::parse("3", "4", ""), "give either --to N or --at N, not both");
  CHECK_THROWS_WITH(RowSelection::parse("", "4", "2,1"), "give either --at N or --ap A,B --to K, not both");
  CHECK_THROWS_WITH(RowSelection::parse("", "", "2,1"), Catch::Contains("--ap A,B needs --to K"));
  CHECK_THROWS_WITH(RowSelection::parse("5", "", "9223372036854775807,0"), Catch::Contains("exceeds 64-bit"));
}
