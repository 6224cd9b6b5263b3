#pragma once
// Models for the arcs tests, written out by hand from docs/MATH.md §2 so that the
// Gauss-sum route is tested against an independent copy:
//   c_t : Σ x_i = 0, P = (t/2) Σ x_i² + Σ i·x_i, rank t − 1
//   sc_t: P = t Σ y_i² + Σ (2i + 1 − t) y_i, m = ⌊t/2⌋ variables, rank m
//   sq_S: P = Σ x_i², rank S
#include <string>

#include "family/family.hpp"
#include "quadratic/model.hpp"

namespace circlet {

inline QuadraticModel test_model(const std::string& name) {
  QuadraticModel m;
  m.family = Family::parse(name);
  const int t = m.family.t;
  switch (m.family.kind) {
    case FamilyKind::Core:
      m.vars = t;
      m.rank = t - 1;
      m.sum_zero = true;
      for (int i = 0; i < t; ++i) {
        m.quad.emplace_back(t, 2);
        m.lin.emplace_back(i);
      }
      break;
    case FamilyKind::SelfConjugateCore:
      m.vars = m.rank = t / 2;
      for (int i = 0; i < t / 2; ++i) {
        m.quad.emplace_back(t);
        m.lin.emplace_back(2 * i + 1 - t);
      }
      break;
    case FamilyKind::SumOfSquares:
      m.vars = m.rank = t;
      for (int i = 0; i < t; ++i) {
        m.quad.emplace_back(1);
        m.lin.emplace_back(0);
      }
      break;
  }
  return m;
}

}  // namespace circlet
