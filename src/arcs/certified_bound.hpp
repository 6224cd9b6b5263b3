#pragma once
// Certified closed-form bounds for the remainder E(n) = count − M(n): a hook
// where a family with a proved formula for its cusp part offers |E(n)| ≤ B(n).
//
// Instance c_7: E(n) = −a(n+2)/8, Σ a(m) q^m = η(τ)³η(7τ)³, a CM newform of
// weight 3 (docs/MATH.md §3: 8·c_7(n) = Σ_{d|m} (d/7)(m/d)² − a(m), m = n + 2).
// Its coefficients are a(m) = Σ over ideals of norm m of a Hecke character of
// Q(√−7) of ∞-type 2, so |a(p)| ≤ 2p and |a(m)| ≤ d(m)·m (Deligne's bound,
// elementary for CM forms: |ψ(𝔞)| = N𝔞), giving |E(n)| ≤ d(n+2)(n+2)/8.
// To add a bound: implement CertifiedRemainderBound and return it from
// certified_remainder_bound() for its family.
#include <memory>
#include <string>

#include "core/flint_types.hpp"
#include "family/family.hpp"

namespace circlet {

class CertifiedRemainderBound {
 public:
  virtual ~CertifiedRemainderBound() = default;
  /// The statement, e.g. "|E(n)| <= d(n+2)(n+2)/8".
  virtual std::string statement() const = 0;
  /// The theorem or computation it rests on.
  virtual std::string source() const = 0;
  /// B(n) ≥ |E(n)|, exact.
  virtual Fmpq bound(const Fmpz& n) const = 0;
};

/// The certified bound known for the family, or nullptr.
std::unique_ptr<CertifiedRemainderBound> certified_remainder_bound(const Family& family);

/// d(m), the number of divisors of m ≥ 1.
Fmpz divisor_count(const Fmpz& m);

}  // namespace circlet
