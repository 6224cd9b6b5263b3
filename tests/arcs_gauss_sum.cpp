// Tests for src/arcs/gauss_sum.hpp: route (b) to A_k(n)/k^w.
#include "arcs/gauss_sum.hpp"

#include <flint/fmpq.h>
#include <flint/ulong_extras.h>

#include <catch2/catch.hpp>
#include <string>

#include "arcs_test_models.hpp"

using namespace circlet;

namespace {

// Independent reference: N_d(n) = #{x ∈ Λ/dΛ : P(x) ≡ n (mod d)} by plain
// enumeration of the free coordinates in [0, d) (for c_t the last coordinate
// is −Σ of the others, so x lies in Λ and P(x) is an exact integer), then
// A_k/k^w = Σ_{d | k} μ(k/d) N_d / d^{r−1} (Möbius inversion of docs/MATH.md §6:
// N_k/k^{r−1} = Σ_{d | k} A_d/d^w).
Fmpz count_mod(const QuadraticModel& model, long n, long d) {
  const int free = model.sum_zero ? model.vars - 1 : model.vars;
  std::vector<long> x(model.vars, 0);
  long count = 0;
  std::vector<long> idx(free, 0);
  while (true) {
    long s = 0;
    for (int i = 0; i < free; ++i) {
      x[i] = idx[i];
      s += idx[i];
    }
    if (model.sum_zero) x[model.vars - 1] = -s;
    // P(x) exactly (it is an integer on Λ).
    Fmpq p, term;
    for (int i = 0; i < model.vars; ++i) {
      fmpq_mul_si(term.get(), model.quad[i].get(), x[i] * x[i]);
      fmpq_add(p.get(), p.get(), term.get());
      fmpq_mul_si(term.get(), model.lin[i].get(), x[i]);
      fmpq_add(p.get(), p.get(), term.get());
    }
    REQUIRE(fmpz_is_one(fmpq_denref(p.get())));
    Fmpz diff;
    fmpz_sub_si(diff.get(), fmpq_numref(p.get()), n);
    if (fmpz_fdiv_ui(diff.get(), d) == 0) ++count;
    int i = 0;
    while (i < free && ++idx[i] == d) idx[i++] = 0;
    if (i == free) break;
  }
  return Fmpz(count);
}

Fmpq arc_by_counting(const QuadraticModel& model, long n, ulong k) {
  Fmpq total;
  for (ulong d = 1; d <= k; ++d) {
    if (k % d) continue;
    const int mu = n_moebius_mu(k / d);
    if (mu == 0) continue;
    Fmpq term;
    Fmpz den;
    fmpz_ui_pow_ui(den.get(), d, model.rank - 1);
    Fmpz N = count_mod(model, n, static_cast<long>(d));
    fmpq_set_fmpz_frac(term.get(), N.get(), den.get());
    if (mu < 0) fmpq_neg(term.get(), term.get());
    fmpq_add(total.get(), total.get(), term.get());
  }
  return total;
}

}  // namespace

TEST_CASE("k = 1 gives the leading coefficient 1", "[arcs][gauss]") {
  for (const char* f : {"c5", "c6", "sc9", "sq5"}) {
    auto r = arc_coefficient_by_gauss_sums(test_model(f), Fmpz(17), 1, 128);
    REQUIRE(r.exact.has_value());
    CHECK(*r.exact == Fmpq(1));
  }
}

TEST_CASE("one-dimensional sums agree with direct summation", "[arcs][gauss]") {
  // R_m(α, β) by the shift identity versus Σ_x e((αx² + βx)/m) summed directly.
  for (ulong m : {1UL, 2UL, 7UL, 12UL, 16UL, 30UL, 45UL}) {
    std::vector<acb_struct> roots(m);
    for (ulong j = 0; j < m; ++j) {
      acb_init(&roots[j]);
      Fmpq q(static_cast<slong>(2 * j), m);
      arb_sin_cos_pi_fmpq(acb_imagref(&roots[j]), acb_realref(&roots[j]), q.get(), 128);
    }
    acb_t direct, fast;
    acb_init(direct);
    acb_init(fast);
    for (ulong alpha = 0; alpha < m; ++alpha) {
      QuadraticSum1D s(m, alpha, &roots, 128);
      for (ulong beta = 0; beta < m; ++beta) {
        acb_zero(direct);
        for (ulong x = 0; x < m; ++x) acb_add(direct, direct, &roots[(alpha * x * x + beta * x) % m], 128);
        s.value(fast, beta, 128);
        INFO("m=" << m << " alpha=" << alpha << " beta=" << beta);
        CHECK(acb_overlaps(direct, fast));
        CHECK(mag_cmp_2exp_si(arb_radref(acb_realref(fast)), -80) < 0);
        CHECK(mag_cmp_2exp_si(arb_radref(acb_imagref(fast)), -80) < 0);
      }
    }
    acb_clear(direct);
    acb_clear(fast);
    for (auto& z : roots) acb_clear(&z);
  }
}

TEST_CASE("route (b) equals direct counting modulo d for small k", "[arcs][gauss]") {
  struct Case {
    const char* family;
    ulong kmax;
  };
  // Small enough that enumerating d^{r} residues stays fast.
  for (Case c : {Case{"c5", 12}, Case{"c6", 8}, Case{"c7", 6}, Case{"sc9", 16}, Case{"sq5", 8}, Case{"sc7", 16},
                 Case{"c4", 16}}) {
    const auto model = test_model(c.family);
    for (long n : {0L, 1L, 5L, 23L}) {
      for (ulong k = 1; k <= c.kmax; ++k) {
        INFO(c.family << " n=" << n << " k=" << k);
        auto r = arc_coefficient_by_gauss_sums(model, Fmpz(n), k, 128);
        REQUIRE(r.exact.has_value());
        CHECK(r.exact->str() == arc_by_counting(model, n, k).str());
      }
    }
  }
}

TEST_CASE("the exact value is recovered only from a ball that pins it", "[arcs][gauss]") {
  acb_t z;
  acb_init(z);
  arb_set_d(acb_realref(z), 0.25);
  arb_add_error_2exp_si(acb_realref(z), -20);
  auto v = arc_coefficient_exact_from_ball(z, 2, 3, 64);  // lattice 2^{-2} Z
  REQUIRE(v.has_value());
  CHECK(*v == Fmpq(1, 4));
  arb_add_error_2exp_si(acb_realref(z), -1);  // now wider than the lattice spacing
  CHECK_FALSE(arc_coefficient_exact_from_ball(z, 2, 3, 64).has_value());
  arb_set_d(acb_realref(z), 0.25);
  arb_set_d(acb_imagref(z), 0.5);  // a non-real ball is never rounded
  CHECK_FALSE(arc_coefficient_exact_from_ball(z, 2, 3, 64).has_value());
  acb_clear(z);
}

TEST_CASE("route (b) balls at two precisions overlap and pin the same rational", "[arcs][gauss]") {
  for (const char* f : {"c7", "sc9", "sq5"}) {
    const auto model = test_model(f);
    for (ulong k : {30UL, 97UL, 128UL}) {
      auto lo = arc_coefficient_by_gauss_sums(model, Fmpz(1234), k, 64);
      auto hi = arc_coefficient_by_gauss_sums(model, Fmpz(1234), k, 256);
      INFO(f << " k=" << k);
      CHECK(arb_overlaps(lo.re.get(), hi.re.get()));
      CHECK(arb_contains_zero(hi.im.get()));
      REQUIRE(hi.exact.has_value());
      if (lo.exact) CHECK(*lo.exact == *hi.exact);
      // The accuracy floor: 256 bits leave at least 200 bits after k^r terms.
      const bool accurate = mag_cmp_2exp_si(arb_radref(hi.re.get()), -180) < 0;
      CHECK(accurate);
    }
  }
}
