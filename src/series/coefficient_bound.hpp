#pragma once
// Rigorous a-priori bounds on the coefficients of a generating function, used
// to choose how many FFT primes the multimodular series engine needs (the
// number of primes is never chosen by watching residues stabilise).
//
// Two kinds of bound:
//  * family_coefficient_bound: for the counted families, the smallest of
//    - the "box" bound from the abacus / lattice model of docs/MATH.md §2 (every
//      coordinate of a solution lies in a short interval; exact integers),
//    - the "slice" bound: at most 2 solutions per lattice point of the
//      projected ellipsoid, counted by volume (Arb, rounded up),
//    - for c_t and sc_t, the partition bound p(n) ≤ p(N).
//  * eta_quotient_coefficient_bound: a majorant bound for an arbitrary eta
//    quotient, evaluated in Arb ball arithmetic and rounded upwards.
#include <string>

#include "core/flint_types.hpp"
#include "family/family.hpp"

namespace circlet {

/// An upper bound B with |[q^n] F| ≤ B for all 0 ≤ n ≤ N, and how it was obtained.
struct CoefficientBound {
  Fmpz bound;
  /// True when every coefficient is known to be ≥ 0 (a count), so that an
  /// unsigned reconstruction modulo M > B suffices; otherwise M > 2B is needed.
  bool nonnegative = false;
  /// One line naming the inequality, for provenance.
  std::string method;
};

/// Bound for c_t, sc_t and r_S, for all n ≤ N (N ≥ 0): the smallest of the box,
/// slice and (c_t, sc_t) partition bounds. See the .cpp for the derivations.
CoefficientBound family_coefficient_bound(const Family& family, long N);

/// General bound for an eta quotient Π_d Π_k (1 − q^{dk})^{e_d}, all n ≤ N:
///   |[q^n] F| ≤ [q^n] E(q)^{−A} ≤ exp(A·π²/6 · x/(1−x)) / x^n   (A = Σ|e_d|, any 0 < x < 1).
/// x is chosen with doubles; the value is evaluated in Arb at precision `prec`
/// and rounded up to an integer.
CoefficientBound eta_quotient_coefficient_bound(const EtaQuotient& quotient, long N, slong prec);

}  // namespace circlet
