#pragma once
// A pair of families compared along arithmetic progressions (docs/MATH.md §7):
// F is evaluated at A·n + B, G at A'·n + B', for n = 0, 1, 2, ...
// On the model side (docs/MATH.md §2) X_F(n) = A·n + B + Δ_F is an affine function
// of the progression variable n with integer slope A and rational constant.
#include <string>

#include "core/flint_types.hpp"
#include "family/family.hpp"
#include "family/progression.hpp"
#include "quadratic/model.hpp"

namespace circlet {

/// The family argument A·n + B for a (possibly large) progression index n.
Fmpz progression_at(const Progression& ap, const Fmpz& n);

/// X(n) = a·n + b with a = A and b = B + Δ of the model.
struct AffineX {
  Fmpz a;
  Fmpq b;
  Fmpq at(const Fmpz& n) const;
};

AffineX affine_x(const QuadraticModel& model, const Progression& ap);

/// The two families, their models and progressions. Construction checks the
/// families have the same weight (throws UserError saying why not).
struct ProgressionPair {
  QuadraticModel F, G;
  Progression apF, apG;
  AffineX xF, xG;
  ProgressionPair(const Family& f, const Progression& ap, const Family& g, const Progression& ap2);
  int rank() const { return F.rank; }
  /// Twice the weight, r.
  int twice_weight() const { return F.rank; }
  /// "5/2", "3".
  std::string weight_str() const;
  /// Same family on the same progression: the two sequences are identical.
  bool identical() const { return F.family == G.family && apF == apG; }
};

/// "5/2" or "3" for rank r.
std::string weight_string(int rank);

}  // namespace circlet
