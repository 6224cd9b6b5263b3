#include "progression/tail_bound.hpp"

#include <catch2/catch.hpp>

#include "progression/progression_pair.hpp"
#include "quadratic/local_density.hpp"

using namespace circlet;

TEST_CASE("the per-prime bound holds for beta_q at every valuation (counting mod q^j)", "[progression][tail]") {
  // |β_q − 1| ≤ δ_q for q ∤ 2t, v_q(X) = 0, 1, 2, 3, both families of the pair.
  for (const char* name : {"c6", "sc11", "c7", "sc13", "c8", "sc15"}) {
    QuadraticModel m = quadratic_model(Family::parse(name));
    for (ulong q : {5UL, 11UL, 13UL}) {
      if (m.family.t % static_cast<long>(q) == 0) continue;
      Arb delta;
      tail_prime_bound(delta, m.rank, q, 128);
      for (long v = 0; v <= 3; ++v)
        for (long unit : {1L, 2L}) {
          // n with X = n + Δ = q^v·unit·(something ≡ unit) : n = q^v·(unit + q·3) − Δ when Δ is an integer.
          if (!fmpz_is_one(fmpq_denref(m.delta.get()))) continue;
          Fmpz qv;
          fmpz_ui_pow_ui(qv, q, static_cast<ulong>(v));
          Fmpz n;
          fmpz_mul_si(n, qv, unit + 3 * static_cast<long>(q));
          fmpz_sub(n, n, fmpq_numref(m.delta.get()));
          Fmpq beta = local_density_by_counting(m, n, q, local_density_stable_exponent(m, n, q));
          Fmpq diff;
          fmpq_sub_si(diff, beta, 1);
          fmpq_abs(diff, diff);
          Arb d;
          arb_set_fmpq(d, diff, 128);
          INFO(name << " q = " << q << " v = " << v << " beta = " << beta.str());
          CHECK(arb_le(d, delta));
        }
    }
  }
}

TEST_CASE("the tail bound decreases with Q, agrees across precisions, needs weight > 2", "[progression][tail]") {
  CHECK_FALSE(tail_converges(4));
  CHECK_FALSE(tail_converges(3));
  CHECK(tail_converges(5));
  for (int r : {5, 6, 7, 11}) {
    Arb s3, s5, s3hi;
    tail_log_bound(s3, r, 3, 2000, 128);
    tail_log_bound(s5, r, 5, 2000, 128);
    tail_log_bound(s3hi, r, 3, 2000, 256);
    CHECK(arb_is_finite(s3));
    CHECK(arb_gt(s3, s5));
    CHECK(arb_is_positive(s5));
    CHECK((arb_overlaps(s3, s3hi) || arb_gt(s3, s3hi)));
    // Σ_{q>3} δ_q ≥ δ_5 alone: S ≥ log((1+δ_5)/(1−δ_5)) ≥ 2δ_5.
    Arb d5;
    tail_prime_bound(d5, r, 5, 128);
    arb_mul_2exp_si(d5, d5, 1);
    CHECK(arb_gt(s3, d5));
    // More explicit primes give a smaller (better) bound.
    Arb s3b;
    tail_log_bound(s3b, r, 3, 20000, 128);
    CHECK(arb_le(s3b, s3));
  }
  // For weight 5/2 the sum Σ_{q>Q} 2q^{−2} is about 2/(Q log Q): the bound at Q = 3 is below 0.5.
  Arb s;
  tail_log_bound(s, 5, 3, 20000, 128);
  CHECK(arf_cmpabs_2exp_si(arb_midref(s.get()), -1) < 0);
}
