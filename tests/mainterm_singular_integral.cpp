// Tests for src/mainterm/singular_integral.hpp.
#include "mainterm/singular_integral.hpp"

#include <catch2/catch.hpp>

using namespace circlet;

TEST_CASE("singular integral: closed forms for r = 2, 3, 4", "[mainterm][singular_integral]") {
  // r = 2: π / sqrt(det S) (independent of X); r = 3: Γ(3/2) = sqrt(π)/2 gives
  // 2π sqrt(X/det S); r = 4: π² X / sqrt(det S).
  slong prec = 128;
  Arb ref, t, v;
  Fmpq det(32), X(37, 8);
  arb_const_pi(ref, prec);
  arb_set_fmpq(t, det.get(), prec);
  arb_sqrt(t, t, prec);
  arb_div(ref, ref, t, prec);
  v = singular_integral(2, det, X, prec);
  CHECK(arb_overlaps(v, ref));
  CHECK(arb_rel_accuracy_bits(v) > prec - 10);

  // r = 3
  arb_set_fmpq(t, X.get(), prec);
  arb_set_fmpq(ref, det.get(), prec);
  arb_div(t, t, ref, prec);
  arb_sqrt(t, t, prec);
  arb_const_pi(ref, prec);
  arb_mul_2exp_si(ref, ref, 1);
  arb_mul(ref, ref, t, prec);
  v = singular_integral(3, det, X, prec);
  CHECK(arb_overlaps(v, ref));

  // r = 4, det 1 (four squares): π² X.
  arb_const_pi(ref, prec);
  arb_sqr(ref, ref, prec);
  arb_mul_ui(ref, ref, 37, prec);
  v = singular_integral(4, Fmpq(1), Fmpq(37), prec);
  CHECK(arb_overlaps(v, ref));
}

TEST_CASE("singular integral: docs/MATH.md's c_t constant (2π)^{(t−1)/2} X^{(t−3)/2}/(Γ((t−1)/2) t^{t/2})",
          "[mainterm][singular_integral]") {
  // det S = (t/2)^{t−1} t for c_t (docs/MATH.md §2); the two expressions must agree.
  for (int t = 3; t <= 14; ++t) {
    slong prec = 100;
    Fmpq det;
    fmpq_set_si(det.get(), t, 2);
    fmpz_pow_ui(fmpq_numref(det.get()), fmpq_numref(det.get()), t - 1);
    fmpz_pow_ui(fmpq_denref(det.get()), fmpq_denref(det.get()), t - 1);
    fmpq_mul_fmpz(det.get(), det.get(), Fmpz(t).get());
    Fmpq X(1001, 24);
    Arb v = singular_integral(t - 1, det, X, prec);
    Arb ref, a, b;
    arb_const_pi(a, prec);
    arb_mul_2exp_si(a, a, 1);
    Fmpq e1(t - 1, 2), e2(t - 3, 2), e3(t, 2);
    arb_set_fmpq(b, e1.get(), prec);
    arb_pow(ref, a, b, prec);
    arb_set_fmpq(a, X.get(), prec);
    arb_set_fmpq(b, e2.get(), prec);
    arb_pow(a, a, b, prec);
    arb_mul(ref, ref, a, prec);
    arb_gamma_fmpq(a, e1.get(), prec);
    arb_div(ref, ref, a, prec);
    arb_set_si(a, t);
    arb_set_fmpq(b, e3.get(), prec);
    arb_pow(a, a, b, prec);
    arb_div(ref, ref, a, prec);
    INFO("t = " << t);
    CHECK(arb_overlaps(v, ref));
  }
}

TEST_CASE("singular integral: two precisions overlap and the higher is tighter", "[mainterm][singular_integral]") {
  Fmpq det(1458), X(1000035, 24);
  Arb lo = singular_integral(5, det, X, 64);
  Arb hi = singular_integral(5, det, X, 256);
  CHECK(arb_overlaps(lo, hi));
  CHECK(arb_rel_accuracy_bits(hi) > 240);
  CHECK(arb_rel_accuracy_bits(lo) > 55);
}
