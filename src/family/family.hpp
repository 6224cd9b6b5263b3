#pragma once
// The counted families and their generating functions (docs/MATH.md §1).
//   c<T>  : t-core partitions c_t(n)
//   sc<T> : self-conjugate t-cores sc_t(n)
//   sq<S> : representations r_S(n) of n as a sum of S squares (a family with
//           published exact answers, used to test the main-term machinery)
// Each generating function is an eta quotient  Π_d Π_{k≥1} (1 − q^{dk})^{e_d}
// with no leading q-power.
#include <string>
#include <vector>

namespace circlet {

enum class FamilyKind { Core, SelfConjugateCore, SumOfSquares };

/// One factor Π_{k≥1} (1 − q^{d k})^{e} of an eta quotient.
struct EtaFactor {
  long d;
  long e;
  bool operator==(const EtaFactor& o) const { return d == o.d && e == o.e; }
};
using EtaQuotient = std::vector<EtaFactor>;

struct Family {
  FamilyKind kind;
  int t;  // T for c<T>, sc<T>; S for sq<S>

  static constexpr int kMaxT = 1000;

  /// Parses "c7", "sc13", "sq5". Throws UserError with a clear message on
  /// unknown prefixes, non-numeric or out-of-range T (1..kMaxT).
  static Family parse(const std::string& name);
  std::string name() const;
  /// Human-readable description, e.g. "7-core partitions".
  std::string description() const;

  /// Rank r of the quadratic form (docs/MATH.md §2): t−1, ⌊t/2⌋, or S.
  int rank() const;
  /// Twice the weight of the generating function: 2w = r.
  int twice_weight() const { return rank(); }
  bool integral_weight() const { return rank() % 2 == 0; }

  /// The generating function as an eta quotient, factors combined by d, d ascending.
  EtaQuotient eta_quotient() const;

  bool operator==(const Family& o) const { return kind == o.kind && t == o.t; }
  bool operator!=(const Family& o) const { return !(*this == o); }
};

/// Combines factors with equal d, drops zero exponents, sorts by d.
EtaQuotient normalise(EtaQuotient q);

}  // namespace circlet
