#pragma once
// The circle-method view of the main term (docs/MATH.md §6): the major arc with
// denominator k contributes σ_∞(X)·A_k(n)/k^w, the k = 1 term is the leading
// term and k ≥ 2 are the secondary terms, and
//
//   M(n) = σ_∞(X) · Σ_{k≥1} A_k(n)/k^w     (absolutely convergent for r ≥ 4).
//
// This file gives the terms for k = 1..K, their partial sums, and a rigorous
// bound T(K) ≥ Σ_{k>K} |A_k(n)/k^w| from the multiplicative structure:
//
//   Σ_{k>K} |f(k)| = Π_p (Σ_j |f(p^j)|) − Σ_{k≤K} |f(k)|,   f(k) = A_k(n)/k^w,
//
// (f multiplicative, the Euler product of |f| converging absolutely), with the
// product over primes bounded as follows. At a good prime p (p ∤ 2t, p not
// dividing the numerator or denominator of X) docs/MATH.md §4 gives f(p^j) = 0 for
// j ≥ 2 and |f(p)| = p^{−s}, s = ⌊r/2⌋ (r even: f(p) = −χ(p)p^{−r/2}, χ(p) = ±1;
// r odd: f(p) = χ_u(p)p^{(1−r)/2}). So, for s ≥ 2 and a cut-off P₀,
//
//   Π_p Σ_j |f(p^j)| ≤ Π_{p special or p ≤ K} Σ_j |f(p^j)|       (exact pieces)
//                    · Π_{K < p ≤ P₀, good} (1 + p^{−s})
//                    · exp( P₀^{1−s}/(s−1) ),
//
// the last factor because Π_{p > P₀} (1 + p^{−s}) ≤ exp(Σ_{p>P₀} p^{−s}) and
// Σ_{p>P₀} p^{−s} ≤ Σ_{m>P₀} m^{−s} ≤ ∫_{P₀}^∞ x^{−s} dx = P₀^{1−s}/(s−1).
// For r ≤ 3 (s ≤ 1) the series is not absolutely convergent and T = +∞.
#include <string>
#include <vector>

#include "core/flint_types.hpp"
#include "quadratic/model.hpp"

namespace circlet {

struct ArcTerm {
  ulong k = 0;
  Fmpq coefficient;  // A_k(n)/k^w, exact (route (a): local pieces)
  Arb term;          // σ_∞(X)·A_k(n)/k^w
  Arb partial_sum;   // Σ_{k' ≤ k} σ_∞(X)·A_{k'}(n)/k'^w
  Arb tail_bound;    // upper bound (radius 0) for σ_∞(X)·Σ_{k' > k} |A_{k'}(n)/k'^w|; +∞ when r ≤ 3
};

struct ArcTailBound {
  Arb coefficient_tail;  // an upper bound (radius 0) for Σ_{k>K} |A_k(n)/k^w|; +∞ when r ≤ 3
  Arb euler_product;     // a ball containing the bound E ≥ Σ_{k≥1} |A_k(n)/k^w| (any K' ≤ K may use it)
  ulong prime_cutoff = 0;  // P₀
  int decay = 0;           // s = ⌊r/2⌋: |f(p)| = p^{−s} at good primes
  std::vector<Fmpz> special_primes;  // primes whose factors were taken exactly beyond K
  std::string method;                 // the inequality used, in words
};

struct ArcExpansion {
  Fmpz n;
  Fmpq X;
  ulong K = 0;
  Arb singular_integral;          // σ_∞(X)
  std::vector<ArcTerm> terms;     // k = 1..K
  Fmpq coefficient_partial_sum;   // Σ_{k≤K} A_k(n)/k^w, exact
  ArcTailBound tail;
  Arb term_tail;                  // upper bound for σ_∞(X)·Σ_{k>K}|A_k/k^w| (radius 0)
  Arb enclosure;                  // a ball containing M(n) = σ_∞(X)·Σ_k A_k(n)/k^w
};

/// A_k(n)/k^w for k = 1..K (index k−1), exact, from the local pieces, each
/// prime-power piece computed once.
std::vector<Fmpq> arc_coefficients(const QuadraticModel& model, const Fmpz& n, ulong K);

/// T(K) as above, given coeffs[k−1] = A_k(n)/k^w for k = 1..K. prime_cutoff = 0
/// chooses P₀ = max(10^5, 100·K).
ArcTailBound arc_tail_bound(const QuadraticModel& model, const Fmpz& n, const std::vector<Fmpq>& coeffs,
                            slong prec, ulong prime_cutoff = 0);

/// The terms for k = 1..K, partial sums, tail bound and the enclosure of M(n).
/// Throws UserError when K = 0 or X ≤ 0.
ArcExpansion arc_expansion(const QuadraticModel& model, const Fmpz& n, ulong K, slong prec);

}  // namespace circlet
