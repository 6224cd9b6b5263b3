#pragma once
// Main terms for many n at once (tables): M(first + step·i), i = 0..count−1.
//
// Even rank (and odd rank with small conductor) is exact row by row
// (main_term.hpp). For odd rank with k = (r−1)/2 ≥ 2 the L-values L(k, χ_{d0(n)})
// of all rows come from ONE pass over the primes p ≤ P (primes outer, rows
// inner): for odd p, χ_{d0(n)}(p) = (E(n)/p) with the integer
//   E(n) = (−1)^k · num(det S) · den(det S) · b · (a + b n),   Δ = a/b,
// (E(n) = D(n)·(den(det S)·b)², a square multiple of d0(n)), so along the
// table E(n) mod p is an arithmetic progression and the Legendre symbol is a
// table lookup; rows with p | E(n) are corrected with the Kronecker symbol of
// d0(n) itself. The logarithms −log(1 − χ(p)p^{−k}) are summed in 64-bit fixed
// point with scale 2^{−56}; each term is rounded to nearest (error ≤ 2^{−57}
// plus the ball radius of its evaluation, < 2^{−57}), so the sum's error is at
// most (number of primes)·2^{−56}, added to the radius together with the tail
// bound ε(P, k) of dirichlet_l_euler_tail.
#include <vector>

#include "core/flint_types.hpp"
#include "quadratic/model.hpp"

namespace circlet {

/// Balls containing M(first + step·i) for i = 0..count−1 (first ≥ 0, step ≥ 1).
/// Rows with X ≤ 0 get an indeterminate ball; rows whose discriminant d0(n) does
/// not fit in 62 bits are computed by the single-value main_term. P is the Euler-product bound for
/// odd rank (k ≥ 2); `prec` the working precision of the per-row balls.
std::vector<Arb> main_term_batch(const QuadraticModel& model, long first, long step, long count, ulong P,
                                 slong prec);

/// The prime bound P that makes the Euler-product tail of an odd-rank batch
/// below the relative accuracy 2^{−bits} (k ≥ 2), as used by tables.
ulong main_term_batch_prime_bound(int rank, slong bits);

}  // namespace circlet
