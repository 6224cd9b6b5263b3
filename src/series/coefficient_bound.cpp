#include "series/coefficient_bound.hpp"

#include <arb.h>
#include <arb_hypgeom.h>
#include <flint/fmpq.h>
#include <flint/fmpz.h>

#include <cmath>
#include <cstdlib>

#include "core/error.hpp"

namespace circlet {

namespace {

// (s + 1)^k for s = ⌊sqrt(⌊num / den⌋)⌋, i.e. (⌊sqrt(num/den)⌋ + 1)^k.
// ⌊sqrt(⌊y⌋)⌋ = ⌊sqrt(y)⌋ for real y ≥ 0, so the integer square root is exact.
Fmpz box_power(const Fmpz& num, const Fmpz& den, long k) {
  Fmpz q, s;
  fmpz_fdiv_q(q.get(), num.get(), den.get());
  fmpz_sqrt(s.get(), q.get());
  fmpz_add_ui(s.get(), s.get(), 1);
  Fmpz out;
  fmpz_pow_ui(out.get(), s.get(), static_cast<ulong>(k));
  return out;
}

}  // namespace

CoefficientBound eta_quotient_coefficient_bound(const EtaQuotient& quotient, long N, slong prec);

namespace {
// The "slice" bound. Every family counts lattice points on an ellipsoid
// {y ∈ Z^r : (y + c)ᵀ S (y + c) = X}. Split y = (z, w) with w the last
// coordinate: for fixed z, the equation is a quadratic in w with leading
// coefficient S_ww > 0, so at most 2 integers w solve it; and such z lie in the
// projected ellipsoid E = {z : (z + c_z)ᵀ S' (z + c_z) ≤ X}, S' the Schur
// complement of S_ww (min over real w of the form). The unit cubes z + [−½, ½]^d
// (d = r − 1) are disjoint and lie in E⁺ = {(u + c_z)ᵀ S' (u + c_z) ≤ (√X + ρ)²},
// ρ = sqrt(λ_max(S')·d/4), by the triangle inequality for the norm √(uᵀS'u) and
// vᵀS'v ≤ λ_max |v|² ≤ λ_max d/4 on the cube. Hence
//   count ≤ 2 · vol(E⁺) = 2 · V_d (√X + ρ)^d / sqrt(det S'),  V_d = π^{d/2}/Γ(d/2 + 1).
// Evaluated in Arb (X, λ_max, det S' exact rationals), rounded up. It increases
// with X, so its value at n = N bounds every n ≤ N.
Fmpz slice_bound(const fmpq_t X, long d, const fmpq_t lambda_max, const fmpq_t det, slong prec) {
  arb_t x, rho, vd, t, out;
  arb_init(x); arb_init(rho); arb_init(vd); arb_init(t); arb_init(out);
  arb_set_fmpq(x, X, prec);
  arb_sqrt(x, x, prec);                        // √X
  arb_set_fmpq(rho, lambda_max, prec);
  arb_mul_si(rho, rho, d, prec);
  arb_div_ui(rho, rho, 4, prec);
  arb_sqrt(rho, rho, prec);                    // ρ = sqrt(λ_max d / 4)
  arb_add(x, x, rho, prec);
  arb_pow_ui(out, x, static_cast<ulong>(d), prec);  // (√X + ρ)^d
  arb_const_pi(vd, prec);
  arb_set_si(t, d);
  arb_div_ui(t, t, 2, prec);
  arb_pow(vd, vd, t, prec);                    // π^{d/2}
  arb_add_ui(t, t, 1, prec);
  arb_gamma(t, t, prec);                       // Γ(d/2 + 1)
  arb_div(vd, vd, t, prec);
  arb_mul(out, out, vd, prec);
  arb_set_fmpq(t, det, prec);
  arb_rsqrt(t, t, prec);
  arb_mul(out, out, t, prec);
  arb_mul_ui(out, out, 2, prec);
  arf_t ub;
  arf_init(ub);
  arb_get_ubound_arf(ub, out, prec);
  CIRCLET_ASSERT(arf_is_finite(ub), "slice bound is not finite");
  Fmpz r;
  arf_get_fmpz(r.get(), ub, ARF_RND_CEIL);
  arf_clear(ub);
  arb_clear(x); arb_clear(rho); arb_clear(vd); arb_clear(t); arb_clear(out);
  return r;
}

void take_smaller(CoefficientBound& r, const Fmpz& b, const char* method) {
  if (fmpz_cmp(b.get(), r.bound.get()) < 0) {
    r.bound = b;
    r.method = method;
  }
}

// t-cores and self-conjugate t-cores are partitions, so their counts are at most
// p(n) ≤ p(N) = [q^N] E(q)^{−1}, bounded by the majorant with A = 1. For T large
// against sqrt(N) this is far smaller than the box bound (e.g. c_1000, N = 100).
void cap_by_partitions(CoefficientBound& r, long N) {
  CoefficientBound p = eta_quotient_coefficient_bound({{1, -1}}, N, 64);
  if (fmpz_cmp(p.bound.get(), r.bound.get()) < 0) {
    r.bound = p.bound;
    r.method = "partition bound count(n) <= p(n) <= exp(pi^2/6 x/(1-x)) / x^n";
  }
}
}  // namespace

CoefficientBound family_coefficient_bound(const Family& family, long N) {
  CIRCLET_ASSERT(N >= 0, "coefficient bound for negative N");
  const long t = family.t;
  CoefficientBound r;
  r.nonnegative = true;  // every family counts something
  switch (family.kind) {
    case FamilyKind::Core: {
      // c_t(n) = #{x ∈ Z^t : Σx_i = 0, (t/2)Σx_i² + Σ i·x_i = n}   (docs/MATH.md §2).
      // With c_i = i/t − (t−1)/(2t) (so Σc_i = 0 and Σ c_i x_i = Σ i x_i / t when Σx = 0):
      //   (t/2) Σ (x_i + c_i)² = n + (t/2)Σc_i² = n + (t² − 1)/24 = X,
      // because Σ c_i² = Σ (i − (t−1)/2)² / t² = (t² − 1)/(12 t).
      // Hence (x_i + c_i)² ≤ 2X/t: each x_i lies in an interval of length
      // L = 2·sqrt(2X/t), which holds at most ⌊L⌋ + 1 integers. x_0..x_{t−2}
      // are free and x_{t−1} = −Σ the others, so
      //   c_t(n) ≤ (⌊2·sqrt(2X/t)⌋ + 1)^{t−1},  L² = 8X/t = (24n + t² − 1)/(3t).
      // The right side increases with n, so n = N bounds all n ≤ N.
      Fmpz num = Fmpz(24) , den = Fmpz(3 * t);
      fmpz_mul_si(num.get(), num.get(), N);
      fmpz_add_si(num.get(), num.get(), t * t - 1);
      r.bound = box_power(num, den, t - 1);
      r.method = "box bound c_t(n) <= (floor(2 sqrt(2X/t)) + 1)^(t-1), X = n + (t^2-1)/24";
      if (t >= 2) {
        // Slice bound (above), S = (t/2)(I + J) on the free coordinates, r = t − 1,
        // d = t − 2: S' = (t/2)(I_d + J_d/2) with eigenvalues t/2 and
        // (t/2)(1 + d/2) = t²/4, det S' = (t/2)^d · (t/2) = (t/2)^{t−1}.
        Fmpq X, lam, det;
        fmpq_set_si(X.get(), t * t - 1, 24);
        fmpq_add_fmpz(X.get(), X.get(), Fmpz(N).get());
        fmpq_set_si(lam.get(), t * t, 4);
        Fmpz num, den;
        fmpz_ui_pow_ui(num.get(), static_cast<ulong>(t), static_cast<ulong>(t - 1));
        fmpz_ui_pow_ui(den.get(), 2, static_cast<ulong>(t - 1));
        fmpq_set_fmpz_frac(det.get(), num.get(), den.get());
        take_smaller(r, slice_bound(X.get(), t - 2, lam.get(), det.get(), 64),
                     "slice bound c_t(n) <= 2 V_d (sqrt X + t sqrt(d)/4)^d / (t/2)^((t-1)/2), d = t-2");
      }
      cap_by_partitions(r, N);
      return r;
    }
    case FamilyKind::SelfConjugateCore: {
      // sc_t(n) = #{y ∈ Z^m : t Σ y_i² + Σ (2i+1−t) y_i = n},  m = ⌊t/2⌋   (docs/MATH.md §2).
      // With c_i = (2i+1−t)/(2t):  t Σ (y_i + c_i)² = n + Σ (2i+1−t)²/(4t) = X.
      // So (y_i + c_i)² ≤ X/t: each y_i lies in an interval of length 2·sqrt(X/t),
      //   sc_t(n) ≤ (⌊2·sqrt(X/t)⌋ + 1)^m,  (2·sqrt(X/t))² = 4X/t = (4tn + S)/t²,
      // S = Σ_{i<m} (2i+1−t)². Increasing in n, so n = N bounds all n ≤ N.
      const long m = t / 2;
      Fmpz S(0);
      for (long i = 0; i < m; ++i) fmpz_add_ui(S.get(), S.get(), static_cast<ulong>((2 * i + 1 - t) * (2 * i + 1 - t)));
      Fmpz num(4 * t), den(t * t);
      fmpz_mul_si(num.get(), num.get(), N);
      fmpz_add(num.get(), num.get(), S.get());
      r.bound = box_power(num, den, m);
      r.method = "box bound sc_t(n) <= (floor(2 sqrt(X/t)) + 1)^m, X = n + sum (2i+1-t)^2/(4t)";
      if (m >= 1) {
        // Slice bound (above): S = t·I_m, so S' = t·I_d, d = m − 1, λ_max = t, det = t^d.
        Fmpq X, lam(t), det;
        fmpq_set_fmpz_frac(X.get(), S.get(), Fmpz(4 * t).get());
        fmpq_add_fmpz(X.get(), X.get(), Fmpz(N).get());
        Fmpz dd;
        fmpz_ui_pow_ui(dd.get(), static_cast<ulong>(t), static_cast<ulong>(m - 1));
        fmpq_set_fmpz_frac(det.get(), dd.get(), Fmpz(1).get());
        take_smaller(r, slice_bound(X.get(), m - 1, lam.get(), det.get(), 64),
                     "slice bound sc_t(n) <= 2 V_d (sqrt X + sqrt(t d)/2)^d / t^(d/2), d = m-1");
      }
      cap_by_partitions(r, N);
      return r;
    }
    case FamilyKind::SumOfSquares: {
      // r_S(n) = #{x ∈ Z^S : Σ x_i² = n}: each |x_i| ≤ sqrt(n), an interval of
      // length 2·sqrt(n) holding at most 2⌊sqrt(n)⌋ + 1 integers, so
      //   r_S(n) ≤ (2⌊sqrt(n)⌋ + 1)^S, increasing in n.
      Fmpz s;
      fmpz_sqrt(s.get(), Fmpz(N).get());
      fmpz_mul_ui(s.get(), s.get(), 2);
      fmpz_add_ui(s.get(), s.get(), 1);
      fmpz_pow_ui(r.bound.get(), s.get(), static_cast<ulong>(t));
      r.method = "box bound r_S(n) <= (2 floor(sqrt n) + 1)^S";
      {
        // Slice bound (above): S = I_S, S' = I_d, d = S − 1, λ_max = 1, det = 1.
        Fmpq X(N), one(1);
        take_smaller(r, slice_bound(X.get(), t - 1, one.get(), one.get(), 64),
                     "slice bound r_S(n) <= 2 V_d (sqrt n + sqrt(d)/2)^d, d = S-1");
      }
      return r;
    }
  }
  CIRCLET_ASSERT(false, "unknown family kind");
  return r;
}

CoefficientBound eta_quotient_coefficient_bound(const EtaQuotient& quotient, long N, slong prec) {
  CIRCLET_ASSERT(N >= 0, "coefficient bound for negative N");
  CoefficientBound r;
  r.nonnegative = false;
  r.method = "majorant |[q^n]F| <= [q^n]E(q)^(-A) <= exp(A pi^2/6 x/(1-x)) / x^n, A = sum |e_d|";
  long A = 0;
  for (const auto& f : quotient) {
    CIRCLET_ASSERT(f.d >= 1, "eta factor with d < 1");
    A += std::labs(f.e);
  }
  // The constant term of every such product is 1; with A = 0 the product is 1.
  if (A == 0 || N == 0) {
    r.bound = Fmpz(1);
    return r;
  }
  // Majorant: (1 − q^{dk})^{e} with e > 0 is coefficientwise dominated in absolute
  // value by (1 + q^{dk})^{e}, itself dominated by (1 − q^{dk})^{−e}; so |F| is
  // dominated by Π_d Π_k (1 − q^{dk})^{−|e_d|}, and Π_k (1 − q^{dk})^{−1} is
  // dominated by Π_k (1 − q^k)^{−1} (the missing factors have non-negative
  // coefficients and constant term 1). Hence |[q^n]F| ≤ [q^n] E(q)^{−A}.
  // For a series G with non-negative coefficients, [q^n]G ≤ G(x)/x^n (0 < x < 1), and
  //   log E(x)^{−A} = A Σ_{m≥1} (1/m) x^m/(1 − x^m) ≤ A Σ 1/m² · x/(1 − x) = A π²/6 · x/(1 − x),
  // using 1 − x^m ≥ m x^{m−1}(1 − x). Both sides increase with n for fixed x, so
  // the value at n = N bounds every n ≤ N.
  // Choose x (doubles only pick the point): minimise c·x/(1−x) − N log x, c = Aπ²/6,
  // i.e. solve c·x = N(1 − x)² on (0, 1) by bisection.
  const double c = static_cast<double>(A) * M_PI * M_PI / 6.0;
  const double n = static_cast<double>(N);
  double lo = 0.0, hi = 1.0;
  for (int i = 0; i < 200; ++i) {
    double mid = 0.5 * (lo + hi);
    if (c * mid < n * (1 - mid) * (1 - mid)) lo = mid; else hi = mid;
  }
  double x = lo;
  if (!(x > 0.0 && x < 1.0)) x = 0.5;
  arb_t xb, one_minus, pi2, expo, xn, val;
  arb_init(xb); arb_init(one_minus); arb_init(pi2); arb_init(expo); arb_init(xn); arb_init(val);
  arb_set_d(xb, x);  // exact dyadic
  arb_sub_si(one_minus, xb, 1, prec);
  arb_neg(one_minus, one_minus);           // 1 − x
  arb_const_pi(pi2, prec);
  arb_sqr(pi2, pi2, prec);
  arb_mul_si(pi2, pi2, A, prec);
  arb_div_ui(pi2, pi2, 6, prec);            // A π²/6
  arb_mul(expo, pi2, xb, prec);
  arb_div(expo, expo, one_minus, prec);     // A π²/6 · x/(1 − x)
  arb_exp(val, expo, prec);
  arb_pow_ui(xn, xb, static_cast<ulong>(N), prec);
  arb_div(val, val, xn, prec);              // exp(...)/x^N
  arf_t ub;
  arf_init(ub);
  arb_get_ubound_arf(ub, val, prec);
  CIRCLET_ASSERT(arf_is_finite(ub), "coefficient bound is not finite");
  arf_get_fmpz(r.bound.get(), ub, ARF_RND_CEIL);
  arf_clear(ub);
  arb_clear(xb); arb_clear(one_minus); arb_clear(pi2); arb_clear(expo); arb_clear(xn); arb_clear(val);
  return r;
}

}  // namespace circlet
