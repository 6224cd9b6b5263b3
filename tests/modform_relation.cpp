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

TEST_CASE("dilated terms F(A(n-j)/d + B) parse and are written back canonically", "[modform]") {
  LinearRelation r = parse_relation("c4(7n+2) = 2*sc7(8n+1) + c4((n-4)/7)");
  REQUIRE(r.terms.size() == 3);
  const RelationTerm& t = r.terms[2];
  CHECK(t.family.name() == "c4");
  CHECK(t.coeff == Fmpq(-1));
  CHECK(t.A == 1);
  CHECK(t.B == 0);
  CHECK(t.d == 7);
  CHECK(t.j == 4);
  CHECK(t.dilated());
  CHECK_FALSE(r.terms[0].dilated());
  // the value's argument: n = 7k + 4 gives k; other n give no term (-1)
  CHECK(t.argument(4) == 0);
  CHECK(t.argument(25) == 3);
  CHECK(t.argument(5) == -1);
  CHECK(r.terms[0].argument(3) == 23);
  CHECK(r.str() == "c4(7n+2) - 2*sc7(8n+1) - c4((n-4)/7) = 0");
  CHECK(parse_relation(r.str()).str() == r.str());

  LinearRelation s = parse_relation("3*sc7( 8 * ( n - 4 ) / 7 + 1 ) = sq1(2n) - 1/2 c4(n/3) - c4(5n/2+1) for n mod 7 = 4");
  REQUIRE(s.terms.size() == 4);
  CHECK(s.terms[0].A == 8);
  CHECK(s.terms[0].B == 1);
  CHECK(s.terms[0].d == 7);
  CHECK(s.terms[0].j == 4);
  CHECK(s.terms[2].d == 3);
  CHECK(s.terms[2].j == 0);
  CHECK(s.terms[3].A == 5);
  CHECK(s.terms[3].d == 2);
  CHECK(s.terms[3].B == 1);
  CHECK(s.str() == "3*sc7(8(n-4)/7+1) - sq1(2n) + 1/2*c4(n/3) + c4(5n/2+1) = 0 for n mod 7 = 4");
  CHECK(parse_relation(s.str()).str() == s.str());
  // (n-0)/d is written n/d
  CHECK(parse_relation("c4((n-0)/7) = 0").str() == "c4(n/7) = 0");
}

TEST_CASE("bad dilated terms are UserErrors naming the problem", "[modform]") {
  CHECK_THAT(error_of("c4((n-4)/1) = 0"), Catch::Contains("d in c4(A(n-j)/d + B) must be at least 2"));
  CHECK_THAT(error_of("c4(n/1) = 0"), Catch::Contains("must be at least 2"));
  CHECK_THAT(error_of("c4((n-7)/7) = 0"), Catch::Contains("j in c4(A(n-j)/d + B) must be below d"));
  CHECK_THAT(error_of("c4((n+3)/7) = 0"), Catch::Contains("written (n-j)/d with 0 <= j < d"));
  CHECK_THAT(error_of("c4((n-4) = 0"), Catch::Contains("expected '/d' after (n-j)"));
  CHECK_THAT(error_of("c4((n-4/7) = 0"), Catch::Contains("expected ')' after n-j"));
  CHECK_THAT(error_of("c4((m-4)/7) = 0"), Catch::Contains("expected 'n' after '('"));
  CHECK_THAT(error_of("c4((n-4)/) = 0"), Catch::Contains("expected a non-negative integer for d in"));
  CHECK_THAT(error_of("c4((n-4)/7-1) = 0"), Catch::Contains("must be non-negative"));
  CHECK_THAT(error_of("c4(0(n-4)/7) = 0"), Catch::Contains("must be at least 1"));
}
