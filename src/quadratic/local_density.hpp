#pragma once
// Local densities β_p(n) (MATH.md §4) and the circle method's p-power arc
// pieces A_{p^j}(n)/p^{jw} (MATH.md §6), as exact rationals.
//
//   β_p(n) = lim_j N_j(n) / p^{j(r−1)},  N_j(n) = #{x mod p^j : P(x) ≡ n (mod p^j)}
//   (for c_t: x ∈ (Z/p^j)^t with Σ x_i ≡ 0, normalised by p^{j(t−2)}).
#include "core/flint_types.hpp"
#include "quadratic/model.hpp"

namespace circlet {

/// β_p(n) from the closed forms (p | t; good odd p, even and odd rank, any
/// valuation of X; the 2-adic cases). Exact. p must be prime.
Fmpq local_density(const QuadraticModel& model, const Fmpz& n, ulong p);

/// Reference route, for tests and `verify` only: N_j(n)/p^{j(r−1)} by direct
/// counting modulo p^j (dynamic programming over the coordinates).
Fmpq local_density_by_counting(const QuadraticModel& model, const Fmpz& n, ulong p, int j);

/// An exponent j such that N_j(n)/p^{j(r−1)} = β_p(n) (stabilisation is proved,
/// not observed: it follows from Hensel lifting, see the implementation).
int local_density_stable_exponent(const QuadraticModel& model, const Fmpz& n, ulong p);

/// The arc piece A_{p^j}(n)/p^{jw} = N_j/p^{j(r−1)} − N_{j−1}/p^{(j−1)(r−1)} for j ≥ 1
/// (equal to 1 for j = 0). Exact; zero for j beyond the stable exponent.
Fmpq local_arc_piece(const QuadraticModel& model, const Fmpz& n, ulong p, int j);

/// True when p | 2t (or p = 2 for sq_S), i.e. a prime where the closed forms
/// for good primes do not apply; primes dividing X are handled by every form.
bool is_structural_prime(const QuadraticModel& model, ulong p);

}  // namespace circlet
