// Tests for src/arcs/arc_terms.hpp.
#include "arcs/arc_terms.hpp"

#include <flint/fmpq.h>

#include <algorithm>
#include <catch2/catch.hpp>

#include "mainterm/main_term.hpp"
#include "quadratic/local_density.hpp"
#include "quadratic/model.hpp"
#include "series/eta_series.hpp"

using namespace circlet;

namespace {

Fmpq abs_tail(const std::vector<Fmpq>& c, ulong from, ulong to) {  // Σ_{from < k ≤ to} |c_{k−1}|
  Fmpq s, a;
  for (ulong k = from + 1; k <= to; ++k) {
    fmpq_abs(a.get(), c[k - 1].get());
    fmpq_add(s.get(), s.get(), a.get());
  }
  return s;
}

}  // namespace

TEST_CASE("the k = 1 term is the singular integral and partial sums accumulate the terms", "[arcs][terms]") {
  const auto model = quadratic_model(Family::parse("c9"));
  ArcExpansion e = arc_expansion(model, Fmpz(1000), 12, 128);
  REQUIRE(e.terms.size() == 12);
  CHECK(e.terms[0].coefficient == Fmpq(1));
  CHECK(arb_overlaps(e.terms[0].term.get(), e.singular_integral.get()));
  Arb s;
  for (const auto& t : e.terms) arb_add(s.get(), s.get(), t.term.get(), 128);
  CHECK(arb_overlaps(s.get(), e.terms.back().partial_sum.get()));
  CHECK(arb_is_finite(e.enclosure.get()));
  // Each per-k tail bound covers the later terms that were computed.
  for (size_t i = 0; i < e.terms.size(); ++i) {
    Arb later, a;
    for (size_t j = i + 1; j < e.terms.size(); ++j) {
      arb_abs(a.get(), e.terms[j].term.get());
      arb_add(later.get(), later.get(), a.get(), 128);
    }
    INFO("k=" << i + 1);
    CHECK(arb_le(later.get(), e.terms[i].tail_bound.get()));
  }
}

TEST_CASE("the tail bound really bounds: T(K) >= sum over K < k <= 4K", "[arcs][terms][tail]") {
  for (const char* f : {"c5", "c6", "c7", "c9", "sc9", "sc17", "sq5", "sq8"}) {
    const auto model = quadratic_model(Family::parse(f));
    for (long n : {1L, 24L, 1000L}) {
      const ulong K = 25;
      const auto coeffs = arc_coefficients(model, Fmpz(n), 4 * K);
      std::vector<Fmpq> first(coeffs.begin(), coeffs.begin() + K);
      ArcTailBound T = arc_tail_bound(model, Fmpz(n), first, 128);
      Arb actual;
      arb_set_fmpq(actual.get(), abs_tail(coeffs, K, 4 * K).get(), 128);
      INFO(f << " n=" << n << " T=" << T.coefficient_tail.str() << " actual(K..4K)=" << actual.str());
      CHECK(arb_is_finite(T.coefficient_tail.get()));
      CHECK(arb_le(actual.get(), T.coefficient_tail.get()));
      // And it is not absurdly loose: within a factor 50 of the next 3K terms plus a
      // K^{1−s} allowance for what lies beyond 4K.
      Arb loose;
      arb_set_ui(loose.get(), 50);
      Arb allowance;
      arb_set_ui(allowance.get(), 4 * K);
      arb_pow_ui(allowance.get(), allowance.get(), T.decay - 1, 128);
      arb_inv(allowance.get(), allowance.get(), 128);
      arb_mul_ui(allowance.get(), allowance.get(), 10, 128);
      arb_add(actual.get(), actual.get(), allowance.get(), 128);
      arb_mul(loose.get(), loose.get(), actual.get(), 128);
      CHECK(arb_le(T.coefficient_tail.get(), loose.get()));
    }
  }
}

TEST_CASE("no tail bound at rank <= 3", "[arcs][terms][tail]") {
  const auto model = quadratic_model(Family::parse("sc7"));
  ArcTailBound T = arc_tail_bound(model, Fmpz(10), arc_coefficients(model, Fmpz(10), 5), 64);
  CHECK(arf_is_pos_inf(arb_midref(T.coefficient_tail.get())));
  CHECK(T.method.find("does not converge absolutely") != std::string::npos);
}

TEST_CASE("partial sums plus the tail bound contain the exact count where there is no cusp part",
          "[arcs][terms][containment]") {
  // c_5 and r_S for S = 5..8 equal their main terms (docs/MATH.md §3; for r_S, S ≤ 8,
  // the space of cusp forms of the relevant level and weight is trivial).
  for (const char* f : {"c5", "sq5", "sq6", "sq7", "sq8"}) {
    const auto model = quadratic_model(Family::parse(f));
    IntegerSeries counts = family_series(model.family, 400);
    for (long n : {1L, 12L, 100L, 391L}) {
      ArcExpansion e = arc_expansion(model, Fmpz(n), 30, 128);
      Arb c;
      arb_set_fmpz(c.get(), counts.value(n).get());
      INFO(f << " n=" << n << " enclosure=" << e.enclosure.str() << " count=" << counts.value(n).str());
      CHECK(arb_contains(e.enclosure.get(), c.get()));
    }
  }
}

TEST_CASE("partial sums plus the tail bound contain the main term of src/mainterm", "[arcs][terms][containment]") {
  for (const char* f : {"c6", "c7", "c9", "sc9", "sc11", "sc17"}) {
    const auto model = quadratic_model(Family::parse(f));
    for (long n : {3L, 101L, 1000L}) {
      MainTerm M = main_term(model, Fmpz(n), 128);
      for (ulong K : {5UL, 40UL}) {
        ArcExpansion e = arc_expansion(model, Fmpz(n), K, 128);
        INFO(f << " n=" << n << " K=" << K << " enclosure=" << e.enclosure.str() << " M=" << M.ball.str());
        CHECK(arb_overlaps(e.enclosure.get(), M.ball.get()));
        if (M.exact) {
          Arb m;
          arb_set_fmpq(m.get(), M.exact->get(), 128);
          CHECK(arb_contains(e.enclosure.get(), m.get()));
        }
      }
    }
  }
}

TEST_CASE("arc_expansion rejects K = 0 and X <= 0 with a clear message", "[arcs][terms][errors]") {
  const auto model = quadratic_model(Family::parse("c5"));
  CHECK_THROWS_WITH(arc_expansion(model, Fmpz(5), 0, 64), "--upto must be at least 1");
  CHECK_THROWS_WITH(arc_expansion(model, Fmpz(-5), 3, 64), Catch::Contains("is not positive"));
}

TEST_CASE("a prime factor of X beyond the cut-off is taken exactly", "[arcs][terms][tail]") {
  // c_9: X = n + 10/3 = (3n + 10)/3; n = 333331 gives the prime 1000003 > P₀ = 10^5.
  const auto model = quadratic_model(Family::parse("c9"));
  const Fmpz n(333331);
  const auto coeffs = arc_coefficients(model, n, 100);
  std::vector<Fmpq> first(coeffs.begin(), coeffs.begin() + 25);
  ArcTailBound T = arc_tail_bound(model, n, first, 128);
  CHECK(T.prime_cutoff == 100000);
  CHECK(std::find(T.special_primes.begin(), T.special_primes.end(), Fmpz(1000003)) != T.special_primes.end());
  Arb actual;
  arb_set_fmpq(actual.get(), abs_tail(coeffs, 25, 100).get(), 128);
  CHECK(arb_le(actual.get(), T.coefficient_tail.get()));
}

TEST_CASE("arcs and main terms handle prime factors of X beyond a machine word", "[arcs][terms][containment]") {
  // n = 10^27: X = n + 2 for c7 has the prime factor 1312335958005249343832021 (> 2^64),
  // seen in `circlet main c7 --at 10^27 --explain`; c6 (odd rank) takes the ball route.
  const Fmpz n = Fmpz::from_str("1000000000000000000000000000");
  for (const char* f : {"c7", "c6", "c9"}) {
    const auto model = quadratic_model(Family::parse(f));
    MainTerm M = main_term(model, n, 128);
    ArcExpansion e = arc_expansion(model, n, 30, 128);
    INFO(f << " enclosure=" << e.enclosure.str() << " M=" << M.ball.str());
    CHECK(arb_is_finite(M.ball.get()));
    CHECK(arb_overlaps(e.enclosure.get(), M.ball.get()));
    if (M.exact) {
      Arb m;
      arb_set_fmpq(m.get(), M.exact->get(), 128);
      CHECK(arb_contains(e.enclosure.get(), m.get()));
    }
  }
  const auto c7 = quadratic_model(Family::parse("c7"));
  const auto special = local_density_special_primes(c7, n);
  CHECK(std::find(special.begin(), special.end(), Fmpz::from_str("1312335958005249343832021")) != special.end());
}
