#include "progression/tail_bound.hpp"

#include <catch2/catch.hpp>

#include "progression/progression_pair.hpp"
#include "quadratic/local_density.hpp"

#include <map>
#include <vector>

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

namespace {
// The tail bound against brute force: β_q(N) for every residue N mod q^j with
// stabilisation exponent ≤ j, read off one table of counts N_j mod q^j
// (docs/MATH.md §4: N_{j'}/q^{j'(r−1)} = β_q for all j' ≥ the stable exponent), against
// δ_q of tail_prime_bound (docs/MATH.md §7.2). Families of weight > 2 (the only ones
// whose tail is bounded), q = 5..31.
struct TailCase {
  const char* family;
  ulong q;
  int j;
};

void check_tail_bound_by_counting(const std::vector<TailCase>& cases) {
  std::map<int, std::vector<std::pair<Fmpq, Fmpq>>> range_by_rank_q;  // (rank·1000 + q) -> min, max β
  for (const auto& c : cases) {
    QuadraticModel m = quadratic_model(Family::parse(c.family));
    REQUIRE(tail_converges(m.rank));
    Arb delta;
    tail_prime_bound(delta, m.rank, c.q, 128);
    {
      Arb one;
      arb_one(one);
      REQUIRE(arb_lt(delta, one));
    }
    const std::vector<Fmpz> table = local_value_counts(m, c.q, c.j);
    const ulong qj = table.size();
    Fmpz norm;
    fmpz_set_ui(norm.get(), qj);
    fmpz_pow_ui(norm.get(), norm.get(), static_cast<ulong>(m.rank - 1));
    long checked = 0, divisible = 0;
    Fmpq lo(1), hi(1);
    for (ulong N = 0; N < qj; ++N) {
      const Fmpz n = Fmpz::from_ui(N + qj);  // a representative with X > 0
      if (local_density_stable_exponent(m, n, c.q) > c.j) continue;
      Fmpq beta(table[N]);
      fmpq_div_fmpz(beta.get(), beta.get(), norm.get());
      Fmpq diff;
      fmpq_sub_si(diff, beta, 1);
      fmpq_abs(diff, diff);
      Arb d;
      arb_set_fmpq(d, diff, 128);
      const Fmpq X = m.X(n);
      const bool q_divides_X = fmpz_divisible(fmpq_numref(X.get()), Fmpz::from_ui(c.q));
      INFO(c.family << " q = " << c.q << " N = " << N << " X = " << X.str() << " beta = " << beta.str() << " delta = "
                    << delta.str(10));
      CHECK(arb_le(d, delta));
      ++checked;
      if (q_divides_X) ++divisible;
      if (fmpq_cmp(beta.get(), lo.get()) < 0) lo = beta;
      if (fmpq_cmp(beta.get(), hi.get()) > 0) hi = beta;
    }
    INFO(c.family << " q = " << c.q << " j = " << c.j);
    CHECK(checked >= static_cast<long>(qj) / 2);
    // q | X(n) occurs (the valuations the bound must cover beyond v = 0), unless q | t (β_q = 1).
    if (m.family.t % static_cast<long>(c.q) != 0) CHECK(divisible > 0);
    range_by_rank_q[m.rank * 1000 + static_cast<int>(c.q)].emplace_back(lo, hi);
  }
  // ρ_q = β_q^F/β_q^G for two families of the same rank: within [(1−δ)/(1+δ), (1+δ)/(1−δ)],
  // checked on the extreme values max β / min β over both families.
  for (const auto& [key, ranges] : range_by_rank_q) {
    if (ranges.size() < 2) continue;
    const int rank = key / 1000;
    const ulong q = static_cast<ulong>(key % 1000);
    Fmpq lo = ranges[0].first, hi = ranges[0].second;
    for (const auto& [l, h] : ranges) {
      if (fmpq_cmp(l.get(), lo.get()) < 0) lo = l;
      if (fmpq_cmp(h.get(), hi.get()) > 0) hi = h;
    }
    REQUIRE(fmpq_sgn(lo.get()) > 0);
    Fmpq ratio;
    fmpq_div(ratio, hi, lo);
    Arb delta, bound, one, r;
    tail_prime_bound(delta, rank, q, 128);
    arb_one(one);
    Arb num, den;
    arb_add(num, one, delta, 128);
    arb_sub(den, one, delta, 128);
    arb_div(bound, num, den, 128);
    arb_set_fmpq(r, ratio, 128);
    INFO("rank " << rank << " q = " << q << " max rho = " << ratio.str() << " bound " << bound.str(10));
    CHECK(arb_le(r, bound));
  }
}
}  // namespace

TEST_CASE("|beta_q - 1| <= delta_q against counting modulo q^j, q = 5..31, q | X included", "[progression][tail]") {
  std::vector<TailCase> cases;
  for (const char* f : {"c6", "sc11", "sq5", "c7", "sc13", "sq6", "c8", "sc15", "sq7", "sq8"})
    for (ulong q : {5UL, 7UL, 11UL, 13UL, 17UL, 19UL, 23UL, 29UL, 31UL}) {
      const int j = q == 5 ? 4 : q == 7 ? 3 : 2;  // q^j <= 961
      cases.push_back({f, q, j});
    }
  check_tail_bound_by_counting(cases);
}

TEST_CASE("|beta_q - 1| <= delta_q at higher valuations (counting modulo q^3, q^4)", "[progression][tail][slow]") {
  std::vector<TailCase> cases;
  for (const char* f : {"c6", "sc11", "c7", "sc13", "c9", "sc17", "c10", "sc19", "sq9"})
    for (ulong q : {5UL, 7UL, 11UL, 13UL, 17UL}) {
      const bool structural = Family::parse(f).kind != FamilyKind::SumOfSquares && Family::parse(f).t % static_cast<long>(q) == 0;
      cases.push_back({f, q, structural ? 1 : q <= 7 ? 4 : 3});  // q | t: beta_q = 1, stable at j = 1
    }
  check_tail_bound_by_counting(cases);
}
