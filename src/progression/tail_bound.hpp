#pragma once
// A rigorous bound for Π_{q > Q} ρ_q(n), uniform in n (docs/MATH.md §7).
//
// Per-prime bound (derived from docs/MATH.md §4; w = r/2). For a prime q with
// q ∤ 2t (both families; for q | t, β_q = 1 and the bound holds trivially),
// write v = v_q(X):
//  * r even: β_q = (1 − χq^{−w}) Σ_{i=0}^{v} (χq^{1−w})^i with χ = ±1, so
//      |β_q − 1| ≤ q^{−w} + (1 + q^{−w}) · q^{1−w}/(1 − q^{1−w}) =: δ_q.
//  * r odd: β_q = Σ_{j=0}^{v+1} a_j with a_0 = 1, a_1 ≠ 0 only when v = 0 and
//    then |a_1| = q^{(1−r)/2}, and |a_j| ≤ q^{j(1−r/2)} for j ≥ 2, so
//      |β_q − 1| ≤ q^{(1−r)/2} + q^{2−r}/(1 − q^{1−r/2}) =: δ_q.
// Both hold for every v, i.e. also for the primes dividing X. If δ_q < 1 then
//      ρ_q = β_q^F/β_q^G ∈ [(1−δ_q)/(1+δ_q), (1+δ_q)/(1−δ_q)],
//      |log ρ_q| ≤ L_q := log((1+δ_q)/(1−δ_q)).
// Tail sum. S = Σ_{q > Q prime} L_q is bounded by summing L_q in balls over the
// primes Q < q ≤ Q2 and, for q > Q2, using
//      δ_q ≤ c1 q^{−α1} + c2 q^{−α2}   (r odd: α1 = (r−1)/2, α2 = r−2,
//                                        c1 = 1, c2 = 1/(1 − Q2^{1−r/2});
//                                        r even: α1 = w, α2 = w − 1,
//                                        c1 = 1, c2 = (1+Q2^{−w})/(1 − Q2^{1−w})),
//      L_q ≤ 2δ_q/(1 − δ_q²) ≤ 2δ_q/(1 − δ*²)  with δ* = c1 Q2^{−α1} + c2 Q2^{−α2} ≥ δ_q,
//      Σ_{q > Q2} q^{−α} ≤ Σ_{k > Q2} k^{−α} ≤ ∫_{Q2}^∞ x^{−α} dx = Q2^{1−α}/(α − 1)   (α > 1).
// α1, α2 > 1 needs r ≥ 5 for odd r (weight ≥ 5/2) and w ≥ 3 for even r: weight > 2.
// Then Π_{q>Q} ρ_q(n) ∈ [e^{−S}, e^{S}] for every n.
#include "core/flint_types.hpp"

namespace circlet {

/// Is the tail absolutely convergent for rank r (weight r/2 > 2)?
bool tail_converges(int rank);

/// res ⊇ {δ_q}: the per-prime bound above for rank r at the prime q.
void tail_prime_bound(arb_t res, int rank, ulong q, slong prec);

/// res = an upper bound (as a ball whose every point is ≥ the true S) for
/// S = Σ_{q>Q} L_q, using explicit primes up to q2 (q2 > Q). Requires tail_converges(rank).
void tail_log_bound(arb_t res, int rank, ulong Q, ulong q2, slong prec);

/// res = a ball containing [e^{−S}, e^{S}] where S is the upper endpoint of tail_log_bound.
void tail_interval(arb_t res, int rank, ulong Q, ulong q2, slong prec);

/// The Q2 used by certify (explicit primes up to this bound).
inline constexpr ulong kTailExplicitPrimes = 20000;

}  // namespace circlet
