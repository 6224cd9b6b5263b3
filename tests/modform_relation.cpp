// Tests of src/modform/relation.hpp: the relation syntax and its error messages.
#include <catch2/catch.hpp>

#include "core/error.hpp"
#include "modform/relation.hpp"

using namespace circlet;

namespace {
std::string error_of(const std::string& text) {
  try {
    parse_relation(text);
  } catch (const UserError& e) {
    return e.what();
  }
  return "";
}
}  // namespace

TEST_CASE("relations parse into terms on one side", "[modform]") {
  LinearRelation r = parse_relation("c4(7n+2) = 2*sc7(8n+1) for n mod 7 != 4");
  REQUIRE(r.terms.size() == 2);
  CHECK(r.terms[0].family.name() == "c4");
  CHECK(r.terms[0].A == 7);
  CHECK(r.terms[0].B == 2);
  CHECK(r.terms[1].coeff == Fmpq(-2));
  CHECK(r.terms[1].family.name() == "sc7");
  CHECK(r.restricted);
  CHECK(r.complement);
  CHECK(r.Q == 7);
  CHECK(r.r == 4);
  CHECK(fmpz_is_zero(r.modulus));
  CHECK(r.str() == "c4(7n+2) - 2*sc7(8n+1) = 0 for n mod 7 != 4");

  LinearRelation c = parse_relation("c5(25n+24) == 0 (mod 5^2)");
  CHECK(c.modulus == Fmpz(25));
  CHECK(c.terms.size() == 1);
  CHECK(c.str() == "c5(25n+24) == 0 mod 25");

  LinearRelation s = parse_relation(" sc5( 2 n + 1 ) - sc5(n) = 0 ");
  CHECK(s.terms[1].A == 1);
  CHECK(s.terms[1].coeff == Fmpq(-1));
  LinearRelation q = parse_relation("1/2*c4(3n) = c4(3n) - 1/2 c4(3n)");
  CHECK(q.terms.size() == 3);
  CHECK(q.terms[0].coeff == Fmpq(1, 2));
  // the str() form parses back to the same relation
  CHECK(parse_relation(r.str()).str() == r.str());
}

TEST_CASE("bad relations are UserErrors naming the problem", "[modform]") {
  CHECK_THAT(error_of("c4(7n+2) 2*sc7(8n+1)"), Catch::Contains("expected '=' or '=='"));
  CHECK_THAT(error_of("c4(7n-2) = 0"), Catch::Contains("must be non-negative"));
  CHECK_THAT(error_of("c4(0n+2) = 0"), Catch::Contains("must be at least 1"));
  CHECK_THAT(error_of("x4(n) = 0"), Catch::Contains("unknown family 'x4'"));
  CHECK_THAT(error_of("c4(n = 0"), Catch::Contains("expected ')'"));
  CHECK_THAT(error_of("c4(2) = 0"), Catch::Contains("must be A n + B"));
  CHECK_THAT(error_of("c5(5n+4) == 0 mod 1"), Catch::Contains("at least 2"));
  CHECK_THAT(error_of("c5(5n+4) == 0 mod 5 for n mod 7 != 9"), Catch::Contains("must be below Q"));
  CHECK_THAT(error_of("1/2*c5(5n+4) == 0 mod 5"), Catch::Contains("integer coefficients"));
  CHECK_THAT(error_of("0 = 0"), Catch::Contains("no family term"));
  CHECK_THAT(error_of("c5(5n+4) = 0 junk"), Catch::Contains("unexpected text"));
  CHECK_THAT(error_of("c5(5n+4) = 1/0*c5(n)"), Catch::Contains("denominator 0"));
  CHECK_THAT(error_of("c5(5n+4) == 0 mod 99999999999999999999"), Catch::Contains("below 2^62"));
  CHECK_THAT(error_of(""), Catch::Contains("expected a family term"));
}
