// Tests for src/arcs/certified_bound.hpp.
#include "arcs/certified_bound.hpp"

#include <flint/fmpq.h>

#include <catch2/catch.hpp>
#include <vector>

#include "arcs_cm_form.hpp"

using namespace circlet;

TEST_CASE("divisor counts", "[arcs][certified]") {
  CHECK(divisor_count(Fmpz(1)) == Fmpz(1));
  CHECK(divisor_count(Fmpz(12)) == Fmpz(6));
  CHECK(divisor_count(Fmpz(49)) == Fmpz(3));
  CHECK(divisor_count(Fmpz(720720)) == Fmpz(240));  // 2^4·3^2·5·7·11·13: 5·3·2·2·2·2
}

TEST_CASE("only c7 has a certified bound, stated with its source", "[arcs][certified]") {
  CHECK(certified_remainder_bound(Family::parse("c9")) == nullptr);
  CHECK(certified_remainder_bound(Family::parse("sc7")) == nullptr);
  auto b = certified_remainder_bound(Family::parse("c7"));
  REQUIRE(b != nullptr);
  CHECK(b->statement() == "|E(n)| <= d(n+2)(n+2)/8");
  CHECK(b->source().find("eta(7 tau)^3") != std::string::npos);
  CHECK(b->bound(Fmpz(10)) == Fmpq(6 * 12, 8));  // d(12) = 6
}

TEST_CASE("the c7 bound dominates |a(n+2)|/8 for the CM coefficients", "[arcs][certified]") {
  // a(m) from the product q Π(1 − q^k)^3(1 − q^{7k})^3, expanded independently.
  const long N = 3000;
  const std::vector<long> a = cm_form_7_coefficients(N);
  CHECK(a[1] == 1);
  CHECK(a[2] == -3);  // q(1 − 3q + ...)
  auto b = certified_remainder_bound(Family::parse("c7"));
  long tight = 0;
  for (long n = 0; n + 2 <= N; ++n) {
    Fmpq e(std::labs(a[n + 2]), 8);
    Fmpq bn = b->bound(Fmpz(n));
    INFO("n=" << n);
    CHECK(fmpq_cmp(e.get(), bn.get()) <= 0);
    if (e == bn) ++tight;
  }
  // The bound is attained at m = p with a(p) = ±2p? Not for this form
  // (a(p) = ±2p would need π/π̄ real); record that it is never attained.
  CHECK(tight == 0);
}
