#pragma once
// Exact comparison of two count sequences along progressions, for the
// weights (3/2 and 2: t = 4, 5) where no certificate is possible: does
//   F(A n + B) = k · G(A' n + B')  for every tested n (in a residue class)?
#include <string>
#include <vector>

#include "core/flint_types.hpp"
#include "family/family.hpp"
#include "family/progression.hpp"
#include "series/integer_series.hpp"

namespace circlet {

enum class Relation { BothVanish, Proportional, NotProportional };
std::string relation_name(Relation r);  // "both-vanish", "proportional", "not-proportional"

struct ProportionalityResult {
  Relation relation = Relation::NotProportional;
  Fmpq k;               // the constant (Proportional only): F = k·G
  long tested = 0;      // number of n tested
  long witness = -1;    // NotProportional: an n where it fails (first after the defining one)
};

/// Tests F(A n+B) = k·G(A' n+B') for n ≤ K with n ≡ res (mod mod); the series
/// must reach A·K+B and A'·K+B'. k is taken from the first n with G ≠ 0
/// (if G vanishes on all tested n but F does not: not proportional).
ProportionalityResult compare_exact(const IntegerSeries& f, const Progression& ap, const IntegerSeries& g,
                                    const Progression& ap2, long K, long mod = 1, long res = 0);

/// One sub-progression n ≡ j (mod p) on which the pair is proportional.
struct SubProportionality {
  long p, j;
  Fmpq k;
};

/// The whole pair, and its sub-progressions modulo each p in `primes`.
struct ExactComparison {
  ProportionalityResult whole;
  std::vector<SubProportionality> sub;  // proportional classes (both-vanish classes excluded)
  std::vector<std::pair<long, long>> vanishing;  // classes (p, j) where both vanish
  std::string describe() const;  // one line
};

ExactComparison compare_pair_exact(const IntegerSeries& f, const Progression& ap, const IntegerSeries& g,
                                   const Progression& ap2, long K, const std::vector<long>& primes);

/// A relation an exact comparison suggests, handed to the prover (src/modform/proof.hpp).
struct ProvedRelation {
  std::string relation;  // in the syntax of `circlet prove`
  std::string verdict;   // "PROVED", "REFUTED" (with the first counterexample) or "UNKNOWN"
  std::string reason;    // the prover's one line
};

/// Every relation the comparison found, proved for all n or refuted: the whole pair
/// F(A n + B) = k·G(A' n + B'); a vanishing pair as F(..) = 0 and G(..) = 0; and per p,
/// the classes n ≡ j (mod p) — "for n mod p != j" when all but one class share k,
/// otherwise one relation per proportional or vanishing class.
std::vector<ProvedRelation> prove_exact_comparison(const ExactComparison& e, const Family& F, const Progression& ap,
                                                   const Family& G, const Progression& ap2);

/// One line: "PROVED: <relation>; REFUTED: <relation> (<reason>); …".
std::string describe_proved(const std::vector<ProvedRelation>& rs);

}  // namespace circlet
