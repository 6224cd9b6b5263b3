#include "family/family.hpp"

#include <catch2/catch.hpp>

#include "core/error.hpp"

using namespace circlet;

TEST_CASE("family names parse and print back", "[family]") {
  for (const char* n : {"c1", "c7", "c64", "sc13", "sc2", "sq5", "c1000"})
    CHECK(Family::parse(n).name() == n);
  CHECK(Family::parse("sc13").kind == FamilyKind::SelfConjugateCore);
  CHECK(Family::parse("sq5").kind == FamilyKind::SumOfSquares);
}

TEST_CASE("bad family names are rejected with a clear message", "[family][errors]") {
  CHECK_THROWS_WITH(Family::parse("x7"), Catch::Contains("unknown family 'x7'"));
  CHECK_THROWS_WITH(Family::parse("c"), Catch::Contains("is not a positive integer"));
  CHECK_THROWS_WITH(Family::parse("c-3"), Catch::Contains("is not a positive integer"));
  CHECK_THROWS_WITH(Family::parse("c0"), Catch::Contains("out of range"));
  CHECK_THROWS_WITH(Family::parse("sc1001"), Catch::Contains("out of range"));
  CHECK_THROWS_WITH(Family::parse("c7x"), Catch::Contains("is not a positive integer"));
  CHECK_THROWS_AS(Family::parse("c99999999999"), UserError);
}

TEST_CASE("ranks follow docs/MATH.md Â§2, and c_t and sc_{2t-1} share a weight", "[family]") {
  CHECK(Family::parse("c7").rank() == 6);
  CHECK(Family::parse("sc7").rank() == 3);
  CHECK(Family::parse("sc8").rank() == 4);
  CHECK(Family::parse("sq5").rank() == 5);
  for (int t = 2; t <= 40; ++t)
    CHECK(Family{FamilyKind::Core, t}.rank() == Family{FamilyKind::SelfConjugateCore, 2 * t - 1}.rank());
}

TEST_CASE("eta quotients have no leading q-power", "[family]") {
  // Σ d·e_d = 0 is the condition that the η-quotient's q^{Σ d e_d/24} offset vanishes.
  for (auto kind : {FamilyKind::Core, FamilyKind::SelfConjugateCore, FamilyKind::SumOfSquares})
    for (int t = 1; t <= 30; ++t) {
      long s = 0;
      for (const auto& f : Family{kind, t}.eta_quotient()) s += f.d * f.e;
      const std::string fam = Family{kind, t}.name();
      INFO(fam);
      // c_t and sc_t carry q^{(t²−1)/24}: the shift Δ of docs/MATH.md §2 (for sc_t, t odd,
      // m(m+1)/6 = (t²−1)/24 with m = (t−1)/2); θ^S carries none.
      if (kind == FamilyKind::SumOfSquares) CHECK(s == 0);
      else CHECK(s == static_cast<long>(t) * t - 1);
    }
}
