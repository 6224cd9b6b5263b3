#pragma once
// The singular integral of the circle method (docs/MATH.md §3):
//
//   σ_∞(X) = π^{r/2} X^{r/2 − 1} / ( Γ(r/2) · sqrt(det S) ),
//
// the volume density of { y ∈ R^r : yᵀ S y = X } (Siegel). For r = 2 it is the
// constant π/sqrt(det S).
#include "core/flint_types.hpp"

namespace circlet {

/// σ_∞(X) as a ball, rank r ≥ 1, det S > 0, X > 0 (rational). Asserts on
/// non-positive X or det S (callers check user input first).
void singular_integral(arb_t res, int rank, const Fmpq& det_gram, const Fmpq& X, slong prec);

/// Convenience form returning a new ball.
Arb singular_integral(int rank, const Fmpq& det_gram, const Fmpq& X, slong prec);

}  // namespace circlet
