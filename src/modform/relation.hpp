#pragma once
// The statement `circlet prove` proves, in a syntax a mathematician reads:
//
//   c4(27n+5) = 3*c4(3n)
//   c4(7n+2) = 2*sc7(8n+1) for n mod 7 != 4
//   c5(5n+4) == 0 mod 5          c5(25n+24) == 0 mod 5^2
//   sc5(2n+1) - sc5(n) = 0       c8(81n+21) == 0 mod 2
//
// Grammar (spaces ignored):
//   relation := side ("=" | "==") side [ ["("] "mod" INT ["^" INT] [")"] ]
//               [ "for" "n" "mod" INT ("=" | "==" | "!=") INT ]
//   side     := ["+" | "-"] term { ("+" | "-") term }
//   term     := "0" | [RATIONAL ["*"]] FAMILY "(" arg ")"
//   arg      := [INT ["*"]] "n" ["+" INT]                           (A n + B)
//             | [INT ["*"]] ( "n" | "(" "n" ["-" INT] ")" ) "/" INT ["+" INT]
//                                                               (A (n - j)/d + B)
// FAMILY is c<T>, sc<T> or sq<S>; the argument A n + B needs A ≥ 1, B ≥ 0.
// A dilated term F(A(n-j)/d + B) (d ≥ 2, 0 ≤ j < d), e.g. c4((n-4)/7) or
// 3*sc7(8(n-4)/7+1), is F(A(n-j)/d + B) when n ≡ j (mod d) and 0 otherwise: its
// series in n is the image under V_d of the ordinary term's (docs/MATH.md §8 (b)).
// "=" without "mod" is an identity for every n ≥ 0 (in the class, if given);
// with "mod ℓ^k" a congruence (integer coefficients only).
#include <string>
#include <vector>

#include "core/flint_types.hpp"
#include "family/family.hpp"

namespace circlet {

struct RelationTerm {
  Fmpq coeff;  // λ_i: the relation is Σ λ_i F_i(A_i n + B_i) = 0 (or ≡ 0)
  Family family;
  long A = 1, B = 0;
  long d = 1, j = 0;  // d ≥ 2: the dilated term F(A(n-j)/d + B), 0 off n ≡ j (mod d)
  bool dilated() const { return d > 1; }
  /// The term's value of the progression at this n: A(n-j)/d + B, or -1 when the
  /// term vanishes there (dilated, n ≢ j mod d).
  long argument(long n) const { return d == 1 ? A * n + B : (n % d == j ? A * ((n - j) / d) + B : -1); }
  /// "c4(7n+2)", "c4((n-4)/7)", "sc7(8(n-4)/7+1)", "c4(n/7)" (no coefficient).
  std::string str() const;
};

struct LinearRelation {
  std::vector<RelationTerm> terms;  // right-hand side moved over with negated coefficients
  Fmpz modulus;                     // 0: identity
  bool restricted = false;          // "for n mod Q (=|!=) r"
  long Q = 1, r = 0;
  bool complement = false;          // "!="
  /// The relation written back in the input syntax, canonical (left = terms, right 0).
  std::string str() const;
};

/// Parses the syntax above; UserError naming the problem (and where) otherwise.
LinearRelation parse_relation(const std::string& text);

}  // namespace circlet
