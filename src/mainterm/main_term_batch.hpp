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
#include <functional>
#include <optional>
#include <vector>

#include "core/flint_types.hpp"
#include "mainterm/main_term.hpp"
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

/// One row of a main-term table: exact when the mathematics makes it rational
/// and the route is affordable, a ball otherwise; invalid when X ≤ 0.
struct TableMainTerm {
  bool valid = false;
  std::optional<Fmpq> exact;
  Arb ball;  // contains M(n); the exact value when `exact` is set
};

/// The rows M(first + step·i), i = 0..count−1, for tables (`main --to`, `remainder`):
/// exact row by row for even rank and for weight 3/2 (class numbers, cost ≈
/// sqrt(X) per row), on two threads; weight 5/2 exact the same way (divisor sums)
/// while rows·sqrt(det S·n_max) ≤ 2·10^9 (about 1.5·10^5 rows of c_6), odd rank ≥ 7
/// exact while rows·det S·n_max ≤ 3·10^7 (Bernoulli sums); beyond, balls from
/// main_term_batch with the prime bound main_term_batch_prime_bound(rank, bits)
/// capped at max_prime. `prec` is the working precision of the balls;
/// `progress` gets the fraction of rows done (from either thread, serialised).
std::vector<TableMainTerm> main_term_table(const QuadraticModel& model, long first, long step, long count,
                                           slong bits, ulong max_prime, slong prec,
                                           const MainTermOptions& options = {},
                                           const std::function<void(double)>& progress = {});

}  // namespace circlet
