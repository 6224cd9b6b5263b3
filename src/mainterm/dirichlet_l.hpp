#pragma once
// Quadratic Dirichlet characters and their L-values at positive integers
// (docs/MATH.md §5): the good-prime product of every main term is an L-value.
//
//   χ_d(n) = (d/n), the Kronecker symbol of a fundamental discriminant d
//   (d = 1 is the trivial character); conductor f = |d|, χ_d(−1) = sign(d).
//
// Exact route (moderate conductor), for χ(−1) = (−1)^k:
//   L(k, χ) = (−1)^{1+⌊k/2⌋} · τ(χ)/(2 i^a) · (2π/f)^k · B_{k,χ}/k!     (a = 0 even, 1 odd)
//   with τ(χ_d) = sqrt(f) (d > 0) or i·sqrt(f) (d < 0), so
//   L(k, χ) = R · π^k / sqrt(f),   R = (−1)^{1+⌊k/2⌋} · 2^{k−1}/k! · Σ_{a=1}^{f} χ(a) B_k(a/f),
//   and B_{k,χ} = f^{k−1} Σ_{a=1}^{f} χ(a) B_k(a/f) (generalised Bernoulli number).
// References: L. C. Washington, Introduction to Cyclotomic Fields, 2nd ed.,
// Springer 1997, Thm 4.2 (quoted from memory); H. Cohen,
// Number Theory Vol. II, Springer GTM 240 (2007), §10.3 (Prop. 10.3.5; quoted
// from memory). The tests check R against acb_dirichlet_l and PARI/GP.
//
// Ball route (large conductor, k ≥ 2): the Euler product over p ≤ P with a
// rigorous tail bound (see dirichlet_l_euler).
#include <flint/fmpz.h>

#include "core/flint_types.hpp"

namespace circlet {

/// Kronecker symbol (d/n) for n ≥ 1.
int kronecker_symbol(slong d, ulong n);
int kronecker_symbol(const Fmpz& d, const Fmpz& n);
/// (d/p) for a prime p and an integer d of any size: d mod 8 at p = 2, the
/// Legendre symbol of d mod p otherwise.
int kronecker_symbol_prime(const Fmpz& d, ulong p);

/// True when d is a fundamental discriminant (1 counts: the trivial character).
bool is_fundamental_discriminant(const Fmpz& d);

/// The fundamental discriminant d0 of Q(sqrt(D)) for a non-zero rational D
/// (1 when D is a positive rational square). Factors num and den of D.
Fmpz fundamental_discriminant(const Fmpq& D);

/// g ≥ 0 rational with |D| = |d0| · g², d0 = fundamental_discriminant(D).
Fmpq discriminant_cofactor(const Fmpq& D, const Fmpz& d0);

/// B_{k,χ_d} = f^{k−1} Σ_{a=1}^{f} χ(a) B_k(a/f), exact. Cost O(f·k) integer
/// operations: use for moderate conductor only. d fundamental, k ≥ 1.
Fmpq generalised_bernoulli(const Fmpz& d, ulong k);

/// R = (−1)^{1+⌊k/2⌋} 2^{k−1}/k! · B_{k,χ}/f^{k−1} from B = B_{k,χ_d} (f = |d|): the
/// step shared by every exact route that yields the generalised Bernoulli number.
Fmpq dirichlet_l_rational_from_bernoulli(const Fmpq& B, const Fmpz& d, ulong k);

/// R with L(k, χ_d) = R π^k / sqrt(f); requires χ_d(−1) = (−1)^k (d > 0 for
/// even k, d < 0 for odd k; d = 1 allowed for even k ≥ 2: ζ(k)).
Fmpq dirichlet_l_rational(const Fmpz& d, ulong k);

/// R for k = 2 and a fundamental d > 1 (even χ) without the O(f) Bernoulli sum:
/// Siegel's formula for the real quadratic field K = Q(sqrt d),
///   ζ_K(−1) = (1/60) Σ_{b ∈ Z, b² < d, b ≡ d (mod 2)} σ_1((d − b²)/4),
/// with ζ_K = ζ·L(·, χ_d), ζ(−1) = −1/12 and L(−1, χ) = −B_{2,χ}/2, gives
///   B_{2,χ} = 24 ζ_K(−1) = (2/5) Σ_b σ_1((d − b²)/4),   R = B_{2,χ}/f.
/// (C. L. Siegel, "Berechnung von Zetafunktionen an ganzzahligen Stellen",
/// Nachr. Akad. Wiss. Göttingen 1969; D. Zagier, "On the values at negative
/// integers of the zeta-function of a real quadratic field", Enseign. Math. 22
/// (1976); both quoted from memory. The tests check it against the Bernoulli sum.)
/// The σ_1 come from a sieve over b with the roots of b² ≡ d (mod p), p ≤ sqrt(d)/2:
/// cost ≈ sqrt(d) steps (dirichlet_l2_steps). Exact.
Fmpq dirichlet_l2_rational_divisor_sums(const Fmpz& d);

/// Sieve length of dirichlet_l2_rational_divisor_sums: about sqrt(d)/2.
double dirichlet_l2_steps(const Fmpz& d);

/// Ball for R π^k / sqrt(f).
void dirichlet_l_from_rational(arb_t res, const Fmpq& R, const Fmpz& d, ulong k, slong prec);

/// Exact rational Z with ζ(2k) = Z π^{2k}: Z = (−1)^{k+1} B_{2k} 2^{2k−1}/(2k)!.
Fmpq zeta_even_rational(ulong k);

/// L(k, χ_d) for k ≥ 2 by the Euler product over primes p ≤ P, times a ball
/// for the tail Π_{p>P} (1 − χ(p)p^{−k})^{−1} (the inequality is in the .cpp).
void dirichlet_l_euler(arb_t res, const Fmpz& d, ulong k, ulong P, slong prec);

/// The tail radius ε(P, k) used above: |log Π_{p>P}(1 − χ(p)p^{−k})^{−1}| ≤ ε.
void dirichlet_l_euler_tail(arb_t eps, ulong k, ulong P, slong prec);

/// A prime bound P so that the Euler-product tail is below 2^{−prec}, capped at max_P.
ulong dirichlet_l_euler_bound(ulong k, slong prec, ulong max_P);

/// Automatic choice: the exact route when f ≤ max_exact_conductor, else the
/// Euler product (k ≥ 2) with P ≤ max_P. For k = 1 and a conductor above the
/// limit the result is an indeterminate ball (mathematics out of reach here).
void dirichlet_l(arb_t res, const Fmpz& d, ulong k, slong prec,
                 ulong max_exact_conductor = 1000000, ulong max_P = 10000000);

}  // namespace circlet
