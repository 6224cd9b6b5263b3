#pragma once
// The remainder E(n) = count(n) − M(n) (docs/MATH.md §6: the cusp part), exact
// where the main term is exact and a ball otherwise, normalised by
//   X^{(w−1)/2}  (Deligne's scale for integral weight: E = O(X^{(w−1)/2+ε}))
//   X^{w/2}      (Hecke's scale: E = O(X^{w/2}))
// with X = n + Δ, summary statistics over the range, an empirical fit of the
// growth exponent (growth_fit.hpp) and, where one is known, a certified
// closed-form bound (certified_bound.hpp).
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "arcs/growth_fit.hpp"
#include "core/flint_types.hpp"
#include "quadratic/model.hpp"

namespace circlet {

/// A main term: a ball, and the exact rational when one is known.
struct MainTermValue {
  Arb ball;
  std::optional<Fmpq> exact;
};
using MainTermFunction = std::function<MainTermValue(const Fmpz& n)>;

struct RemainderRow {
  Fmpz n;
  Fmpq X;
  Fmpz count;
  MainTermValue main;
  Arb remainder;                  // E(n) as a ball (radius 0 when exact)
  std::optional<Fmpq> remainder_exact;
  Arb deligne;                    // E / X^{(w−1)/2}
  Arb hecke;                      // E / X^{w/2}
  std::optional<Fmpq> certified_bound;  // B(n) ≥ |E(n)| when a certified bound exists
  bool within_certified_bound = false;  // proved |E(n)| ≤ B(n) (false: violated or undecided)
};

struct RemainderSummary {
  size_t rows = 0;
  double deligne_exponent = 0;  // (w−1)/2, in terms of X
  double hecke_exponent = 0;    // w/2
  Arb max_abs_deligne;          // max |E/X^{(w−1)/2}| (a ball: max of balls)
  Fmpz argmax_deligne;          // n attaining it (chosen by midpoints)
  Arb max_abs_hecke;
  Fmpz argmax_hecke;
  Arb mean_square_deligne;      // (1/rows) Σ (E/X^{(w−1)/2})²
  bool identically_zero = false;  // every E(n) is exactly 0
  std::optional<std::string> certified_statement;
  size_t certified_violations = 0;  // rows where |E| ≤ B was not proved
  GrowthFit fit;                    // empirical
};

struct RemainderTable {
  std::vector<RemainderRow> rows;
  RemainderSummary summary;
};

/// Rows for the given n with their exact counts; main terms from `main_term`.
RemainderTable remainder_table(const QuadraticModel& model, const std::vector<Fmpz>& ns,
                               const std::vector<Fmpz>& counts, const MainTermFunction& main_term,
                               slong prec);

}  // namespace circlet
