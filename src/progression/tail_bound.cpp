#include "progression/tail_bound.hpp"

#include <flint/ulong_extras.h>

#include "core/error.hpp"

namespace circlet {

bool tail_converges(int rank) { return rank >= 5; }

namespace {
// res = q^{-k} for an integer k ≥ 0.
void inv_pow(arb_t res, ulong q, ulong k, slong prec) {
  arb_ui_pow_ui(res, q, k, prec);
  arb_inv(res, res, prec);
}

// Exponents and constants of δ_q ≤ c1 q^{-α1} + c2 q^{-α2}; c2 as a ball for q ≥ q0.
void tail_constants(int rank, ulong q0, ulong* a1, ulong* a2, arb_t c2, slong prec) {
  arb_t t;
  arb_init(t);
  if (rank % 2 == 1) {
    *a1 = static_cast<ulong>((rank - 1) / 2);
    *a2 = static_cast<ulong>(rank - 2);
    // c2 = 1/(1 − q0^{1−r/2}) = 1/(1 − 1/sqrt(q0^{r−2}))
    arb_ui_pow_ui(t, q0, static_cast<ulong>(rank - 2), prec);
    arb_rsqrt(t, t, prec);
    arb_sub_ui(t, t, 1, prec);
    arb_neg(t, t);
    arb_inv(c2, t, prec);
  } else {
    ulong w = static_cast<ulong>(rank / 2);
    *a1 = w;
    *a2 = w - 1;
    // c2 = (1 + q0^{−w})/(1 − q0^{1−w})
    arb_t u;
    arb_init(u);
    inv_pow(t, q0, w, prec);
    arb_add_ui(t, t, 1, prec);
    inv_pow(u, q0, w - 1, prec);
    arb_sub_ui(u, u, 1, prec);
    arb_neg(u, u);
    arb_div(c2, t, u, prec);
    arb_clear(u);
  }
  arb_clear(t);
}
}  // namespace

void tail_prime_bound(arb_t res, int rank, ulong q, slong prec) {
  CIRCLET_ASSERT(rank >= 1 && q >= 2, "bad tail_prime_bound arguments");
  arb_t a, b;
  arb_init(a);
  arb_init(b);
  if (rank % 2 == 1) {
    // δ_q = q^{(1−r)/2} + q^{2−r}/(1 − q^{1−r/2})
    inv_pow(a, q, static_cast<ulong>((rank - 1) / 2), prec);
    arb_ui_pow_ui(b, q, static_cast<ulong>(rank - 2), prec);  // q^{r−2}
    arb_t s;
    arb_init(s);
    arb_rsqrt(s, b, prec);  // q^{1−r/2}
    arb_sub_ui(s, s, 1, prec);
    arb_neg(s, s);           // 1 − q^{1−r/2}
    arb_mul(s, s, b, prec);  // q^{r−2}(1 − q^{1−r/2})
    arb_inv(b, s, prec);
    arb_add(res, a, b, prec);
    arb_clear(s);
  } else {
    ulong w = static_cast<ulong>(rank / 2);
    // δ_q = q^{−w} + (1 + q^{−w}) q^{1−w}/(1 − q^{1−w})
    inv_pow(a, q, w, prec);
    arb_t s, u;
    arb_init(s);
    arb_init(u);
    arb_add_ui(s, a, 1, prec);
    inv_pow(u, q, w - 1, prec);
    arb_mul(s, s, u, prec);
    arb_sub_ui(u, u, 1, prec);
    arb_neg(u, u);
    arb_div(s, s, u, prec);
    arb_add(res, a, s, prec);
    arb_clear(s);
    arb_clear(u);
  }
  arb_clear(a);
  arb_clear(b);
}

void tail_log_bound(arb_t res, int rank, ulong Q, ulong q2, slong prec) {
  CIRCLET_ASSERT(tail_converges(rank), "tail bound requested for weight <= 2");
  CIRCLET_ASSERT(q2 > Q && Q >= 2, "tail_log_bound needs q2 > Q >= 2");
  arb_t sum, d, t, u;
  arb_init(sum);
  arb_init(d);
  arb_init(t);
  arb_init(u);
  arb_zero(sum);
  // Explicit primes Q < q ≤ q2: L_q = log((1+δ_q)/(1−δ_q)), needs δ_q < 1.
  for (ulong q = n_nextprime(Q, 1); q <= q2; q = n_nextprime(q, 1)) {
    tail_prime_bound(d, rank, q, prec);
    arb_one(t);
    arb_add(t, t, d, prec);
    arb_one(u);
    arb_sub(u, u, d, prec);
    if (!arb_is_positive(u)) {
      // δ_q ≥ 1 (or not provably < 1): no bound. Return +∞.
      arb_pos_inf(res);
      arb_clear(sum); arb_clear(d); arb_clear(t); arb_clear(u);
      return;
    }
    arb_div(t, t, u, prec);
    arb_log(t, t, prec);
    arb_add(sum, sum, t, prec);
  }
  // Primes q > q2: L_q ≤ 2δ_q/(1 − δ*²), δ_q ≤ c1 q^{−α1} + c2 q^{−α2},
  // Σ_{q>q2} q^{−α} ≤ q2^{1−α}/(α−1).
  ulong a1, a2;
  arb_t c2, dstar, s1, s2;
  arb_init(c2);
  arb_init(dstar);
  arb_init(s1);
  arb_init(s2);
  tail_constants(rank, q2, &a1, &a2, c2, prec);
  CIRCLET_ASSERT(a1 > 1 && a2 > 1, "tail exponents must exceed 1");
  // δ* = q2^{−α1} + c2 q2^{−α2}
  inv_pow(dstar, q2, a1, prec);
  inv_pow(t, q2, a2, prec);
  arb_addmul(dstar, c2, t, prec);
  // s1 = q2^{1−α1}/(α1−1), s2 = c2 q2^{1−α2}/(α2−1)
  inv_pow(s1, q2, a1 - 1, prec);
  arb_div_ui(s1, s1, a1 - 1, prec);
  inv_pow(s2, q2, a2 - 1, prec);
  arb_div_ui(s2, s2, a2 - 1, prec);
  arb_mul(s2, s2, c2, prec);
  arb_add(s1, s1, s2, prec);
  // × 2/(1 − δ*²)
  arb_sqr(t, dstar, prec);
  arb_sub_ui(t, t, 1, prec);
  arb_neg(t, t);
  arb_div(s1, s1, t, prec);
  arb_mul_2exp_si(s1, s1, 1);
  arb_add(sum, sum, s1, prec);
  // Report the upper endpoint as an exact ball, so every point is ≥ S.
  arf_t hi;
  arf_init(hi);
  arb_get_ubound_arf(hi, sum, prec);
  arb_set_arf(res, hi);
  arf_clear(hi);
  arb_clear(c2);
  arb_clear(dstar);
  arb_clear(s1);
  arb_clear(s2);
  arb_clear(sum);
  arb_clear(d);
  arb_clear(t);
  arb_clear(u);
}

void tail_interval(arb_t res, int rank, ulong Q, ulong q2, slong prec) {
  arb_t s, lo, hi;
  arb_init(s);
  arb_init(lo);
  arb_init(hi);
  tail_log_bound(s, rank, Q, q2, prec);
  if (!arb_is_finite(s)) {
    arb_zero_pm_inf(res);
  } else {
    arb_exp(hi, s, prec);
    arb_neg(s, s);
    arb_exp(lo, s, prec);
    arb_union(res, lo, hi, prec);
  }
  arb_clear(s);
  arb_clear(lo);
  arb_clear(hi);
}

}  // namespace circlet
