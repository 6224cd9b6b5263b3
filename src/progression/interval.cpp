#include "progression/interval.hpp"

#include <algorithm>
#include <climits>

#include "core/error.hpp"

namespace circlet {

void arb_sqrt_fmpq(arb_t res, const Fmpq& x, slong prec) {
  arb_set_fmpq(res, x, prec);
  arb_sqrt(res, res, prec);
}

void weight_power(arb_t res, const Fmpq& y, int rank, slong prec) {
  CIRCLET_ASSERT(fmpq_sgn(y.get()) > 0 && rank >= 0, "weight_power needs y > 0, r >= 0");
  Fmpq yk;
  fmpq_pow_si(yk, y, rank - 2);
  arb_sqrt_fmpq(res, yk, prec);
}

long first_positive(const AffineX& x) {
  // Least n ≥ 0 with a·n + b > 0 (a ≥ 1): n = ⌊−b/a⌋ + 1 when −b ≥ 0, else 0.
  Fmpq q;
  fmpq_neg(q, x.b);
  fmpq_div_fmpz(q, q, x.a);
  if (fmpq_sgn(q.get()) < 0) return 0;
  Fmpz f;
  fmpz_fdiv_q(f, fmpq_numref(q.get()), fmpq_denref(q.get()));
  CIRCLET_ASSERT(fmpz_fits_si(f.get()) && fmpz_cmp_si(f.get(), LONG_MAX - 1) < 0, "first_positive out of range");
  return fmpz_get_si(f.get()) + 1;
}

void sigma_and_power(Certificate& c, const ProgressionPair& pair, long n0, slong prec) {
  fmpq_div(c.sigma_square, pair.G.det_gram, pair.F.det_gram);
  arb_sqrt_fmpq(c.sigma, c.sigma_square, prec);
  fmpq_set_si(c.power_base, pair.apF.A, static_cast<ulong>(pair.apG.A));
  weight_power(c.power_limit, c.power_base, c.rank, prec);
  // y(n) is defined only where X_F(n) > 0 and X_G(n) > 0 (sq<S> has X = n, so X(0) = 0): the bound
  // starts at the first such n ≥ n0, and c.n0 says so.
  c.n0 = Fmpz(std::max(n0, std::max(first_positive(pair.xF), first_positive(pair.xG))));
  // For n ≥ n0, y(n) = X_F(n)/X_G(n) = (A n + b)/(A' n + b') is monotone (a Möbius map with no pole
  // on n ≥ 0), so it lies between y(n0) and its limit A/A'; y ↦ y^{w−1} is monotone for y > 0.
  Fmpq xf = pair.xF.at(c.n0), xg = pair.xG.at(c.n0), y0;
  CIRCLET_ASSERT(fmpq_sgn(xf.get()) > 0 && fmpq_sgn(xg.get()) > 0, "X must be positive at n0");
  fmpq_div(y0, xf, xg);
  Arb p0;
  weight_power(p0, y0, c.rank, prec);
  arb_union(c.power_from_n0, p0, c.power_limit, prec);
}

void class_intervals(arb_t limit, arb_t from_n0, const arb_t sigma, const arb_t power_limit,
                     const arb_t power_from_n0, const Fmpq& pinned, const arb_t tail, slong prec) {
  arb_t k;
  arb_init(k);
  arb_set_fmpq(k, pinned, prec);
  arb_mul(k, k, sigma, prec);
  arb_mul(k, k, tail, prec);
  arb_mul(limit, k, power_limit, prec);
  arb_mul(from_n0, k, power_from_n0, prec);
  arb_clear(k);
}

}  // namespace circlet
