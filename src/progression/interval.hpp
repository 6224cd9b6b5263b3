#pragma once
// Assembling the limit interval of one class (docs/MATH.md §7):
//   I = C_σ · (A/A')^{w−1} · Π_{q≤Q} ρ_q · [e^{−S}, e^{S}],
//   C_σ = sqrt(det S_G / det S_F)  (ratio of π^{r/2}/(Γ(r/2) sqrt(det S)), same r),
// and the interval for n ≥ n0 with (X_F(n)/X_G(n))^{w−1} in place of its limit.
#include "progression/certificate.hpp"

namespace circlet {

/// res = sqrt(x) for a rational x ≥ 0.
void arb_sqrt_fmpq(arb_t res, const Fmpq& x, slong prec);

/// res = y^{(r−2)/2} for a rational y > 0 (any rank r ≥ 0).
void weight_power(arb_t res, const Fmpq& y, int rank, slong prec);

/// The least n ≥ 0 with X(n) = a·n + b > 0.
long first_positive(const AffineX& x);

/// Fills c.sigma_square, c.sigma, c.power_base, c.power_limit, c.n0, c.power_from_n0.
/// c.n0 is the larger of n0 and the first n at which X_F and X_G are both positive.
void sigma_and_power(Certificate& c, const ProgressionPair& pair, long n0, slong prec);

/// limit = sigma·power_limit·pinned·tail; from_n0 = sigma·power_from_n0·pinned·tail.
void class_intervals(arb_t limit, arb_t from_n0, const arb_t sigma, const arb_t power_limit,
                     const arb_t power_from_n0, const Fmpq& pinned, const arb_t tail, slong prec);

}  // namespace circlet
