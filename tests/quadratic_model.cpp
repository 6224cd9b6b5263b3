#include "quadratic/model.hpp"

#include <flint/fmpq_mat.h>

#include <catch2/catch.hpp>

#include "quadratic_families.hpp"
#include <map>
#include <random>

using namespace circlet;

namespace {

using circlet::testing::swept_families;

// The linear form of P in the free coordinates (c_t: x_{t−1} = −Σ_{i<t−1} x_i).
std::vector<Fmpq> free_linear(const QuadraticModel& m) {
  std::vector<Fmpq> l;
  for (int i = 0; i < m.rank; ++i) {
    Fmpq li = m.lin[i];
    if (m.sum_zero) fmpq_sub(li.get(), li.get(), m.lin[m.vars - 1].get());
    l.push_back(li);
  }
  return l;
}

Fmpq quad_form(const QuadraticModel& m, const std::vector<Fmpq>& z) {
  Fmpq acc, term;
  for (int i = 0; i < m.rank; ++i)
    for (int k = 0; k < m.rank; ++k) {
      fmpq_mul(term.get(), z[i].get(), z[k].get());
      fmpq_mul(term.get(), term.get(), m.gram[i][k].get());
      fmpq_add(acc.get(), acc.get(), term.get());
    }
  return acc;
}

}  // namespace

TEST_CASE("det S from the closed form equals the determinant of the Gram matrix", "[quadratic][model]") {
  auto fams = swept_families();
  fams.push_back({FamilyKind::Core, 20});
  fams.push_back({FamilyKind::SelfConjugateCore, 25});
  for (const auto& f : fams) {
    INFO(f.name());
    const QuadraticModel m = quadratic_model(f);
    REQUIRE(m.rank == f.rank());
    REQUIRE(static_cast<int>(m.gram.size()) == m.rank);
    if (m.rank == 0) continue;
    fmpq_mat_t g;
    fmpq_mat_init(g, m.rank, m.rank);
    for (int i = 0; i < m.rank; ++i)
      for (int k = 0; k < m.rank; ++k) fmpq_set(fmpq_mat_entry(g, i, k), m.gram[i][k].get());
    Fmpq det;
    fmpq_mat_det(det.get(), g);
    fmpq_mat_clear(g);
    CHECK(det == m.det_gram);
  }
}

TEST_CASE("completing the square: P(x) + Δ = Q(x + s) with 2Ss = ℓ", "[quadratic][model]") {
  std::mt19937_64 rng(20261201);
  std::uniform_int_distribution<long> coord(-50, 50);
  for (const auto& f : swept_families()) {
    INFO(f.name());
    const QuadraticModel m = quadratic_model(f);
    if (m.rank == 0) continue;
    // s = S⁻¹ℓ/2 by FLINT's exact solver, independent of the Δ formulas in model.cpp.
    fmpq_mat_t S, L, s;
    fmpq_mat_init(S, m.rank, m.rank);
    fmpq_mat_init(L, m.rank, 1);
    fmpq_mat_init(s, m.rank, 1);
    const auto l = free_linear(m);
    for (int i = 0; i < m.rank; ++i) {
      for (int k = 0; k < m.rank; ++k) fmpq_mul_si(fmpq_mat_entry(S, i, k), m.gram[i][k].get(), 2);
      fmpq_set(fmpq_mat_entry(L, i, 0), l[i].get());
    }
    REQUIRE(fmpq_mat_solve_fraction_free(s, S, L));
    std::vector<Fmpq> sv(m.rank);
    for (int i = 0; i < m.rank; ++i) fmpq_set(sv[i].get(), fmpq_mat_entry(s, i, 0));
    fmpq_mat_clear(S);
    fmpq_mat_clear(L);
    fmpq_mat_clear(s);
    // Δ = Q(s) because P(x) = Q(x) + ℓx = Q(x + s) − Q(s).
    CHECK(quad_form(m, sv) == m.delta);
    for (int trial = 0; trial < 20; ++trial) {
      std::vector<long> x(m.vars);
      long sum = 0;
      for (int i = 0; i < m.vars; ++i) x[i] = coord(rng), sum += x[i];
      if (m.sum_zero) x[m.vars - 1] -= sum;
      std::vector<Fmpq> z(m.rank);
      for (int i = 0; i < m.rank; ++i) fmpq_add(z[i].get(), Fmpq(x[i]).get(), sv[i].get());
      Fmpq lhs = m.evaluate(x);
      fmpq_add(lhs.get(), lhs.get(), m.delta.get());
      CHECK(lhs == quad_form(m, z));
    }
  }
}

TEST_CASE("the shift Δ matches docs/MATH.md Â§2 and is (t²−1)/24 for every core family", "[quadratic][model]") {
  CHECK(quadratic_model(Family::parse("c5")).delta == Fmpq(1));
  CHECK(quadratic_model(Family::parse("c7")).delta == Fmpq(2));
  CHECK(quadratic_model(Family::parse("sc7")).delta == Fmpq(2));       // m = 3: 3·4/6
  CHECK(quadratic_model(Family::parse("sc8")).delta == Fmpq(63, 24));  // (64 − 1)/24
  CHECK(quadratic_model(Family::parse("sq5")).delta == Fmpq(0));
  CHECK(quadratic_model(Family::parse("c6")).det_gram == Fmpq(6 * 243));  // 3^5·6
  for (int t = 3; t <= 41; t += 2)  // m(m+1)/6 = (t² − 1)/24 for t = 2m + 1
    CHECK(quadratic_model({FamilyKind::SelfConjugateCore, t}).delta == Fmpq(static_cast<long>(t) * t - 1, 24));
}

namespace {

// Coefficients 0..N of the products of docs/MATH.md §1, written out directly.
std::vector<long> product_series(const Family& f, int N) {
  std::vector<long> a(N + 1, 0);
  a[0] = 1;
  auto mul_one_minus = [&](int d, int times) {  // multiply by (1 − q^d)^times (times may be negative)
    for (int k = 0; k < std::abs(times); ++k) {
      if (times > 0)
        for (int i = N; i >= d; --i) a[i] -= a[i - d];
      else
        for (int i = d; i <= N; ++i) a[i] += a[i - d];
    }
  };
  auto mul_one_plus = [&](int d, int times) {  // (1 + q^d)^times
    for (int k = 0; k < std::abs(times); ++k) {
      if (times > 0)
        for (int i = N; i >= d; --i) a[i] += a[i - d];
      else
        for (int i = d; i <= N; ++i) a[i] -= a[i - d];
    }
  };
  const int t = f.t;
  for (int k = 1; k <= N; ++k) {
    if (f.kind == FamilyKind::Core) {
      if (t * k <= N) mul_one_minus(t * k, t);
      mul_one_minus(k, -1);
    } else {
      if (2 * k - 1 <= N) mul_one_plus(2 * k - 1, 1);
      if (2 * t * k <= N) mul_one_minus(2 * t * k, t % 2 == 0 ? t / 2 : (t - 1) / 2);
      if (t % 2 == 1 && t * (2 * k - 1) <= N) mul_one_plus(t * (2 * k - 1), -1);
    }
  }
  return a;
}

// #{x : P(x) = n} for 0 ≤ n ≤ N by exhaustive enumeration over a box, through model.evaluate.
std::vector<long> model_counts(const QuadraticModel& m, int N, int box) {
  std::vector<long> out(N + 1, 0);
  const int free = m.sum_zero ? m.vars - 1 : m.vars;
  std::vector<long> x(m.vars, -box);
  while (true) {
    long sum = 0;
    for (int i = 0; i < free; ++i) sum += x[i];
    if (m.sum_zero) x[m.vars - 1] = -sum;
    if (!m.sum_zero || std::labs(sum) <= box) {
      Fmpq v = m.evaluate(x);
      REQUIRE(fmpz_is_one(fmpq_denref(v.get())));
      if (fmpz_cmp_si(fmpq_numref(v.get()), N) <= 0) {
        REQUIRE(fmpz_sgn(fmpq_numref(v.get())) >= 0);  // P ≥ 0 on the lattice
        out[fmpz_get_si(fmpq_numref(v.get()))]++;
      }
    }
    int i = 0;
    while (i < free && x[i] == box) x[i++] = -box;
    if (i == free) break;
    ++x[i];
  }
  return out;
}

}  // namespace

TEST_CASE("the model counts agree with the generating functions of docs/MATH.md Â§1", "[quadratic][model]") {
  // Every term q_i x² + ℓ_i x of P is ≥ −ℓ_i²/(4q_i) ≥ −t/2 (|ℓ_i| ≤ t, q_i ≥ t/2), so a point with
  // P ≤ N has every term ≤ N + vars·t/2; the box is the largest |x| allowed by that.
  const int N = 20;
  for (const char* name : {"c3", "c4", "c5", "c6", "sc3", "sc4", "sc5", "sc6", "sc7", "sc8", "sc9"}) {
    INFO(name);
    const Family f = Family::parse(name);
    const QuadraticModel m = quadratic_model(f);
    const double q = fmpq_get_d(m.quad[0].get());
    const double cap = N + m.vars * f.t / 2.0;
    int box = 0;
    while (q * (box + 1) * (box + 1) - f.t * (box + 1) <= cap) ++box;
    CHECK(model_counts(m, N, box) == product_series(f, N));
  }
}
