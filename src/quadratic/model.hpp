#pragma once
// The quadratic-polynomial model of each family (docs/MATH.md §2): the count is the
// number of lattice points x with P(x) = n, and completing the square turns
// P(x) = n into Q(x + shift) = X := n + Δ for a positive definite form Q of
// rank r with Gram matrix S (Q(x) = xᵀ S x).
#include <vector>

#include "core/flint_types.hpp"
#include "family/family.hpp"

namespace circlet {

struct QuadraticModel {
  Family family;
  int rank = 0;       // r; the weight is r/2
  int vars = 0;       // number of variables of P: t (c_t), m = ⌊t/2⌋ (sc_t), S (sq_S)
  bool sum_zero = false;  // c_t: the variables satisfy Σ x_i = 0
  // P(x) = Σ quad[i]·x_i² + Σ lin[i]·x_i  (integer-valued on the lattice, with the constraint)
  std::vector<Fmpq> quad;
  std::vector<Fmpq> lin;
  std::vector<std::vector<Fmpq>> gram;  // r × r Gram matrix S of Q in free coordinates
  Fmpq det_gram;                         // det S
  Fmpq delta;                            // Δ, so X = n + Δ

  /// X = n + Δ.
  Fmpq X(const Fmpz& n) const;
  /// P(x) for an integer vector x of length `vars` (the constraint is not checked here).
  Fmpq evaluate(const std::vector<long>& x) const;
};

/// The model of docs/MATH.md §2 for a family.
QuadraticModel quadratic_model(const Family& family);

}  // namespace circlet
