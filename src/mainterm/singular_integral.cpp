// σ_∞(X) = π^{r/2} X^{r/2−1} / (Γ(r/2) sqrt(det S))  (docs/MATH.md §3).
#include "mainterm/singular_integral.hpp"

#include "core/error.hpp"

namespace circlet {

void singular_integral(arb_t res, int rank, const Fmpq& det_gram, const Fmpq& X, slong prec) {
  CIRCLET_ASSERT(rank >= 1, "singular_integral: rank must be positive");
  CIRCLET_ASSERT(fmpq_sgn(X.get()) > 0, "singular_integral: X must be positive");
  CIRCLET_ASSERT(fmpq_sgn(det_gram.get()) > 0, "singular_integral: det S must be positive");
  slong wp = prec + 10;
  Arb half_r, pi_pow, x_pow, gamma, det, t;
  // r/2 as an exact rational, so Γ(r/2) is evaluated at an exact point.
  Fmpq hr(rank, 2);
  arb_set_fmpq(half_r, hr.get(), wp);
  arb_const_pi(t, wp);
  arb_pow(pi_pow, t, half_r, wp);  // π^{r/2}, π > 0 so pow is exact in the ball sense
  // X^{r/2 − 1} = X^{(r−2)/2}
  Fmpq e(rank - 2, 2);
  Arb xb, eb;
  arb_set_fmpq(xb, X.get(), wp);
  arb_set_fmpq(eb, e.get(), wp);
  arb_pow(x_pow, xb, eb, wp);
  arb_gamma_fmpq(gamma, hr.get(), wp);
  arb_set_fmpq(det, det_gram.get(), wp);
  arb_sqrt(det, det, wp);
  arb_mul(t, pi_pow, x_pow, wp);
  arb_mul(gamma, gamma, det, wp);
  arb_div(res, t, gamma, prec);
}

Arb singular_integral(int rank, const Fmpq& det_gram, const Fmpq& X, slong prec) {
  Arb r;
  singular_integral(r.get(), rank, det_gram, X, prec);
  return r;
}

}  // namespace circlet
