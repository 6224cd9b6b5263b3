#pragma once
// L(k, χ_d) for k ≥ 2 and large conductor by the theta functional equation
// (docs/MATH.md §5, "theta route"), then exact by rounding to a proven denominator.
//
// χ = χ_d primitive real of conductor f = |d| > 1, a = 0 (d > 0) or 1 (d < 0),
// θ(x) = Σ_{n≥1} χ(n) n^a e^{−π n² x / f}. Gauss: τ(χ) = i^a sqrt(f), so the root
// number is 1 and θ(1/x) = x^{a+1/2} θ(x). Splitting the Mellin integral of
// Λ(s) = (f/π)^{(s+a)/2} Γ((s+a)/2) L(s, χ) at x = A (any A > 0) gives
//   Λ(s) = Σ_n χ(n) n^a [ A^σ E(σ, A c_n) + A^{−σ'} E(σ', c_n/A) ],
//   σ = (s+a)/2,  σ' = (1−s+a)/2,  c_n = π n²/f,  E(β, y) = ∫_1^∞ e^{−yu} u^{β−1} du
// (H. Davenport, Multiplicative Number Theory, 3rd ed., GTM 74, ch. 9 (the
// theta functional equation) and the standard incomplete-gamma form of the
// approximate functional equation; quoted from memory, checked in the tests
// against the Bernoulli route, exactly, and PARI/GP's lfun).
//
// At s = k with χ(−1) = (−1)^k the exponent σ = α is an integer, so
//   E(α, y) = e^{−y} Σ_{j<α} (α−1)!/(α−1−j)! y^{−j−1}           (elementary),
// and σ' = 1/2 − m, m = (k−a)/2 ≥ 1, where E(1/2, y) = sqrt(π/y) erfc(sqrt y) and
//   E(β, y) = (y E(β+1, y) − e^{−y})/β       (integration by parts, downward),
//   E(β+1, y) = (β E(β, y) + e^{−y})/y       (the same, upward),
//   ∂_y E(β, y) = −E(β+1, y).
// The half-integral series steps from c_n to c_{n'} by Taylor's formula in y
// with the rungs E(β+j, y) from the upward recursion; the Lagrange remainder
// after J terms is at most δ^J/J! · E(β+J, y), since E(β+J, ·) is positive and
// decreasing. Every few thousand steps (and geometrically often for small n)
// the value is re-anchored by erfc. Tails beyond the last n are bounded in
// balls (see the .cpp). Cost: about 2.5·sqrt(f·C/π) terms, C ≈ 40…80.
//
// Rounding: B_{k,χ} = Σ_{j=0}^{k} C(k,j) B_{k−j} f^{k−1−j} S_j with integers
// S_j = Σ_{a≤f} χ(a) a^j (dirichlet_l.hpp), so D_k · f · B_{k,χ} is an integer,
// D_k = lcm of the denominators of B_0, …, B_k. The ball for L(k, χ) gives a ball
// for that integer; when it contains exactly one integer, B_{k,χ} (and R with
// L = R π^k / sqrt f) is exact.
#include <functional>
#include <optional>

#include "core/flint_types.hpp"

namespace circlet {

/// Fraction of the series done, in [0, 1]; called from worker threads, serialised.
using ThetaProgress = std::function<void(double)>;

/// The number of series terms (both sides) dirichlet_l_rational_theta would sum for (d, k).
double dirichlet_l_theta_terms(const Fmpz& d, ulong k);

/// A ball for Λ(k, χ_d) = (f/π)^α Γ(α) L(k, χ_d), α = (k+a)/2, whose radius is
/// at most about 2^{log2_abs_error} (tails and rounding; guaranteed enclosure
/// whatever the radius). Requires d fundamental, |d| > 1, χ_d(−1) = (−1)^k, k ≥ 2,
/// |d| < 2^62. Runs on `threads` threads.
void dirichlet_lambda_theta(arb_t res, const Fmpz& d, ulong k, double log2_abs_error, int threads = 2,
                            const ThetaProgress& progress = {});

/// L(k, χ_d) by the theta route to about `bits` bits of relative accuracy.
void dirichlet_l_theta(arb_t res, const Fmpz& d, ulong k, slong bits, int threads = 2, const ThetaProgress& progress = {});

/// R with L(k, χ_d) = R π^k / sqrt(f), exact, by the theta route and rounding
/// (same contract as dirichlet_l_rational). nullopt only if the ball stayed too
/// wide to round after one retry at higher accuracy (not expected).
std::optional<Fmpq> dirichlet_l_rational_theta(const Fmpz& d, ulong k, int threads = 2,
                                               const ThetaProgress& progress = {});

}  // namespace circlet
