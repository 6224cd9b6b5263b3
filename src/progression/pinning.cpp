#include "progression/pinning.hpp"

#include <algorithm>

#include "core/error.hpp"
#include "quadratic/local_density.hpp"

namespace circlet {

int residue_data_precision(const QuadraticModel& model, ulong p) {
  const Family& f = model.family;
  if ((f.kind == FamilyKind::Core || f.kind == FamilyKind::SelfConjugateCore) && f.t % static_cast<long>(p) == 0)
    return 0;
  return p == 2 ? 3 : 1;
}

slong valuation(const Fmpq& x, ulong p) {
  CIRCLET_ASSERT(!x.is_zero(), "valuation of zero");
  Fmpz pp = Fmpz::from_ui(p);
  Fmpz tmp;
  slong vn = fmpz_remove(tmp, fmpq_numref(x.get()), pp);
  slong vd = fmpz_remove(tmp, fmpq_denref(x.get()), pp);
  return vn - vd;
}

bool is_pinned(const QuadraticModel& model, const AffineX& x, ulong p, ulong e, const Fmpz& r) {
  int kappa = residue_data_precision(model, p);
  if (kappa == 0) return true;
  // X must be p-integral where the closed forms are used (see pinning.hpp).
  CIRCLET_ASSERT(fmpz_divisible_si(fmpq_denref(x.b.get()), static_cast<slong>(p)) == 0,
                 "X not p-integral at a non-structural prime");
  Fmpq x0 = x.at(r);
  if (x0.is_zero()) return false;
  slong v0 = valuation(x0, p);
  Fmpz tmp;
  slong va = fmpz_remove(tmp, x.a, Fmpz::from_ui(p));
  // pinned  <=>  v0 + κ ≤ v_p(a) + e
  return v0 + kappa <= va + static_cast<slong>(e);
}

Fmpq PinnedClass::rho() const {
  CIRCLET_ASSERT(defined(), "rho with beta_G = 0");
  Fmpq q;
  fmpq_div(q, betaF, betaG);
  return q;
}

ulong default_pin_depth(const ProgressionPair& pair, ulong p) {
  Fmpz tmp;
  slong va = fmpz_remove(tmp, pair.xF.a, Fmpz::from_ui(p));
  slong vb = fmpz_remove(tmp, pair.xG.a, Fmpz::from_ui(p));
  int kappa = std::max(residue_data_precision(pair.F, p), residue_data_precision(pair.G, p));
  return static_cast<ulong>(std::max(va, vb) + kappa + 2);
}

std::vector<PinnedClass> pinned_classes(const ProgressionPair& pair, ulong p, ulong e_max, bool* complete) {
  std::vector<PinnedClass> out;
  if (complete) *complete = true;
  // Breadth-first refinement of the class tree.
  struct Node { Fmpz r; ulong e; };
  std::vector<Node> level{{Fmpz(0), 0}};
  Fmpz pe(1);  // p^e of the current level
  for (ulong e = 0; e <= e_max && !level.empty(); ++e) {
    std::vector<Node> next;
    for (auto& node : level) {
      if (is_pinned(pair.F, pair.xF, p, e, node.r) && is_pinned(pair.G, pair.xG, p, e, node.r)) {
        PinnedClass c;
        c.p = p;
        c.e = e;
        c.r = node.r;
        c.betaF = local_density(pair.F, progression_at(pair.apF, node.r), p);
        c.betaG = local_density(pair.G, progression_at(pair.apG, node.r), p);
        out.push_back(std::move(c));
      } else if (e == e_max) {
        if (complete) *complete = false;
      } else {
        for (ulong j = 0; j < p; ++j) {
          Fmpz child;
          fmpz_mul_ui(child, pe, j);
          fmpz_add(child, child, node.r);
          next.push_back({child, e + 1});
        }
      }
    }
    level = std::move(next);
    fmpz_mul_ui(pe, pe, p);
  }
  std::sort(out.begin(), out.end(), [](const PinnedClass& a, const PinnedClass& b) {
    return a.e != b.e ? a.e < b.e : fmpz_cmp(a.r, b.r) < 0;
  });
  return out;
}

}  // namespace circlet
