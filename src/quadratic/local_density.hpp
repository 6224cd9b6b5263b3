#pragma once
// Local densities β_p(n) (docs/MATH.md §4) and the circle method's p-power arc
// pieces A_{p^j}(n)/p^{jw} (docs/MATH.md §6), as exact rationals.
//
//   β_p(n) = lim_j N_j(n) / p^{j(r−1)},  N_j(n) = #{x mod p^j : P(x) ≡ n (mod p^j)}
//   (for c_t: x ∈ (Z/p^j)^t with Σ x_i ≡ 0, normalised by p^{j(t−2)}).
#include <vector>

#include "core/flint_types.hpp"
#include "quadratic/model.hpp"

namespace circlet {

/// β_p(n) from the closed forms (p | t; good odd p, even and odd rank, any
/// valuation of X; the 2-adic cases). Exact. p must be prime.
Fmpq local_density(const QuadraticModel& model, const Fmpz& n, ulong p);
/// The same for a prime of any size (e.g. a factor of X beyond 64 bits).
Fmpq local_density(const QuadraticModel& model, const Fmpz& n, const Fmpz& p);

/// Reference route, for tests and `verify` only: N_j(n)/p^{j(r−1)} by direct
/// counting modulo p^j (see local_value_counts). p^j ≤ 2^22; fast up to about 3·10^4
/// (c_11 modulo 13^4: ~0.5 s; modulo 2^12: ~0.2 s; sc_t, sq_S: milliseconds).
Fmpq local_density_by_counting(const QuadraticModel& model, const Fmpz& n, ulong p, int j);

/// An exponent j such that N_{j'}(n)/p^{j'(r−1)} = β_p(n) for every j' ≥ j (stabilisation is
/// proved, not observed: it follows from Hensel lifting, see local_density.cpp). The values:
/// 1 when p | t (c_t, sc_t); v_p(X) + 1 where the form is unimodular at p (odd p ∤ t, and p = 2
/// for c_t with t odd); v_2(X) + 3 at p = 2 for sc_t with t odd and for sq_S.
int local_density_stable_exponent(const QuadraticModel& model, const Fmpz& n, ulong p);
int local_density_stable_exponent(const QuadraticModel& model, const Fmpz& n, const Fmpz& p);

/// The arc piece A_{p^j}(n)/p^{jw} = N_j/p^{j(r−1)} − N_{j−1}/p^{(j−1)(r−1)} for j ≥ 1
/// (equal to 1 for j = 0). Exact; zero for j beyond the stable exponent.
Fmpq local_arc_piece(const QuadraticModel& model, const Fmpz& n, ulong p, int j);
Fmpq local_arc_piece(const QuadraticModel& model, const Fmpz& n, const Fmpz& p, int j);

/// True when p | 2t (or p = 2 for sq_S), i.e. a prime where the closed forms
/// for good primes do not apply; primes dividing X are handled by every form.
bool is_structural_prime(const QuadraticModel& model, ulong p);

// ---------------------------------------------------------------------------
// Additions for assembling Π_p β_p (docs/MATH.md §5) and for the counting reference.
//
// Every function above and below throws UserError when p is not prime, when the
// family has rank 0 (c1, sc1), or when X = n + Δ = 0 (the density diverges there).

/// The normalised count N_j(n)/p^{j(r−1)} from the closed forms (no counting), j ≥ 0.
/// Equals Σ_{i≤j} local_arc_piece(i) and equals local_density for j ≥ the stable exponent.
Fmpq local_density_level(const QuadraticModel& model, const Fmpz& n, ulong p, int j);
Fmpq local_density_level(const QuadraticModel& model, const Fmpz& n, const Fmpz& p, int j);

/// The finite set of primes (ascending) at which β_p(n) may differ from the generic
/// factor: the structural primes (p | 2t; p = 2 for sq_S) and the primes dividing the
/// numerator or the denominator of X = n + Δ in lowest terms (so also every prime of the
/// character's discriminant, which divides det S · X up to squares). Factors X with FLINT. Primes may exceed 64 bits
/// (X of c_t carries the factor 24 of its denominator into the numerator), so they are Fmpz;
/// every closed-form function has an Fmpz-prime overload.
std::vector<Fmpz> local_density_special_primes(const QuadraticModel& model, const Fmpz& n);

/// The discriminant D of the quadratic character χ(p) = (D/p) (Kronecker symbol) that
/// fixes β_p at every prime outside local_density_special_primes(model, n):
///   r even:  β_p(n) = 1 − (D/p)·p^{−r/2},     D from (−1)^{r/2}·det S   (independent of n)
///   r odd:   β_p(n) = 1 + (D/p)·p^{(1−r)/2},  D from (−1)^{(r−1)/2}·det S·X (depends on n)
/// D is the fundamental discriminant of Q(√d), d the squarefree kernel of that rational
/// number (d = 1 gives D = 1, the trivial character). For such p, (D/p) ≠ 0.
/// c_t, t odd: D = (−1)^{(t−1)/2}·t made fundamental; sc_t and sq_S of even rank: D = 1 or −4.
Fmpz local_character_discriminant(const QuadraticModel& model, const Fmpz& n);

/// The generic factor at a prime p outside the special primes, from D above:
/// 1 − (D/p)p^{−r/2} (r even), 1 + (D/p)p^{(1−r)/2} (r odd). Throws UserError if p is special.
Fmpq local_density_generic_factor(const QuadraticModel& model, const Fmpz& n, ulong p);
Fmpq local_density_generic_factor(const QuadraticModel& model, const Fmpz& n, const Fmpz& p);

/// Counting reference: entry c (0 ≤ c < p^j) is #{x mod p^j : P(x) ≡ c (mod p^j)} (with
/// Σx ≡ 0 for c_t). Separable forms (sc_t, sq_S) multiply one-variable histograms; c_t at
/// p ∤ t is first block-diagonalised over Z/p^j by unimodular column operations; c_t at
/// p | t uses local_value_counts_literal. Throws UserError when p^j is too large.
std::vector<Fmpz> local_value_counts(const QuadraticModel& model, ulong p, int j);

/// The same table for c_t by the literal definition (dynamic programming over the t
/// coordinates with state (P mod p^j, Σx mod p^j)); small p^j only (t·p^{3j} ≲ 4·10^8).
std::vector<Fmpz> local_value_counts_literal(const QuadraticModel& model, ulong p, int j);

}  // namespace circlet
