#pragma once
// Class numbers of imaginary quadratic orders and Hurwitz class numbers: the
// weight-3/2 main terms (c_4, sc_7, sq3) are L(1, χ_D), i.e. class numbers.
//
//   H(N) = Σ over SL2(Z)-classes of positive definite forms ax² + bxy + cy²
//          (not necessarily primitive) of discriminant −N, weighted 1/2 for the
//          class of a(x² + y²), 1/3 for that of a(x² + xy + y²), 1 otherwise;
//   H(0) = −1/12, H(N) = 0 for N ≡ 1, 2 (mod 4).
//
// Counting route (the default; docs/MATH.md §5): every class has exactly one
// reduced representative (a, b, c), |b| ≤ a ≤ c, b ≥ 0 when |b| = a or a = c,
// and a ≤ sqrt(N/3). For a given a the b ∈ (−a, a] with b² ≡ −N (mod 4a) are
// ρ(a) = #{b mod 2a : b² ≡ −N (mod 4a)}, a multiplicative function of a read off
// N mod p^e; each such b gives c = (b² + N)/(4a), and c > a is automatic when
// 4a² < N. So
//   H(N) = Σ_{a ≤ sqrt(N/4)} ρ(a) + #{reduced forms with 4a² > N} − corrections,
// the first sum by a segmented sieve over a, the second (a in (sqrt(N/4),
// sqrt(N/3)], about 7.7 % of the a) from the actual roots b. Exact, no
// analytic estimate; cost ≈ sqrt(N/3) sieve steps, on two threads for large N.
//
// L-value route (kept as an independent check): write −N = d0 F² with d0
// fundamental; then (class number formula h(d0) = −(w0/2) B_{1,χ} and the
// conductor formula for orders)
//   H(N) = −B_{1,χ_{d0}} · Σ_{d | F} μ(d) χ_{d0}(d) σ_1(F/d)
// (H. Cohen, "Sums involving the values at negative integers of L-functions of
// quadratic characters", Math. Ann. 217 (1975), and Cohen, A Course in
// Computational Algebraic Number Theory, GTM 138, §5.3; quoted from memory,
// checked in the tests against form counting and PARI/GP). Cost O(|d0|).
#include "core/flint_types.hpp"

namespace circlet {

/// h(d): number of classes of primitive positive definite forms of
/// discriminant d < 0 (d ≡ 0, 1 mod 4), via h(d0) = (w0/2)·H(|d0|) (counting
/// route) and the conductor formula
///   h(d0 F²) = h(d0) F / [O*:O_F*] · Π_{p | F} (1 − χ_{d0}(p)/p).
Fmpz class_number(slong d);

/// H(N) by the counting route above. N ≥ 0.
Fmpq hurwitz_class_number(ulong N);

/// H(N) by the counting route for any N ≥ 0 with N < kHurwitzMaxN. Cost about
/// hurwitz_class_number_steps(N) sieve steps (a few ns each, two threads).
Fmpq hurwitz_class_number(const Fmpz& N);

/// The counting route handles N below 3·2^64 (so that every a ≤ sqrt(N/3) fits 32 bits).
bool hurwitz_class_number_in_range(const Fmpz& N);

/// ⌊sqrt(N/3)⌋: the number of values of a the counting route sieves.
double hurwitz_class_number_steps(const Fmpz& N);

/// H(N) by the L-value (generalised Bernoulli) route: cost O(N). N ≥ 0.
Fmpq hurwitz_class_number_bernoulli(ulong N);

/// Slow reference: H(N) by enumerating reduced forms |b| ≤ a ≤ c of b² − 4ac = −N.
Fmpq hurwitz_class_number_by_forms(ulong N);

/// Slow reference: h(d) by enumerating primitive reduced forms.
Fmpz class_number_by_forms(slong d);

}  // namespace circlet
