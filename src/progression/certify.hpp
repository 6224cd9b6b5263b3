#pragma once
// Deciding a progression pair (docs/MATH.md §7): NON-CONVERGENT, CONSTANT or UNDECIDED.
//
// Procedure.
//  1. The same family on the same progression: the sequences are identical;
//     CONSTANT with the exact value 1.
//  1'. Proportional route (weight > 2). If X_G(n) = λ·X_F(n) for every n
//     (A'·b_F = A·b_G) and D = det S_F · det S_G (· λ for odd rank) is a
//     rational square, then for every prime p outside the finite set P of
//     constant_route_primes both β_p are given by the same closed form (docs/MATH.md
//     §4, unimodular at p) evaluated at the same v_p(X) and the same character
//     value (even rank: χ_F(p)χ_G(p) = (D/p) = 1; odd rank: the unit parts
//     differ by λ and χ_{u,F}χ_{u,G} = (D/p) = 1), so ρ_p = 1. If moreover at
//     each p ∈ P the pinned classes partition Z (no p-adic zero of X left) and
//     all give the same ρ_p, then ρ_p is constant for every p, and since
//     (X_F/X_G)^{w−1} = (A/A')^{w−1} exactly, M_F/M_G = L for every n with
//     L² = (det S_G/det S_F)(A/A')^{r−2} Π_{p∈P} ρ_p² rational: whether L is an
//     integer is decided exactly. (If X_F, X_G are not proportional, then at the
//     infinitely many p ∤ 2t_F t_G A A' (A'b_F − A b_G) some n has v_p(X_F) ≥ 1 =
//     v_p(X_G) + 1 and another has both 0, and β_p(v = 1) ≠ β_p(v = 0) for a
//     unimodular form, so ρ_p varies; if they are proportional but the
//     discriminant product is not a square, χ_F(p) ≠ χ_G(p) at infinitely many
//     p ∤ A, where ρ_p(v = 0) ≠ ρ_p(v = 1). So no CONSTANT pair is missed.)
//  2. Weight ≤ 2: UNDECIDED (the tail Σ q^{1−w} does not converge absolutely and
//     Hecke's bound does not make the cusp part o(main term)).
//  3. For primes p = 2, 3, 5, ... ≤ Q_max: the pinned classes at p
//     (pinning.hpp) and their exact ρ_p. The prime p* with the largest spread
//     max ρ / min ρ gives the two classes; every other prime q ≤ Q gets one
//     common pinned class. The first Q ≥ 3 at which the two limit intervals
//       I_k = C_σ · (A/A')^{w−1} · Π_{q≤Q} ρ_q(class k) · [e^{−S(Q)}, e^{S(Q)}]
//     are disjoint gives NON-CONVERGENT; C_σ = sqrt(det S_G / det S_F) is
//     the ratio of the σ_∞ constants π^{r/2}/(Γ(r/2) sqrt(det S)).
//  4. Otherwise UNDECIDED, saying whether no ρ_p varied or the intervals overlapped.
//  5. Adaptive precision. When some ρ_p varies but the intervals overlap, the
//     cause is decided exactly at the last Q tried: the two intervals are
//     m_k·[e^{−S}, e^{S}] with the same factor C_σ(A/A')^{w−1} in m_1, m_2, so
//     they overlap as exact intervals iff |log(P_1/P_2)| ≤ 2S (P_k the pinned
//     products, exact rationals). If that holds (as balls): "cause: mathematics",
//     more precision cannot help. Otherwise the overlap comes from the working
//     precision (ball radii, or a tail bound that was not finite), and the
//     search is repeated at 2·prec, 4·prec, ... ≤ prec_max before UNDECIDED
//     with "cause: precision".
#include "progression/certificate.hpp"

namespace circlet {

struct CertifyOptions {
  ulong Q_max = 47;         // largest prime pinned
  ulong q2 = 20000;         // explicit primes in the tail bound
  long n0 = 1000;           // power-factor bound for n ≥ n0
  slong prec = 128;         // the first working precision
  slong prec_max = 512;     // adaptive precision: retries at 2·prec, ... up to this (see certify_pair)
};

Certificate certify_pair(const ProgressionPair& pair, const CertifyOptions& opt);

/// λ with X_G(n) = λ·X_F(n) for all n, if the two affine functions are proportional.
bool x_proportional(const ProgressionPair& pair, Fmpq* lambda);

/// det S_F · det S_G, times λ for odd rank (route 1' above).
Fmpq discriminant_product(const ProgressionPair& pair, const Fmpq& lambda);

/// Is x the square of a rational?
bool fmpq_is_square(const Fmpq& x);

/// The finite set P of route 1': 2, 3 and the primes dividing t_F, t_G and λ, ascending.
std::vector<ulong> constant_route_primes(const ProgressionPair& pair, const Fmpq& lambda);

}  // namespace circlet
