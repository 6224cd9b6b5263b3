// Tests for src/arcs/remainder.hpp.
#include "arcs/remainder.hpp"

#include <flint/fmpq.h>
#include <flint/fmpz.h>

#include <catch2/catch.hpp>

#include "arcs_cm_form.hpp"
#include "mainterm/dirichlet_l.hpp"
#include "mainterm/main_term.hpp"
#include "quadratic/model.hpp"
#include "series/eta_series.hpp"

using namespace circlet;

namespace {

// The c_7 main term in closed form (docs/MATH.md §3, the Eisenstein part):
// 8·M(n) = Σ_{d | m} (d/7)(m/d)², m = n + 2.
MainTermValue c7_divisor_sum_main_term(const Fmpz& n) {
  const long m = fmpz_get_si(n.get()) + 2;
  long s = 0;
  for (long d = 1; d <= m; ++d)
    if (m % d == 0) s += kronecker_symbol(d, 7UL) * (m / d) * (m / d);  // (d/7) = (7-adic Legendre)
  MainTermValue v;
  v.exact = Fmpq(s, 8);
  arb_set_fmpq(v.ball.get(), v.exact->get(), 128);
  return v;
}

}  // namespace

TEST_CASE("c7: the remainder against the divisor-sum main term is -a(n+2)/8", "[arcs][remainder]") {
  const long N = 600;
  const auto model = quadratic_model(Family::parse("c7"));
  IntegerSeries counts = family_series(model.family, N);
  std::vector<Fmpz> ns, cs;
  for (long n = 0; n <= N; ++n) {
    ns.emplace_back(n);
    cs.push_back(counts.value(n));
  }
  RemainderTable t = remainder_table(model, ns, cs, c7_divisor_sum_main_term, 128);
  const auto a = cm_form_7_coefficients(N + 2);
  for (long n = 0; n <= N; ++n) {
    INFO("n=" << n);
    REQUIRE(t.rows[n].remainder_exact.has_value());
    CHECK(*t.rows[n].remainder_exact == Fmpq(-a[n + 2], 8));
    CHECK(t.rows[n].within_certified_bound);
  }
  CHECK_FALSE(t.summary.identically_zero);
  CHECK(t.summary.certified_violations == 0);
  REQUIRE(t.summary.certified_statement.has_value());
  // w = 3: Deligne scale X^{1}, Hecke scale X^{3/2}.
  CHECK(t.summary.deligne_exponent == 1.0);
  CHECK(t.summary.hecke_exponent == 1.5);
  // |E|/X ≤ d(m)m/(8X) with X = m: the normalised maximum is at most max d(m)/8.
  CHECK(arf_cmpabs_2exp_si(arb_midref(t.summary.max_abs_deligne.get()), 1) < 0);
  // The fit sees |a(m)| ≈ m up to divisor factors: an exponent near 1.
  REQUIRE(t.summary.fit.ok);
  CHECK(t.summary.fit.exponent > 0.75);
  CHECK(t.summary.fit.exponent < 1.25);
}

TEST_CASE("a main term given only as a ball gives a ball remainder that is never called zero",
          "[arcs][remainder]") {
  const auto model = quadratic_model(Family::parse("c7"));
  auto ball_only = [](const Fmpz& n) {
    MainTermValue v = c7_divisor_sum_main_term(n);
    arb_add_error_2exp_si(v.ball.get(), -30);
    v.exact.reset();
    return v;
  };
  std::vector<Fmpz> ns{Fmpz(0), Fmpz(1)}, cs{Fmpz(1), Fmpz(1)};  // c_7(0) = c_7(1) = 1
  RemainderTable t = remainder_table(model, ns, cs, ball_only, 128);
  CHECK_FALSE(t.rows[0].remainder_exact.has_value());
  CHECK_FALSE(t.summary.identically_zero);
  // c_7(0) = 1, 8M(0) = Σ_{d|2} (d/7)(2/d)² = 4 + (2/7) = 5: E(0) = 3/8 lies in the ball.
  Arb e;
  arb_set_d(e.get(), 0.375);
  CHECK(arb_contains(t.rows[0].remainder.get(), e.get()));
}

namespace {

MainTermValue main_term_value(const QuadraticModel& model, const Fmpz& n) {
  MainTermOptions o;
  o.with_parts = false;
  MainTerm m = main_term(model, n, 128, o);
  MainTermValue v;
  v.ball = m.ball;
  v.exact = m.exact;
  return v;
}

RemainderTable table_up_to(const char* family, long N) {
  const auto model = quadratic_model(Family::parse(family));
  IntegerSeries counts = family_series(model.family, N);
  std::vector<Fmpz> ns, cs;
  for (long n = 0; n <= N; ++n) {
    if (fmpq_sgn(model.X(Fmpz(n)).get()) <= 0) continue;  // r_S(0): X = 0 has no main term
    ns.emplace_back(n);
    cs.push_back(counts.value(n));
  }
  return remainder_table(model, ns, cs, [&](const Fmpz& n) { return main_term_value(model, n); }, 128);
}

}  // namespace

TEST_CASE("no cusp part: the remainder of c5 and sq5..sq8 is identically 0 for n <= 2000",
          "[arcs][remainder][mainterm]") {
  // c_5: docs/MATH.md §3 (verified there by brute force); r_S for S = 5..8: the
  // theta series of Z^S is an Eisenstein series for S ≤ 8 (E. Grosswald,
  // Representations of Integers as Sums of Squares, Springer 1985, ch. 9 and 11;
  // quoted from memory).
  for (const char* f : {"c5", "sq5", "sq6", "sq7", "sq8"}) {
    RemainderTable t = table_up_to(f, 2000);
    INFO(f);
    CHECK(t.summary.identically_zero);
    for (const auto& r : t.rows) {
      if (!r.remainder_exact || !r.remainder_exact->is_zero()) {
        INFO("n=" << r.n.str() << " E=" << r.remainder.str());
        CHECK(arb_contains_zero(r.remainder.get()));
      }
    }
    CHECK_FALSE(t.summary.fit.ok);  // nothing to fit
  }
}

TEST_CASE("c7: E(n) = -a(n+2)/8 with the main term of src/mainterm", "[arcs][remainder][mainterm]") {
  const long N = 2000;
  RemainderTable t = table_up_to("c7", N);
  const auto a = cm_form_7_coefficients(N + 2);
  REQUIRE(t.rows.size() == N + 1);
  long nonzero = 0;
  for (long n = 0; n <= N; ++n) {
    INFO("n=" << n);
    REQUIRE(t.rows[n].remainder_exact.has_value());
    CHECK(*t.rows[n].remainder_exact == Fmpq(-a[n + 2], 8));
    nonzero += a[n + 2] != 0;
  }
  CHECK(nonzero > 100);  // the comparison is not vacuous
  CHECK(t.summary.certified_violations == 0);
}

TEST_CASE("the fitted growth exponents of c9 and sc17 lie between Deligne - 0.25 and Hecke + 0.1",
          "[arcs][remainder][fit][slow]") {
  // w = 4 for both (r = 8): Deligne exponent (w−1)/2 = 1.5, Hecke w/2 = 2 (in X).
  for (const char* f : {"c9", "sc17"}) {
    RemainderTable t = table_up_to(f, 100000);
    INFO(f << " exponent " << t.summary.fit.exponent << " +/- " << t.summary.fit.std_error);
    REQUIRE(t.summary.fit.ok);
    CHECK(t.summary.fit.exponent > t.summary.deligne_exponent - 0.25);
    CHECK(t.summary.fit.exponent < t.summary.hecke_exponent + 0.1);
    CHECK(t.summary.fit.std_error < 0.1);
  }
}

TEST_CASE("the fitted growth exponent of c9 over n <= 20000 is in range (fast subset)", "[arcs][remainder][fit]") {
  RemainderTable t = table_up_to("c9", 20000);
  REQUIRE(t.summary.fit.ok);
  CHECK(t.summary.fit.exponent > 1.25);
  CHECK(t.summary.fit.exponent < 2.1);
}
