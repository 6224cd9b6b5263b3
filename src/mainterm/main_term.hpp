#pragma once
// The circle-method main term M(n) = σ_∞(X) · Π_p β_p(n) of a family
// (docs/MATH.md §3 and §5), exact where the mathematics makes it rational.
//
// Let w = r/2 and let S be the set of special primes: p | 2·t·d0 and p | X
// (numerator or denominator). Outside S every β_p is a quadratic-character
// Euler factor (docs/MATH.md §4):
//
//  * r even, χ = χ_{d0}, d0 = disc. of Q(sqrt((−1)^w det S)) (fixed by the family):
//      Π_p β_p = C / L(w, χ),   C = Π_{p∈S} β_p / (1 − χ(p) p^{−w}).
//    With L(w, χ) = R π^w / sqrt(f) and det S = f g², the π's and roots cancel:
//      M(n) = X^{w−1} · C / ((w−1)! · R · g)                     (exact rational)
//    times Siegel's factor 1/2 when r = 2 (weight 1: c_3, sq2, sc4, sc5).
//  * r odd, k = (r−1)/2, χ = χ_{d0}, d0 = disc. of Q(sqrt((−1)^k det S · X)) (depends on n):
//      Π_p β_p = C · L(k, χ)/ζ(2k),   C = Π_{p∈S} β_p (1 − χ(p)p^{−k}) / (1 − p^{−2k}).
//    With L(k, χ) = R π^k/sqrt(f), ζ(2k) = Z π^{2k}, Γ(k + 1/2) = (2k)! sqrt(π)/(4^k k!)
//    and X det S = f g²:
//      M(n) = X^k · 4^k k! · R · C / ((2k)! · Z · f · g)          (exact rational)
//    when f is small enough for the Bernoulli route; otherwise a ball
//    σ_∞ · L(k, χ)/ζ(2k) · C with L from its Euler product (k ≥ 2).
//    For r = 5 (weight 5/2) R comes from Siegel's divisor sums for ζ_K(−1)
//    (dirichlet_l.hpp) at cost ≈ sqrt(f)/2, so M(n) is exact there as well.
//    For r = 3 (weight 3/2) L(1, χ) = π H(f)/sqrt(f) is a class number, counted
//    exactly at cost ≈ sqrt(f/3) (class_number.hpp): M(n) is exact at every n
//    whose cost is below MainTermOptions::max_class_number_steps; beyond it
//    main_term refuses with a UserError that states the cost and the option.
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "core/flint_types.hpp"
#include "quadratic/model.hpp"

namespace circlet {

/// One special prime's contribution.
struct SpecialPrimeFactor {
  Fmpz p;            // may exceed a machine word (a prime factor of X)
  int valuation = 0;  // v_p(X) (negative when p divides the denominator of X)
  Fmpq beta;          // β_p(n), exact (local_density.hpp)
  int chi = 0;        // χ(p) of the L-value's character
  Fmpq correction;    // this prime's factor of C (see the header comment)
};

/// Every ingredient of M(n), for display (`--explain`) and for other stages.
struct MainTermParts {
  Fmpq X;
  int rank = 0;
  Fmpq det_gram;
  Arb sigma_inf;          // σ_∞(X)
  Fmpz discriminant;      // d0: the character is the Kronecker symbol (d0/·)
  Fmpq cofactor;          // g: |(−1)^w det S| = f g² (even r) or X det S = f g² (odd r)
  ulong L_argument = 0;   // s in L(s, χ): w (even r) or k (odd r)
  std::optional<Fmpq> L_rational;  // R with L(s, χ) = R π^s / sqrt(f), when computed
  Arb L_value;            // L(s, χ) as a ball
  std::string L_route;    // how L was obtained
  std::vector<SpecialPrimeFactor> special;
  Fmpq correction;        // C = product of the special primes' corrections
  bool accuracy_limited = false;  // the ball's width comes from a capped truncation (more precision cannot help)
};

struct MainTerm {
  std::optional<Fmpq> exact;  // present when M(n) was obtained as an exact rational
  Arb ball;                   // always set; contains M(n) (the exact value when exact is set)
  MainTermParts parts;
};

struct MainTermOptions {
  /// Largest conductor for the exact (Bernoulli) route of odd-rank L-values: cost O(f).
  ulong max_exact_conductor = 2000000;
  /// Weight 3/2: largest number of sieve steps (≈ sqrt(|d0|/3)) for the class
  /// number; 3·10^8 steps take a few seconds. The CLI's --class-number-steps.
  double max_class_number_steps = 3e8;
  /// Weight 5/2: largest sieve length (≈ sqrt(f)/2) for the exact L(2, χ) by divisor sums.
  double max_divisor_sum_steps = 3e8;
  /// Weight ≥ 7/2 (and 5/2 beyond the divisor-sum route): largest number of
  /// theta-series terms (dirichlet_l_theta_terms) for an exact L(k, χ) above
  /// max_exact_conductor. 0 (the default) keeps the Euler-product ball: callers
  /// that evaluate many rows choose it; `main --at` and `arcs --at` set it
  /// (their --l-value-terms).
  double max_theta_terms = 0;
  /// Threads of the theta route.
  int theta_threads = 2;
  /// Progress of the theta route (fraction done), e.g. for a progress line; may be empty.
  std::function<void(double)> theta_progress;
  /// Largest prime of the Euler product for the ball route.
  ulong max_euler_prime = 10000000;
  /// Compute σ_∞ and the L-value balls even on the exact path (for --explain).
  bool with_parts = true;
  /// Ball route only: stop before the L-value (parts without L_value and, unless
  /// with_parts, without σ_∞; ball indeterminate). Used by main_term_batch, which computes the L-values together.
  bool skip_l_value = false;
};

/// The refusal message for a weight-3/2 class number above `max_steps`: the cost and the option that lifts it.
std::string class_number_refusal(const Fmpz& f, double max_steps);

/// Throws UserError when the family's rank is below 2 (no main term of this
/// shape) or when X = n + Δ ≤ 0.
void check_main_term_input(const QuadraticModel& model, const Fmpz& n);

/// M(n) at working precision `prec` (bits).
MainTerm main_term(const QuadraticModel& model, const Fmpz& n, slong prec, const MainTermOptions& options = {});

struct CertifiedMainTerm {
  MainTerm term;
  bool certified = false;  // true: exact, or the ball has ≥ `digits` correct significant digits
  slong prec = 0;          // the last precision tried
};

/// Raises the precision (doubling from about digits·log2(10) + 20 bits up to
/// max_prec) until the ball has relative accuracy of `digits` decimal digits.
/// Gives up and reports certified = false rather than looping: at max_prec, at
/// once when the Euler product's prime bound was capped at options.max_euler_prime
/// (parts.accuracy_limited: the tail, not rounding, sets the width), or as soon as
/// doubling the precision gains fewer than 3 bits.
CertifiedMainTerm main_term_certified(const QuadraticModel& model, const Fmpz& n, slong digits,
                                      slong max_prec = 4096, const MainTermOptions& options = {});

/// NOT CERTIFIED: a floating-point approximation for bulk tables and plots.
/// Exact rational converted to double for even rank; for odd rank σ_∞ and the
/// truncated Euler product over p ≤ euler_prime in double (no tail bound).
double main_term_fast(const QuadraticModel& model, const Fmpz& n, ulong euler_prime = 20000);

}  // namespace circlet
