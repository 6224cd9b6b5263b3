#pragma once
// Route (a) to the circle method's arc coefficients (docs/MATH.md §6): A_k(n) is
// multiplicative in k, so
//
//   A_k(n)/k^w = Π_{p^j || k} A_{p^j}(n)/p^{jw},
//
// and each prime-power piece is a difference of normalised local counts
// (local_arc_piece, src/quadratic/local_density.hpp). Exact.
#include "core/flint_types.hpp"
#include "quadratic/model.hpp"

namespace circlet {

/// A_k(n)/k^w as an exact rational, k ≥ 1, from the local pieces.
Fmpq arc_coefficient_from_local_pieces(const QuadraticModel& model, const Fmpz& n, ulong k);

}  // namespace circlet
