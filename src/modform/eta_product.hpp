#pragma once
// Eta quotients f = Π_δ η(δτ)^{r_δ} as modular forms (docs/MATH.md §8): the
// normalisation of a family's generating function to integral q-exponents, the
// level and character by Gordon–Hughes–Newman (with the θ-division for
// half-integral weight), the orders at every cusp by Ligozat, holomorphy.
//
// Sources (checked against their published statements where noted, otherwise
// "quoted from memory"):
//  [GHN]  B. Gordon, K. Hughes, "Multiplicative properties of η-products II" (1993)
//         and M. Newman, "Construction and application of a class of modular
//         functions" I/II (1957, 1959); stated as Theorem 1.64 in K. Ono, "The web of
//         modularity" (CBMS 102, 2004). Quoted from memory.
//  [Lig]  G. Ligozat, "Courbes modulaires de genre 1" (1975); Theorem 1.65 in Ono,
//         "The web of modularity" (2004). Quoted from memory.
//  [Shi]  G. Shimura, "On modular forms of half integral weight", Ann. of Math. (1973):
//         half-integral weight on Γ0(4N) with the multiplier of θ. Quoted from memory.
#include <string>
#include <vector>

#include "core/flint_types.hpp"
#include "family/family.hpp"

namespace circlet {

/// One factor η(δτ)^r.
struct EtaPower {
  long delta;
  long r;
  bool operator==(const EtaPower& o) const { return delta == o.delta && r == o.r; }
};

/// Π η(δτ)^{r_δ}, δ ascending, no zero exponents.
struct EtaProduct {
  std::vector<EtaPower> factors;

  /// Twice the weight: Σ r_δ.
  long twice_weight() const;
  /// Σ δ r_δ (24 × the order at ∞).
  long order_sum() const;
  /// "eta(32t)^4 eta(8t)^-1"
  std::string str() const;
  /// The same product with every δ multiplied by D (f(τ) ↦ f(Dτ)).
  EtaProduct dilate(long D) const;
  /// The product of two eta products (exponents added).
  EtaProduct times(const EtaProduct& o) const;
};

/// A family's generating function Σ F(n) q^n = Π (1 − q^{dk})^{e_d} as an
/// eta quotient in integral exponents: with s = Σ d e_d / 24 = u/D in lowest
/// terms, Π_d η(D d τ)^{e_d} = Σ_n F(n) q^{D n + u}. (Definition of η.)
struct FamilyForm {
  Family family;
  EtaProduct eta;
  long D = 1;      // the dilation
  long shift = 0;  // u = D·s: F(n) is the coefficient of q^{D n + shift}
};
FamilyForm family_form(const Family& family);

/// θ(τ) = Σ q^{n²} = η(2τ)^5 / (η(τ)^2 η(4τ)^2) (Jacobi triple product).
EtaProduct theta_eta_product();

/// [GHN] conditions at level N for an eta product of integral weight k = ½Σr:
/// every δ | N, Σ δ r_δ ≡ 0 and Σ (N/δ) r_δ ≡ 0 (mod 24).
bool ghn_conditions_hold(const EtaProduct& f, long N);

/// The squarefree integer D_χ with χ(d) = (D_χ / d) (Kronecker) on d > 0 coprime
/// to the level: the squarefree part of s, signed. [GHN]: χ(d) = ((−1)^k s / d),
/// s = Π δ^{r_δ} (a rational number; its squarefree part is that of num·den).
long ghn_character(const EtaProduct& f);

/// The level, weight and character of an eta product, with the rule used.
struct EtaModularity {
  bool ok = false;        // false: no level ≤ the search limit satisfies the conditions
  long level = 0;
  long twice_weight = 0;
  long character = 1;     // D_χ (1 = trivial)
  std::string rule;       // which theorem, including the θ-division when used
  EtaProduct weight_zero; // f/θ^{2k} for half-integral weight (empty otherwise)
};
/// Integral weight: the least N (multiple of lcm δ) satisfying [GHN]; χ as above.
/// Half-integral weight (Σ r odd): f = (f/θ^{Σr})·θ^{Σr}; the least N divisible by 4
/// and lcm δ for which the weight-0 quotient f/θ^{Σr} satisfies [GHN]; the
/// character of f in Shimura's sense [Shi] is that of the quotient (θ has the
/// trivial character on Γ0(4) by the definition of the multiplier).
EtaModularity eta_modularity(const EtaProduct& f);

/// [Lig] order of f at the cusp c/d, d | N: (N/24) Σ_δ gcd(d,δ)² r_δ / (gcd(d,N/d) d δ).
Fmpq ligozat_order(const EtaProduct& f, long N, long d);
/// Orders at the cusps c/d for every divisor d of N (d ascending).
std::vector<std::pair<long, Fmpq>> ligozat_orders(const EtaProduct& f, long N);
/// True when every Ligozat order is ≥ 0 (f holomorphic at all cusps of Γ0(N)).
bool holomorphic_at_cusps(const EtaProduct& f, long N);

/// Squarefree part of a nonzero integer, sign kept.
long squarefree_part(long x);
/// Divisors of n ≥ 1, ascending.
std::vector<long> divisors(long n);
/// Distinct prime factors of n ≥ 1, ascending.
std::vector<long> prime_factors(long n);

}  // namespace circlet
