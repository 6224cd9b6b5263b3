#pragma once
// Exact comparison of two count sequences along progressions, for the
// weights (3/2 and 2: t = 4, 5) where no certificate is possible: does
//   F(A n + B) = k · G(A' n + B')  for every tested n (in a residue class)?
#include <memory>
#include <optional>
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

/// The exact counts a comparison used: F(m) = f[m], G(m) = g[m], n = 0..K compared.
struct ComparedCounts {
  std::vector<Fmpz> f, g;
  long K = 0;
};

/// The whole pair, and its sub-progressions modulo each p in `primes`.
struct ExactComparison {
  ProportionalityResult whole;
  std::vector<SubProportionality> sub;  // proportional classes (both-vanish classes excluded)
  std::vector<std::pair<long, long>> vanishing;  // classes (p, j) where both vanish
  /// A copy of the counts, kept only when some p has exactly p − 1 classes sharing one k
  /// (a lone exception class, where find_dilated_term looks for an extra term).
  std::shared_ptr<const ComparedCounts> counts;
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

/// Largest A'' tried for the extra dilated term K(A'' k + B'').
inline constexpr long kDilatedMaxA = 64;
/// Fewer compared values k than this on the exception class: no fit is claimed.
inline constexpr long kDilatedMinValues = 8;

/// An extra dilated term found on the exception class n = p k + j of a relation
/// F(A n + B) = λ G(A' n + B') (for n mod p != j): for every compared k,
///   F(A(pk+j)+B) − λ G(A'(pk+j)+B') = μ K(A'' k + B''),  K ∈ {F, G},
/// i.e. F(A n + B) = λ G(A' n + B') + μ K(A''(n−j)/p + B'') for every compared n.
struct DilatedFit {
  Family K;
  long A2 = 1, B2 = 0;  // A'', B''
  Fmpq mu;
  long tested = 0;      // values k compared on the class
  std::string relation; // in the syntax of `circlet prove`
};

/// Searches the aligned candidates K(A'' k + B'') (K = F, then G; A'' = 1..max_A; B'' fixed
/// by the alignment β'' = (j + β)/p of docs/MATH.md §8 (b)) by exact comparison of the
/// counts kept in e.counts; the first that fits, or none. Needs e.counts (else none).
std::optional<DilatedFit> find_dilated_term(const ExactComparison& e, const Family& F, const Progression& ap,
                                          const Family& G, const Progression& ap2, long p, long j, const Fmpq& lambda,
                                          long max_A = kDilatedMaxA);

/// Every relation the comparison found, proved for all n or refuted: the whole pair
/// F(A n + B) = k·G(A' n + B'); a vanishing pair as F(..) = 0 and G(..) = 0; and per p,
/// the classes n ≡ j (mod p) — "for n mod p != j" when all but one class share k,
/// otherwise one relation per proportional or vanishing class. For a lone exception
/// class, the relation with an extra dilated term (find_dilated_term), when one fits
/// the counts, is proved for all n too and reported after the restricted one.
std::vector<ProvedRelation> prove_exact_comparison(const ExactComparison& e, const Family& F, const Progression& ap,
                                                   const Family& G, const Progression& ap2);

/// One line: "PROVED: <relation>; REFUTED: <relation> (<reason>); …".
std::string describe_proved(const std::vector<ProvedRelation>& rs);

}  // namespace circlet
