#pragma once
// The space a q-series is known to lie in, and how the operators a statement
// about progressions needs move it (docs/MATH.md §8). Each rule is one function
// citing its source; where a rule has a condition that is not met, the function
// takes the safe larger level (a larger level only raises the Sturm bound).
//
// A space is M_k(Γ, χ) with χ = (D/·) quadratic (D squarefree, 1 = trivial) and
//   Γ = { γ ∈ Γ0(N) : d² ≡ 1 (mod M') } ∩ (kernels of up to `kernels` quadratic characters),
// M' = twist_mod (1: Γ = Γ0(N)). Twisting by every ψ mod M' multiplies χ by ψ², and every
// ψ² is trivial on d with d² ≡ 1 (ψ²(d) = ψ(d²)), so a sum of such twists transforms
// with χ on Γ; a sum of forms whose quadratic characters χ1 ≠ χ2 transforms with χ1 on
// Γ ∩ ker(χ1χ2). Γ contains Γ1(N) and −1; [Γ0(N) : Γ] ≤ φ(M')/#{d : d² ≡ 1 (M')} · 2^kernels.
// M_k(Γ1(N)) itself ("gamma1") is kept as the last safe choice.
// Half-integral weight follows Shimura's convention: 4 | N, multiplier of θ.
// The support (s mod S) records that every exponent m with a(m) ≠ 0 has m ≡ s (mod S).
//
// Sources (quoted from memory unless noted):
//  [Ono]  K. Ono, "The web of modularity", CBMS 102 (2004): Prop. 2.22 (U_d, V_d in
//         integral weight), Prop. 3.7 (U_d, V_d in half-integral weight, character
//         multiplied by (4d/·)).
//  [Kob]  N. Koblitz, "Introduction to elliptic curves and modular forms", GTM 97,
//         Prop. III.3.17: twist by a primitive ψ mod M lands in M_k(Γ0(N M²), χψ²)
//         (statement read in the Sage ticket #6837 that quotes it).
//  [Stu]  J. Sturm, in: Number Theory (New York 1984-85), Lecture Notes in Math. 1240
//         (1987; quoted from memory): if f ∈ M_k(Γ) (Γ a congruence subgroup) has integral coefficients and
//         a(m) ≡ 0 (mod ℓ) for m ≤ (k/12)[SL2(Z):Γ], then f ≡ 0 (mod ℓ); likewise "= 0".
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "core/flint_types.hpp"

namespace circlet {

struct FormSpace {
  long twice_weight = 0;
  long level = 1;
  long character = 1;  // D of (D/·); meaningless when gamma1
  bool gamma1 = false;
  long twist_mod = 1;  // M'
  int kernels = 0;
  long support_mod = 1;  // S
  long support_res = 0;  // s, 0 ≤ s < S
  bool zero = false;     // the series is identically zero (empty support)

  bool half_integral() const { return twice_weight % 2 != 0; }
  /// "M_{3/2}(Gamma0(12544), (7/.))" etc.
  std::string str() const;
  std::string character_str() const;
};

/// One step of an operator chain, as recorded in a proof certificate.
struct ChainStep {
  std::string op;    // "U_7", "V_2", "sieve m = 3 mod 8", "lift", "combine", "complement"
  std::string rule;  // the source of the rule
  FormSpace after;
};

/// Index [SL2(Z) : Γ0(N)] = N Π_{p|N} (1 + 1/p) (common practice; Ono §1.2).
Fmpz index_gamma0(long N);
/// Index [SL2(Z) : Γ1(N)] = N² Π_{p|N} (1 − 1/p²) for N ≥ 3 (the order of the image in
/// SL2(Z/N) of the upper unipotent-by-diagonal group: common practice); 1 and 3 for N = 1, 2.
Fmpz index_gamma1(long N);
/// [Γ0(N) : Γ] as bounded above: φ(M')/#{d mod M' : d² ≡ 1} · 2^kernels.
Fmpz group_index_factor(const FormSpace& V);
/// The index the Sturm bound uses for this space: [SL2(Z):Γ0(N)] · group_index_factor.
Fmpz space_index(const FormSpace& V);

/// [Stu] the largest m that must be checked: ⌊(k'/12)·index⌋, k' = k for integral
/// weight; for half-integral weight k' = k when the modulus is 0 or squarefree (apply
/// [Stu] to f², weight 2k: f ≡ 0 mod ℓ iff f² ≡ 0 since F_ℓ[[q]] has no zero
/// divisors, and ord f² = 2 ord f), and k' = k + 1/2 otherwise (apply it to f·θ,
/// θ = 1 + 2q + …, a unit of Z[[q]], on Γ0(lcm(N, 4)) = Γ0(N)). A modulus ℓ^j with
/// j > 1 follows from [Stu] by induction: f ≡ 0 mod ℓ gives f/ℓ in the same space.
Fmpz sturm_bound(const FormSpace& V, const Fmpz& modulus);
std::string sturm_rule(const FormSpace& V, const Fmpz& modulus);

// ---- the operators; each appends its step to `chain` -------------------------

/// View f on Γ0(N') for N | N' (Γ0(N') ⊂ Γ0(N): the definition).
FormSpace op_lift(const FormSpace& V, long N, std::vector<ChainStep>* chain);
/// V_d: Σ a(m) q^{dm}. [Ono] Prop 2.22: level Nd, χ. Half-integral: Prop 3.7: level Nd, (4d/·)χ.
FormSpace op_V(const FormSpace& V, long d, std::vector<ChainStep>* chain);
/// U_d: Σ a(dm) q^m. [Ono] Prop 2.22: when every prime of d divides N the level is
/// unchanged (U_d = Π U_p, each U_p with p | N), otherwise f is lifted to
/// N·Π_{p|d, p∤N} p first. Half-integral (level 4N'): Prop 3.7 needs d | N'; otherwise
/// lift to 4·lcm(N', d); character multiplied by (4d/·).
FormSpace op_U(const FormSpace& V, long d, std::vector<ChainStep>* chain);
/// The sieve Σ_{m ≡ r (mod M)} a(m) q^m, prime power by prime power: p^a | M with
/// p^a | r: U_{p^a} V_{p^a}; v_p(r) = b < a: U_{p^b}, then the class coprime to p
/// modulo p^{a−b} as (1/φ) Σ_ψ ψ̄(r') f⊗ψ ([Kob]: level · p^{2(a−b)}, character χψ²;
/// the sum of twists transforms with χ on Γ ∩ {d² ≡ 1 mod p^c}: twist_mod gains p^c;
/// when p^c ∈ {2, 3, 4, 8} that is all of Γ0),
/// then V_{p^b}. Prime powers on which the support already implies the class are skipped.
FormSpace op_sieve(const FormSpace& V, long r, long M, std::vector<ChainStep>* chain);
/// f − sieve(f): the complement of a class, in the space of both (lcm of levels).
FormSpace op_complement(const FormSpace& V, long r, long M, std::vector<ChainStep>* chain);
/// A linear combination: lcm of the levels and of the twist moduli; χ of the first term,
/// the group cut down to ker(χχ_i) for each term whose character χ_i differs.
/// Terms must have the same weight (CIRCLET_ASSERT; callers check first).
FormSpace op_combine(const std::vector<FormSpace>& terms, std::vector<ChainStep>* chain);

nlohmann::json space_to_json(const FormSpace& V);
nlohmann::json chain_to_json(const std::vector<ChainStep>& chain);

}  // namespace circlet
