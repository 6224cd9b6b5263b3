#include "progression/pinning.hpp"

#include <catch2/catch.hpp>

#include "quadratic/local_density.hpp"

using namespace circlet;

namespace {
Fmpq counted(const QuadraticModel& m, const Fmpz& n, ulong p) {
  return local_density_by_counting(m, n, p, local_density_stable_exponent(m, n, p));
}
}  // namespace

TEST_CASE("pinning is exactly v_p(X(r)) + kappa <= v_p(A) + e", "[progression][pinning]") {
  // c7: Δ = (49 − 1)/24 = 2, X = n + 2 (docs/MATH.md §2).
  ProgressionPair pair(Family::parse("c7"), Progression{1, 0}, Family::parse("sc13"), Progression{1, 0});
  CHECK(is_pinned(pair.F, pair.xF, 5, 1, Fmpz(1)));    // X ≡ 3 (mod 5): unit, pinned mod 5
  CHECK_FALSE(is_pinned(pair.F, pair.xF, 5, 1, Fmpz(3)));  // X ≡ 0 (mod 5): v not fixed
  CHECK(is_pinned(pair.F, pair.xF, 5, 2, Fmpz(3)));    // X ≡ 5 (mod 25): v = 1, unit 1 mod 5
  CHECK_FALSE(is_pinned(pair.F, pair.xF, 5, 2, Fmpz(23)));  // X ≡ 0 (mod 25)
  CHECK(is_pinned(pair.F, pair.xF, 7, 0, Fmpz(0)));    // 7 | t: β_7 = 1 always
  CHECK(residue_data_precision(pair.F, 7) == 0);
  CHECK(residue_data_precision(pair.G, 2) == 3);
  // p = 2 needs the unit part modulo 8: X = n + 2 on n ≡ 1 (mod 4) has v = 0 but u mod 8 varies.
  CHECK_FALSE(is_pinned(pair.F, pair.xF, 2, 2, Fmpz(1)));
  CHECK(is_pinned(pair.F, pair.xF, 2, 3, Fmpz(1)));
  // A slope divisible by p pins with fewer digits: X = 5n + 3 + 2 on n ≡ 0 (mod 1)? v_5(5n+5) ≥ 1 varies.
  ProgressionPair q(Family::parse("c7"), Progression{5, 1}, Family::parse("sc13"), Progression{1, 0});
  CHECK(is_pinned(q.F, q.xF, 5, 0, Fmpz(0)));  // X = 5n + 3: v_5 = 0, unit ≡ 3 (mod 5) for every n
}

TEST_CASE("pinned factors are constant on their classes (checked by counting mod p^j)", "[progression][pinning]") {
  struct Case { const char* f; Progression ap; const char* g; Progression ap2; };
  const Case cases[] = {{"c6", {1, 0}, "sc11", {1, 0}}, {"c7", {2, 1}, "sc13", {3, 2}}, {"c8", {4, 3}, "sc15", {2, 1}}};
  for (const auto& c : cases) {
    ProgressionPair pair(Family::parse(c.f), c.ap, Family::parse(c.g), c.ap2);
    for (ulong p : {2UL, 3UL, 5UL}) {
      auto classes = pinned_classes(pair, p, default_pin_depth(pair, p));
      CHECK(classes.size() >= 2);
      for (const auto& pc : classes) {
        Fmpz pe;
        fmpz_ui_pow_ui(pe, p, pc.e);
        for (long k : {0L, 1L, 3L}) {
          Fmpz n;
          fmpz_mul_si(n, pe, k);
          fmpz_add(n, n, pc.r);
          INFO(c.f << " vs " << c.g << " p = " << p << " class " << pc.r.str() << " mod " << pe.str() << " n = " << n.str());
          CHECK(counted(pair.F, progression_at(pair.apF, n), p) == pc.betaF);
          CHECK(counted(pair.G, progression_at(pair.apG, n), p) == pc.betaG);
        }
      }
    }
  }
}

TEST_CASE("the pinned classes at p vary for c_t vs sc_{2t-1} at p = 2", "[progression][pinning]") {
  // sc_{2t−1} at p = 2 takes several values (docs/MATH.md §4: 5/8 ... 5/4 for sc11), c_6 has β_2 = 1.
  ProgressionPair pair(Family::parse("c6"), Progression{1, 0}, Family::parse("sc11"), Progression{1, 0});
  auto classes = pinned_classes(pair, 2, default_pin_depth(pair, 2));
  bool saw_58 = false, saw_54 = false;
  for (const auto& c : classes) {
    CHECK(c.betaF == Fmpq(1));
    saw_58 = saw_58 || c.betaG == Fmpq(5, 8);
    saw_54 = saw_54 || c.betaG == Fmpq(5, 4);
  }
  CHECK(saw_58);
  CHECK(saw_54);
}
