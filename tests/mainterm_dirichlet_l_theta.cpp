// Tests for src/mainterm/dirichlet_l_theta.hpp: the theta route against the
// Bernoulli route (exactly), Siegel's divisor sums (exactly), Arb's
// acb_dirichlet_l and PARI/GP's lfun (containment).
#include "mainterm/dirichlet_l_theta.hpp"

#include <catch2/catch.hpp>
#include <sstream>
#include <string>
#include <vector>

#include "mainterm/dirichlet_l.hpp"
#include "mainterm_dirichlet_reference.hpp"
#include "mainterm_gp.hpp"

using namespace circlet;

namespace {

// Fundamental discriminants d with 1 < |d| ≤ bound and χ_d(−1) = (−1)^k.
std::vector<slong> fundamentals(slong bound, ulong k) {
  std::vector<slong> out;
  for (slong d = -bound; d <= bound; ++d) {
    if (d == 0 || d == 1 || d == -1) continue;
    if ((d < 0) != (k % 2 == 1)) continue;
    if (is_fundamental_discriminant(Fmpz(d))) out.push_back(d);
  }
  return out;
}

}  // namespace

TEST_CASE("theta route: R equals the Bernoulli route exactly for every small conductor, k = 2..8",
          "[mainterm][dirichlet_l_theta]") {
  for (ulong k = 2; k <= 8; ++k) {
    for (slong d : fundamentals(k <= 4 ? 400 : 120, k)) {
      INFO("d = " << d << ", k = " << k);
      const std::optional<Fmpq> R = dirichlet_l_rational_theta(Fmpz(d), k, 1);
      REQUIRE(R.has_value());
      REQUIRE(*R == dirichlet_l_rational(Fmpz(d), k));
    }
  }
}

TEST_CASE("theta route: R equals the Bernoulli route at conductors 10^4..2·10^6, both signs, two threads",
          "[mainterm][dirichlet_l_theta]") {
  struct Case {
    slong d;
    ulong k;
  };
  // Prime, composite, and even (d ≡ 0 mod 4 and mod 8) conductors; each fundamental (checked).
  const std::vector<Case> cases = {{-10007, 3}, {-40004, 3}, {10009, 2}, {40008, 4}, {-99995, 5},
                                   {100005, 6}, {-1000003, 3}, {2000005, 2}, {-400003, 7}, {200009, 8}};
  for (const Case& c : cases) {
    INFO("d = " << c.d << ", k = " << c.k);
    REQUIRE(is_fundamental_discriminant(Fmpz(c.d)));
    const std::optional<Fmpq> R = dirichlet_l_rational_theta(Fmpz(c.d), c.k, 2);
    REQUIRE(R.has_value());
    CHECK(*R == dirichlet_l_rational(Fmpz(c.d), c.k));
  }
}

TEST_CASE("theta route: L(2, χ) equals Siegel's divisor sums at conductor 10^9 + 1", "[mainterm][dirichlet_l_theta]") {
  // Two independent exact routes at a conductor the Bernoulli sum does not reach cheaply.
  const Fmpz d(1000000001);
  REQUIRE(is_fundamental_discriminant(d));
  const std::optional<Fmpq> R = dirichlet_l_rational_theta(d, 2);
  REQUIRE(R.has_value());
  CHECK(*R == dirichlet_l2_rational_divisor_sums(d));
}

TEST_CASE("theta route: balls at two precisions overlap, reach their accuracy and contain acb_dirichlet_l",
          "[mainterm][dirichlet_l_theta]") {
  for (slong d : {-3L, -4L, 5L, 8L, -23L, -84L, 105L, -163L, 229L}) {
    for (ulong k : {2UL, 3UL, 4UL, 5UL, 6UL}) {
      if ((d < 0) != (k % 2 == 1)) continue;
      INFO("d = " << d << ", k = " << k);
      Arb lo, hi, ref;
      dirichlet_l_theta(lo, Fmpz(d), k, 80);
      dirichlet_l_theta(hi, Fmpz(d), k, 200);
      CHECK(arb_rel_accuracy_bits(lo) >= 80);
      CHECK(arb_rel_accuracy_bits(hi) >= 200);
      CHECK(arb_overlaps(lo, hi));
      CHECK(arb_contains(lo, hi));
      REQUIRE(testing::arb_reference_l(ref, d, k, 260));
      CHECK(arb_overlaps(hi, ref));
    }
  }
}

TEST_CASE("theta route: the term count grows like sqrt(f) and is stated before the work",
          "[mainterm][dirichlet_l_theta]") {
  const double t8 = dirichlet_l_theta_terms(Fmpz(-400000003), 3);
  const double t10 = dirichlet_l_theta_terms(Fmpz(-40000000003L), 3);
  CHECK(t8 > 1e5);
  // 100 times the conductor: about 10 times the terms (and a little more for the extra digits).
  CHECK(t10 / t8 > 9);
  CHECK(t10 / t8 < 13);
}

namespace {

void check_against_gp(const std::vector<std::pair<slong, ulong>>& cases) {
  if (!testing::gp_available()) {
    WARN("gp not on PATH: PARI/GP comparison skipped");
    return;
  }
  // Script: lfun(lfuncreate(d), k) at realprecision 45 (lfuncreate(d) is the Kronecker character (d/.)).
  std::ostringstream script;
  script << "default(realprecision, 45);\n";
  for (const auto& [d, k] : cases) script << "print(lfun(lfuncreate(" << d << ")," << k << "));\n";
  std::istringstream out(testing::gp_run(script.str()));
  for (const auto& [d, k] : cases) {
    std::string line;
    REQUIRE(std::getline(out, line));
    REQUIRE(is_fundamental_discriminant(Fmpz(d)));
    const std::optional<Fmpq> R = dirichlet_l_rational_theta(Fmpz(d), k);
    REQUIRE(R.has_value());
    Arb ours, ref;
    dirichlet_l_from_rational(ours, *R, Fmpz(d), k, 200);
    testing::gp_decimal_ball(ref, line);
    INFO("d = " << d << ", k = " << k << ", gp: " << line << ", ours: " << ours.str(45));
    CHECK(arb_overlaps(ours, ref));
  }
}

}  // namespace

TEST_CASE("theta route: exact L(k, χ) lies in PARI/GP's lfun at conductors 4·10^8 and 4·10^9",
          "[mainterm][dirichlet_l_theta][gp]") {
  check_against_gp({{-400000003, 3}, {400000001, 4}, {-4000000003L, 5}});
}

TEST_CASE("theta route: exact L(3, χ) lies in PARI/GP's lfun at conductor 4·10^10", "[mainterm][dirichlet_l_theta][gp][slow]") {
  check_against_gp({{-40000000003L, 3}, {40000000001L, 4}});
}
