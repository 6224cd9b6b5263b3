#pragma once
// Class numbers of imaginary quadratic orders and Hurwitz class numbers: the
// weight-3/2 main terms (c_4, sc_7, sq3) are L(1, χ_D), i.e. class numbers.
//
//   H(N) = Σ over SL2(Z)-classes of positive definite forms ax² + bxy + cy²
//          (not necessarily primitive) of discriminant −N, weighted 1/2 for the
//          class of a(x² + y²), 1/3 for that of a(x² + xy + y²), 1 otherwise;
//   H(0) = −1/12, H(N) = 0 for N ≡ 1, 2 (mod 4).
//
// L-value route: write −N = d0 F² with d0 fundamental; then (class number
// formula h(d0) = −(w0/2) B_{1,χ} and the conductor formula for orders)
//   H(N) = −B_{1,χ_{d0}} · Σ_{d | F} μ(d) χ_{d0}(d) σ_1(F/d)
// (H. Cohen, "Sums involving the values at negative integers of L-functions of
// quadratic characters", Math. Ann. 217 (1975), and Cohen, A Course in
// Computational Algebraic Number Theory, GTM 138, §5.3; quoted from memory,
// checked in the tests against form counting and PARI/GP).
#include "core/flint_types.hpp"

namespace circlet {

/// h(d): number of classes of primitive positive definite forms of
/// discriminant d < 0 (d ≡ 0, 1 mod 4), via h(d0) and the conductor formula
///   h(d0 F²) = h(d0) F / [O*:O_F*] · Π_{p | F} (1 − χ_{d0}(p)/p).
Fmpz class_number(slong d);

/// H(N) by the L-value route above. N ≥ 0.
Fmpq hurwitz_class_number(ulong N);

/// Slow reference: H(N) by enumerating reduced forms |b| ≤ a ≤ c of b² − 4ac = −N.
Fmpq hurwitz_class_number_by_forms(ulong N);

/// Slow reference: h(d) by enumerating primitive reduced forms.
Fmpz class_number_by_forms(slong d);

}  // namespace circlet
