#pragma once
// Deciding a progression pair (MATH.md §7): NON-CONVERGENT, CONSTANT or UNDECIDED.
//
// Procedure.
//  1. The same family on the same progression: the sequences are identical;
//     CONSTANT with the exact value 1 (the only CONSTANT this program proves:
//     for any other pair, constancy of ρ_p at all of the infinitely many
//     primes p > Q would need an argument it does not make).
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
#include "progression/certificate.hpp"

namespace circlet {

struct CertifyOptions {
  ulong Q_max = 47;         // largest prime pinned
  ulong q2 = 20000;         // explicit primes in the tail bound
  long n0 = 1000;           // power-factor bound for n ≥ n0
  slong prec = 128;
};

Certificate certify_pair(const ProgressionPair& pair, const CertifyOptions& opt);

}  // namespace circlet
