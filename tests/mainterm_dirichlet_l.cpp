// Tests for src/mainterm/dirichlet_l.hpp.
#include "mainterm/dirichlet_l.hpp"

#include <catch2/catch.hpp>
#include <sstream>

#include "mainterm_dirichlet_reference.hpp"
#include "mainterm_gp.hpp"

using namespace circlet;

TEST_CASE("kronecker symbol: small table and agreement with FLINT", "[mainterm][dirichlet_l]") {
  // (−4/n) = 0, 1, 0, −1 for n ≡ 0..3 (mod 4); (5/2) = −1; (−7/2) = 1; (8/3) = −1.
  CHECK(kronecker_symbol(-4, 1) == 1);
  CHECK(kronecker_symbol(-4, 2) == 0);
  CHECK(kronecker_symbol(-4, 3) == -1);
  CHECK(kronecker_symbol(5, 2) == -1);
  CHECK(kronecker_symbol(-7, 2) == 1);
  CHECK(kronecker_symbol(8, 3) == -1);
  for (slong d : {-163, -84, -23, -8, -7, -4, -3, 5, 8, 12, 13, 60, 1001})
    for (ulong n = 1; n < 300; ++n) {
      INFO("d = " << d << ", n = " << n);
      CHECK(kronecker_symbol(d, n) == kronecker_symbol(Fmpz(d), Fmpz((slong)n)));
    }
}

TEST_CASE("fundamental discriminants of Q(sqrt D)", "[mainterm][dirichlet_l]") {
  CHECK(fundamental_discriminant(Fmpq(-1)) == Fmpz(-4));
  CHECK(fundamental_discriminant(Fmpq(-3)) == Fmpz(-3));
  CHECK(fundamental_discriminant(Fmpq(-12)) == Fmpz(-3));
  CHECK(fundamental_discriminant(Fmpq(18)) == Fmpz(8));
  CHECK(fundamental_discriminant(Fmpq(49)) == Fmpz(1));
  // −1458·35/24 = −(3^5·35)/4 → squarefree kernel −3·35 = −105 ≡ 3 (mod 4) → d0 = −420.
  CHECK(fundamental_discriminant(Fmpq(-1458 * 35, 24)) == Fmpz(-420));
  CHECK(is_fundamental_discriminant(Fmpz(-420)));
  CHECK(!is_fundamental_discriminant(Fmpz(-12)));
  CHECK(!is_fundamental_discriminant(Fmpz(-105)));
  CHECK(discriminant_cofactor(Fmpq(-12), Fmpz(-3)) == Fmpq(2));
  CHECK(discriminant_cofactor(Fmpq(-1458 * 35, 24), Fmpz(-420)) == Fmpq(9, 4));  // 8505/4 = 420·(9/4)²
}

TEST_CASE("exact L-values: classical closed forms", "[mainterm][dirichlet_l]") {
  // From memory (standard): L(1,χ_{−4}) = π/4, L(1,χ_{−3}) = π/(3√3), ζ(2) = π²/6,
  // L(2,χ_5) = 4π²/(25√5), L(3,χ_{−4}) = π³/32. With L = R π^k/sqrt(f):
  CHECK(dirichlet_l_rational(Fmpz(-4), 1) == Fmpq(1, 2));
  CHECK(dirichlet_l_rational(Fmpz(-3), 1) == Fmpq(1, 3));
  CHECK(dirichlet_l_rational(Fmpz(1), 2) == Fmpq(1, 6));
  CHECK(dirichlet_l_rational(Fmpz(5), 2) == Fmpq(4, 25));
  CHECK(dirichlet_l_rational(Fmpz(-4), 3) == Fmpq(1, 16));
  CHECK(zeta_even_rational(1) == Fmpq(1, 6));
  CHECK(zeta_even_rational(2) == Fmpq(1, 90));
  CHECK(zeta_even_rational(3) == Fmpq(1, 945));
  // Class number formula h(d) = −(w/2) B_{1,χ}: h(−23) = 3, h(−163) = 1 (w = 2).
  CHECK(generalised_bernoulli(Fmpz(-23), 1) == Fmpq(-3));
  CHECK(generalised_bernoulli(Fmpz(-163), 1) == Fmpq(-1));
}

TEST_CASE("exact L-values lie in acb_dirichlet_l balls", "[mainterm][dirichlet_l]") {
  slong prec = 128;
  for (slong d : {-3, -4, -7, -8, -15, -20, -23, -24, -39, -84, -163, 1, 5, 8, 12, 13, 17, 21, 24, 28, 60, 105})
    for (ulong k = 1; k <= 7; ++k) {
      if ((d > 0) != (k % 2 == 0)) continue;
      if (d == 1 && k == 1) continue;
      Arb exact, ref;
      dirichlet_l_from_rational(exact, dirichlet_l_rational(Fmpz(d), k), Fmpz(d), k, prec);
      REQUIRE(testing::arb_reference_l(ref, d, k, prec));
      INFO("d = " << d << ", k = " << k << ": " << exact.str() << " vs " << ref.str());
      CHECK(arb_overlaps(exact, ref));
      CHECK(arb_rel_accuracy_bits(exact) > prec - 10);
    }
}

TEST_CASE("Euler-product balls contain the exact value; two precisions overlap", "[mainterm][dirichlet_l]") {
  for (slong d : {-7, -23, 5, 12, -420, 1})
    for (ulong k = 2; k <= 6; ++k) {
      if ((d > 0) != (k % 2 == 0)) continue;
      Arb exact, lo, hi;
      dirichlet_l_from_rational(exact, dirichlet_l_rational(Fmpz(d), k), Fmpz(d), k, 200);
      dirichlet_l_euler(lo, Fmpz(d), k, 1000, 64);
      dirichlet_l_euler(hi, Fmpz(d), k, 100000, 128);
      INFO("d = " << d << ", k = " << k);
      CHECK(arb_contains(lo, exact));
      CHECK(arb_contains(hi, exact));
      CHECK(arb_overlaps(lo, hi));
      // accuracy floor: the tail bound ε ≈ 1.26 k/((k−1) log P) P^{1−k}
      CHECK(arb_rel_accuracy_bits(hi) >= (slong)(16.6 * (k - 1)) - 4);
    }
}

TEST_CASE("automatic L-value: exact below the conductor limit, Euler product above", "[mainterm][dirichlet_l]") {
  Arb a, b;
  dirichlet_l(a, Fmpz(-420), 3, 100, 1000000);
  dirichlet_l(b, Fmpz(-420), 3, 60, 100);  // forced onto the Euler product
  CHECK(arb_contains(b, a));
  dirichlet_l(b, Fmpz(-420), 1, 60, 100);  // k = 1 beyond the limit: indeterminate, not wrong
  CHECK(!arb_is_finite(b));
}

TEST_CASE("exact L-values agree with PARI/GP lfun", "[mainterm][dirichlet_l][gp]") {
  if (!testing::gp_available()) {
    WARN("gp not on PATH: PARI/GP comparison skipped");
    return;
  }
  // Script: for each (d, k), print lfun(d, k) to 45 digits (lfuncreate(D) is the Kronecker character (D/.)).
  struct Case { slong d; ulong k; };
  std::vector<Case> cases = {{-3, 1}, {-23, 1}, {-20, 3}, {5, 2}, {13, 4}, {-1000003 * 4 + 1, 1}, {1, 4}, {-84, 5}, {8, 2}};
  std::ostringstream script;
  script << "default(realprecision, 45);\n";
  for (auto c : cases) script << "print(lfun(" << c.d << "," << c.k << "));\n";
  std::istringstream out(testing::gp_run(script.str()));
  for (auto c : cases) {
    std::string line;
    REQUIRE(std::getline(out, line));
    Fmpz d(c.d);
    if (!is_fundamental_discriminant(d)) continue;
    Arb exact, ref;
    dirichlet_l_from_rational(exact, dirichlet_l_rational(d, c.k), d, c.k, 160);
    testing::gp_decimal_ball(ref, line);
    INFO("d = " << c.d << ", k = " << c.k << ", gp: " << line << ", ours: " << exact.str(40));
    CHECK(arb_overlaps(exact, ref));
  }
}

TEST_CASE("generalised Bernoulli numbers: the 128-bit and the big-integer sums agree", "[mainterm][dirichlet_l]") {
  // k large enough that f^{k+1} ≥ 2^120 takes the FLINT-integer path; the value
  // must still match acb_dirichlet_l, as the 128-bit path does for small k.
  for (slong d : {-23, 13, -84}) {
    for (ulong k : {1UL, 2UL, 3UL, 24UL, 25UL, 26UL}) {
      if ((d > 0) != (k % 2 == 0)) continue;
      Arb exact, ref;
      dirichlet_l_from_rational(exact, dirichlet_l_rational(Fmpz(d), k), Fmpz(d), k, 128);
      REQUIRE(testing::arb_reference_l(ref, d, k, 128));
      INFO("d = " << d << ", k = " << k);
      CHECK(arb_overlaps(exact, ref));
    }
  }
}

TEST_CASE("the Kronecker symbol at a prime agrees with FLINT's for discriminants beyond a word",
          "[mainterm][dirichlet]") {
  // Reference: fmpz_kronecker (FLINT), an independent implementation.
  Fmpz big = Fmpz::from_str("-1312335958005249343832021123456789");
  for (const Fmpz& d : {big, Fmpz(-7), Fmpz(5), Fmpz(-4), Fmpz(8), Fmpz::from_str("98765432109876543210987")}) {
    n_primes_t it;
    n_primes_init(it);
    for (ulong p = n_primes_next(it); p < 2000; p = n_primes_next(it))
      CHECK(kronecker_symbol_prime(d, p) == fmpz_kronecker(d.get(), Fmpz::from_ui(p).get()));
    n_primes_clear(it);
  }
}

TEST_CASE("L(2, χ) by Siegel's divisor sums equals the Bernoulli sum", "[mainterm][dirichlet_l]") {
  // Two independent exact routes: the divisor-sum sieve and B_{2,χ} = f Σ χ(a) B_2(a/f).
  // d = 5: B_{2,χ} = 4/5, R = 4/25 (Σ_{a=1}^{5} χ(a) a²/5 = (1 − 4 − 9 + 16)/5, by hand).
  CHECK(dirichlet_l2_rational_divisor_sums(Fmpz(5)) == Fmpq(4, 25));
  int tested = 0;
  for (slong d = 2; d <= 4000; ++d) {
    if (!is_fundamental_discriminant(Fmpz(d))) continue;
    INFO("d = " << d);
    REQUIRE(dirichlet_l2_rational_divisor_sums(Fmpz(d)) == dirichlet_l_rational(Fmpz(d), 2));
    ++tested;
  }
  CHECK(tested > 1000);
  for (slong d : {1000005L, 8000009L}) {
    if (!is_fundamental_discriminant(Fmpz(d))) continue;
    INFO("d = " << d);
    CHECK(dirichlet_l2_rational_divisor_sums(Fmpz(d)) == dirichlet_l_rational(Fmpz(d), 2));
  }
}

TEST_CASE("L(2, χ) by divisor sums lies in PARI/GP's lfun at conductors 10^11 and 7.2·10^13 (the two-thread sieve)",
          "[mainterm][dirichlet_l][gp][slow]") {
  if (!testing::gp_available()) {
    WARN("gp not on PATH: PARI/GP comparison skipped");
    return;
  }
  // Script: lfun(lfuncreate(d), 2) at realprecision 45 (d fundamental, checked below).
  const std::vector<slong> ds = {100000000005L, 72000000000105L};
  std::ostringstream script;
  script << "default(realprecision, 45);\n";
  for (slong d : ds) script << "print(lfun(lfuncreate(" << d << "),2));\n";
  std::istringstream out(testing::gp_run(script.str()));
  for (slong d : ds) {
    std::string line;
    REQUIRE(std::getline(out, line));
    REQUIRE(is_fundamental_discriminant(Fmpz(d)));
    Arb exact, ref;
    dirichlet_l_from_rational(exact, dirichlet_l2_rational_divisor_sums(Fmpz(d)), Fmpz(d), 2, 160);
    testing::gp_decimal_ball(ref, line);
    INFO("d = " << d << ", gp: " << line << ", ours: " << exact.str(40));
    CHECK(arb_overlaps(exact, ref));
  }
}
