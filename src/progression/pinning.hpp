#pragma once
// Pinning a local density on a residue class of the progression variable.
//
// Which residue data β_p(X) uses (read off the closed forms of docs/MATH.md §4):
//  * p | t for c_t or sc_t: β_p = 1 for every n. Nothing to pin.
//  * p odd, p ∤ t: β_p is a function of v = v_p(X) and of the Legendre symbol
//    of the unit part u = X/p^v (odd rank; even rank uses v only). So it is
//    determined by (v, u mod p).
//  * p = 2, p ∤ t: for c_t (t odd) the even-rank formula uses v only; for sc_t
//    (t odd) and sq_S, β_2 is the density of a sum of squares at X/t, given by
//    the recursion β(N) = β*(N) + 2^{2−m}β(N/4)[4 | N] with β* a function of
//    N mod 8; unwinding it, β_2 is a function of (v, u mod 8). We use
//    (v, u mod 8) for every p = 2 case (for c_t it is more than needed: safe).
// In every case X is p-integral: the denominators of Δ are 3 and 8 and occur
// only when 3 | t, resp. 2 | t (checked by assertion).
//
// Constancy on a class. On n ≡ r (mod p^e), X(n) = X(r) + a·p^e·k (k ∈ Z) with
// a = A. Let v0 = v_p(X(r)). If v0 + κ ≤ v_p(a) + e (κ = 1 for odd p, κ = 3
// for p = 2) then every X(n) in the class has v_p = v0 and unit part
// ≡ X(r)/p^{v0} (mod p^κ), because the added term is divisible by p^{v0+κ}.
// Conversely, if v0 + κ > v_p(a) + e, then k = 1 changes the unit part modulo
// p^κ (or the valuation), so the data are not constant. Hence "pinned" is
// exactly the condition v0 + κ ≤ v_p(A) + e, and then β_p on the class equals
// β_p at the representative n = r: that is how pinned factors are evaluated.
#include <vector>

#include "core/flint_types.hpp"
#include "progression/progression_pair.hpp"

namespace circlet {

/// κ of the comment above: 0 when β_p is constant for the model (p | t for c_t,
/// sc_t), 1 for odd p, 3 for p = 2.
int residue_data_precision(const QuadraticModel& model, ulong p);

/// v_p of a nonzero rational.
slong valuation(const Fmpq& x, ulong p);

/// Is the residue data of β_p(X(n)) constant on n ≡ r (mod p^e)?
bool is_pinned(const QuadraticModel& model, const AffineX& x, ulong p, ulong e, const Fmpz& r);

/// One class n ≡ r (mod p^e) on which both β_p^F and β_p^G are pinned, with
/// their exact values (evaluated by the closed forms at the representative r).
struct PinnedClass {
  ulong p = 0;
  ulong e = 0;
  Fmpz r;      // 0 ≤ r < p^e
  Fmpq betaF;  // β_p^F(A·r + B)
  Fmpq betaG;  // β_p^G(A'·r + B')
  /// ρ_p = βF/βG; only meaningful when βG ≠ 0.
  Fmpq rho() const;
  bool defined() const { return !betaG.is_zero(); }
};

/// The pinned classes of a pair at p: a partition of Z (for the progression
/// variable) into classes n ≡ r (mod p^e), refined from the class of all n by
/// splitting into p subclasses until both sides are pinned, down to e_max.
/// Classes still unpinned at e_max (around the p-adic zeros of X_F, X_G) are
/// left out. Sorted by (e, r).
/// If `complete` is given, it is set to whether nothing was left out (the
/// classes then partition Z).
std::vector<PinnedClass> pinned_classes(const ProgressionPair& pair, ulong p, ulong e_max, bool* complete = nullptr);

/// The default depth used by certify: max(v_p(A), v_p(A')) + κ + 2.
ulong default_pin_depth(const ProgressionPair& pair, ulong p);

}  // namespace circlet
