#pragma once
// The families swept by the quadratic-stage tests: c_t and sc_t for 2 ≤ t ≤ 11,
// sq_S for 1 ≤ S ≤ 8.
#include <vector>

#include "family/family.hpp"

namespace circlet::testing {

inline std::vector<Family> swept_families() {
  std::vector<Family> out;
  for (int t = 2; t <= 11; ++t) {
    out.push_back({FamilyKind::Core, t});
    out.push_back({FamilyKind::SelfConjugateCore, t});
  }
  for (int s = 1; s <= 8; ++s) out.push_back({FamilyKind::SumOfSquares, s});
  return out;
}

}  // namespace circlet::testing
