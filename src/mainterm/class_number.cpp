// Class numbers: L-value route and reduced-form enumeration (see header).
#include "mainterm/class_number.hpp"

#include <flint/fmpz_factor.h>
#include <flint/ulong_extras.h>

#include "core/error.hpp"
#include "mainterm/dirichlet_l.hpp"

namespace circlet {

namespace {

// Writes |d| = |d0| F² (d < 0 a discriminant) and returns d0.
slong split_discriminant(slong d, ulong& F) {
  Fmpz d0 = fundamental_discriminant(Fmpq(d));
  slong d0s = fmpz_get_si(d0.get());
  ulong q = (ulong)(d / d0s);
  ulong r = n_sqrt(q);
  CIRCLET_ASSERT(r * r == q && d % d0s == 0, "split_discriminant: not a discriminant");
  F = r;
  return d0s;
}

}  // namespace

Fmpz class_number(slong d) {
  CIRCLET_ASSERT(d < 0 && (((-d) % 4) == 0 || ((-d) % 4) == 3), "class_number: need a negative discriminant");
  ulong F;
  slong d0 = split_discriminant(d, F);
  // h(d0) = −(w0/2) B_{1,χ}.
  Fmpq h0 = generalised_bernoulli(Fmpz(d0), 1);
  slong w0half = d0 == -3 ? 3 : (d0 == -4 ? 2 : 1);
  fmpq_mul_si(h0.get(), h0.get(), -w0half);
  if (F == 1) return Fmpz(fmpz_get_si(fmpq_numref(h0.get())));
  // h(d0F²) = h(d0) F/[O*:O_F*] Π_{p|F} (1 − χ(p)/p); the index is w0/2 for F > 1.
  Fmpq h = h0;
  fmpq_mul_si(h.get(), h.get(), (slong)F);
  fmpq_div_fmpz(h.get(), h.get(), Fmpz(w0half).get());
  n_factor_t fac;
  n_factor_init(&fac);
  n_factor(&fac, F, 1);
  for (int i = 0; i < fac.num; ++i) {
    ulong p = fac.p[i];
    Fmpq e(1);
    Fmpq c(kronecker_symbol(d0, p), p);
    fmpq_sub(e.get(), e.get(), c.get());
    fmpq_mul(h.get(), h.get(), e.get());
  }
  CIRCLET_ASSERT(fmpz_is_one(fmpq_denref(h.get())), "class_number: non-integral result");
  return Fmpz(fmpz_get_si(fmpq_numref(h.get())));
}

Fmpq hurwitz_class_number(ulong N) {
  if (N == 0) return Fmpq(-1, 12);
  if (N % 4 == 1 || N % 4 == 2) return Fmpq(0);
  ulong F;
  slong d0 = split_discriminant(-(slong)N, F);
  Fmpq b1 = generalised_bernoulli(Fmpz(d0), 1);
  // Σ_{d | F} μ(d) χ(d) σ_1(F/d): multiplicative in F; at p^e it is σ(p^e) − χ(p) σ(p^{e−1}).
  Fmpz s(1);
  n_factor_t fac;
  n_factor_init(&fac);
  if (F > 1) n_factor(&fac, F, 1);
  for (int i = 0; i < fac.num; ++i) {
    ulong p = fac.p[i];
    ulong e = fac.exp[i];
    Fmpz sig_e, sig_e1, pk(1);
    for (ulong j = 0; j <= e; ++j) {
      if (j < e) fmpz_add(sig_e1.get(), sig_e1.get(), pk.get());
      fmpz_add(sig_e.get(), sig_e.get(), pk.get());
      fmpz_mul_ui(pk.get(), pk.get(), p);
    }
    int c = kronecker_symbol(d0, p);
    if (c > 0) fmpz_sub(sig_e.get(), sig_e.get(), sig_e1.get());
    if (c < 0) fmpz_add(sig_e.get(), sig_e.get(), sig_e1.get());
    fmpz_mul(s.get(), s.get(), sig_e.get());
  }
  fmpq_mul_fmpz(b1.get(), b1.get(), s.get());
  fmpq_neg(b1.get(), b1.get());
  return b1;
}

namespace {

// Enumerates reduced forms (a, b, c) of discriminant −N: |b| ≤ a ≤ c, b ≥ 0 when
// |b| = a or a = c. Calls fn(a, b, c).
template <class Fn>
void for_each_reduced_form(ulong N, Fn fn) {
  // a ≤ sqrt(N/3) since 4a² ≤ 4ac = N + b² ≤ N + a².
  for (slong a = 1; (ulong)(3 * a * a) <= N; ++a)
    for (slong b = -a + 1; b <= a; ++b) {
      slong num = b * b + (slong)N;
      if (num % (4 * a) != 0) continue;
      slong c = num / (4 * a);
      if (c < a) continue;
      if (a == c && b < 0) continue;
      fn(a, b, c);
    }
}

}  // namespace

Fmpq hurwitz_class_number_by_forms(ulong N) {
  if (N == 0) return Fmpq(-1, 12);
  Fmpq H(0);
  for_each_reduced_form(N, [&](slong a, slong b, slong c) {
    // Classes with extra automorphisms: a(x² + y²) (weight 1/2), a(x² + xy + y²) (weight 1/3).
    if (b == 0 && a == c)
      fmpq_add(H.get(), H.get(), Fmpq(1, 2).get());
    else if (b == a && a == c)
      fmpq_add(H.get(), H.get(), Fmpq(1, 3).get());
    else
      fmpq_add_si(H.get(), H.get(), 1);
  });
  return H;
}

Fmpz class_number_by_forms(slong d) {
  CIRCLET_ASSERT(d < 0, "class_number_by_forms: need d < 0");
  slong h = 0;
  for_each_reduced_form((ulong)(-d), [&](slong a, slong b, slong c) {
    if (n_gcd(n_gcd((ulong)a, (ulong)(b < 0 ? -b : b)), (ulong)c) == 1) ++h;
  });
  return Fmpz(h);
}

}  // namespace circlet
