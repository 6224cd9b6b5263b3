// Class numbers: L-value route and reduced-form enumeration (see header).
#include "mainterm/class_number.hpp"

#include <flint/fmpz_factor.h>
#include <flint/ulong_extras.h>

#include <algorithm>
#include <cmath>
#include <thread>
#include <vector>

#include "core/error.hpp"
#include "mainterm/dirichlet_l.hpp"

namespace circlet {

namespace {

// ---------------------------------------------------------------------------
// Counting route (header; docs/MATH.md §5). N < 3·2^64 is held in 128 bits.
using u128 = unsigned __int128;

// (−N) mod m.
ulong neg_mod(u128 N, ulong m) {
  const ulong r = (ulong)(N % m);
  return r == 0 ? 0 : m - r;
}

ulong ipow(ulong p, int e) {
  ulong r = 1;
  while (e-- > 0) r *= p;
  return r;
}

// Number of x mod p^e with x² ≡ D (mod p^e), p odd, D = −N. With Dm = D mod p^e:
// Dm = 0 gives p^{⌊e/2⌋} (x ≡ 0 mod p^{⌈e/2⌉}); otherwise v = v_p(Dm) must be
// even and D/p^v a square mod p, and then x = p^{v/2} y with y² ≡ D/p^v
// (mod p^{e−v}) has 2 solutions y mod p^{e−v}, i.e. 2 p^{v/2} values x mod p^e.
ulong roots_odd_prime_power(u128 N, ulong p, int e) {
  const ulong m = ipow(p, e);
  ulong Dm = neg_mod(N, m);
  if (Dm == 0) return ipow(p, e / 2);
  int v = 0;
  while (Dm % p == 0) {
    Dm /= p;
    ++v;
  }
  if (v & 1) return 0;
  return n_jacobi_unsigned(Dm % p, p) == 1 ? 2 * ipow(p, v / 2) : 0;
}

// #{b mod 2^{e+1} : b² ≡ D (mod 2^{e+2})}, D = −N ≡ 0, 1 (mod 4): half the number
// of x mod 2^E (E = e + 2) with x² ≡ D, because x and x + 2^{E−1} have the same
// square mod 2^E. That number: 2^{⌊E/2⌋} when D ≡ 0 (mod 2^E); otherwise
// v = v_2(D mod 2^E) even, D' = D/2^v odd, E' = E − v, and s·2^{v/2} with
// s = 1 (E' = 1), 2 if D' ≡ 1 mod 4 (E' = 2), 4 if D' ≡ 1 mod 8 (E' ≥ 3), else 0.
ulong roots_two_power(u128 N, int e) {
  const int E = e + 2;
  const u128 m = (u128)1 << E;
  const u128 r = N % m;
  u128 Dm = r == 0 ? 0 : m - r;
  ulong cnt;
  if (Dm == 0) {
    cnt = UWORD(1) << (E / 2);
  } else {
    int v = 0;
    while ((Dm & 1) == 0) {
      Dm >>= 1;
      ++v;
    }
    if (v & 1) return 0;
    const int Ep = E - v;
    const ulong d = (ulong)(Dm & 7);
    const ulong s = Ep == 1 ? 1 : (Ep == 2 ? ((d & 3) == 1 ? 2 : 0) : (d == 1 ? 4 : 0));
    cnt = s << (v / 2);
  }
  return cnt / 2;
}

struct SievePrime {
  ulong p;
  std::vector<ulong> rho;  // rho[e] = ρ-factor of p^e (rho[0] = 1)
};

struct CountResult {
  u128 lower = 0;  // Σ_{a ≤ A1} ρ(a)
  u128 upper = 0;  // reduced forms with A1 < a ≤ A2, each counted once
};

// Sieves a ∈ [lo, hi] (segments of S), adding into res.
void count_range(u128 N, ulong lo, ulong hi, ulong A1, const std::vector<SievePrime>& primes, CountResult& res) {
  const ulong S = std::min<ulong>(1 << 16, hi - lo + 1);  // small calls: no large allocation
  std::vector<ulong> rem(S), val(S);
  n_factor_t fac;
  for (ulong L = lo; L <= hi; L += S) {
    const ulong R = std::min<ulong>(hi, L + S - 1);
    const ulong len = R - L + 1;
    for (ulong i = 0; i < len; ++i) {
      rem[i] = L + i;
      val[i] = 1;
    }
    for (const SievePrime& sp : primes) {
      const ulong p = sp.p;
      ulong first = (L + p - 1) / p * p;
      for (ulong a = first; a <= R; a += p) {
        const ulong i = a - L;
        if (val[i] == 0) continue;
        ulong x = rem[i] / p;
        int e = 1;
        while (x % p == 0) {
          x /= p;
          ++e;
        }
        rem[i] = x;
        val[i] *= sp.rho[e];
      }
    }
    for (ulong i = 0; i < len; ++i) {
      if (val[i] == 0) continue;
      const ulong q = rem[i];
      if (q > 1) {  // one prime factor q > sqrt(A2), odd, to the first power: 1 + (D/q)
        const ulong Dq = neg_mod(N, q);
        val[i] *= Dq == 0 ? 1 : (ulong)(1 + n_jacobi_unsigned(Dq, q));
        if (val[i] == 0) continue;
      }
      const ulong a = L + i;
      if (a <= A1) {
        res.lower += val[i];
        continue;
      }
      // 4a² > N: find the roots b ∈ (−a, a] and keep those with c > a, or c = a and b ≥ 0.
      const ulong m = 4 * a;
      n_factor_init(&fac);
      n_factor(&fac, m, 1);
      ulong* roots = nullptr;
      const slong nr = n_sqrtmodn(&roots, neg_mod(N, m), &fac);
      // Roots mod 4a come in pairs x, x + 2a: twice ρ(a) of them.
      CIRCLET_ASSERT((ulong)nr == 2 * val[i], "hurwitz_class_number: root count differs from the sieve");
      for (slong j = 0; j < nr; ++j) {
        const ulong x = roots[j];
        if (x >= 2 * a) continue;
        const slong b = x <= a ? (slong)x : (slong)x - (slong)(2 * a);
        const u128 num = (u128)((unsigned __int128)((__int128)b * b)) + N;
        const u128 c = num / m;  // exact: b² ≡ −N (mod 4a)
        if (c > a || (c == a && b >= 0)) res.upper += 1;
      }
      flint_free(roots);
    }
  }
}

u128 fmpz_get_u128(const Fmpz& x) {
  Fmpz lo, hi;
  fmpz_fdiv_r_2exp(lo.get(), x.get(), 64);
  fmpz_fdiv_q_2exp(hi.get(), x.get(), 64);
  return ((u128)fmpz_get_ui(hi.get()) << 64) | fmpz_get_ui(lo.get());
}

// ⌊sqrt(⌊N/k⌋)⌋.
ulong isqrt_div(const Fmpz& N, ulong k) {
  Fmpz q;
  fmpz_fdiv_q_ui(q.get(), N.get(), k);
  fmpz_sqrt(q.get(), q.get());
  return fmpz_get_ui(q.get());
}

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
  // h(d0) = (w0/2) H(|d0|): for a fundamental discriminant every form is primitive.
  Fmpq h0 = hurwitz_class_number((ulong)(-d0));
  slong w0half = d0 == -3 ? 3 : (d0 == -4 ? 2 : 1);
  fmpq_mul_si(h0.get(), h0.get(), w0half);
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

Fmpq hurwitz_class_number(ulong N) { return hurwitz_class_number(Fmpz::from_ui(N)); }

bool hurwitz_class_number_in_range(const Fmpz& N) {
  Fmpz lim;
  fmpz_set_ui(lim.get(), 3);
  fmpz_mul_2exp(lim.get(), lim.get(), 64);
  return fmpz_sgn(N.get()) >= 0 && fmpz_cmp(N.get(), lim.get()) < 0;
}

double hurwitz_class_number_steps(const Fmpz& N) {
  Fmpz q;
  fmpz_fdiv_q_ui(q.get(), N.get(), 3);
  fmpz_sqrt(q.get(), q.get());
  return fmpz_get_d(q.get());
}

Fmpq hurwitz_class_number(const Fmpz& Nz) {
  CIRCLET_ASSERT(hurwitz_class_number_in_range(Nz), "hurwitz_class_number: N out of range");
  if (fmpz_is_zero(Nz.get())) return Fmpq(-1, 12);
  const ulong r4 = fmpz_fdiv_ui(Nz.get(), 4);
  if (r4 == 1 || r4 == 2) return Fmpq(0);
  const u128 N = fmpz_get_u128(Nz);
  const ulong A1 = isqrt_div(Nz, 4), A2 = isqrt_div(Nz, 3);
  // Sieving primes p ≤ sqrt(A2); every a ≤ A2 has at most one prime factor above them.
  std::vector<SievePrime> primes;
  {
    const ulong B = std::max<ulong>(n_sqrt(A2), 3);  // 2 always sieved: leftovers are odd
    n_primes_t it;
    n_primes_init(it);
    for (ulong p = n_primes_next(it); p <= B; p = n_primes_next(it)) {
      SievePrime sp;
      sp.p = p;
      sp.rho.push_back(1);
      ulong pe = 1;
      for (int e = 1; pe <= A2 / p; ++e) {
        pe *= p;
        sp.rho.push_back(p == 2 ? roots_two_power(N, e) : roots_odd_prime_power(N, p, e));
      }
      primes.push_back(std::move(sp));
    }
    n_primes_clear(it);
  }
  // Two threads split [1, A2] when there is enough work (the upper range costs more per a).
  CountResult total;
  if (A2 < (UWORD(1) << 20)) {
    count_range(N, 1, A2, A1, primes, total);
  } else {
    const ulong mid = A2 / 2;
    CountResult r1, r2;
    std::thread th([&] { count_range(N, mid + 1, A2, A1, primes, r2); });
    count_range(N, 1, mid, A1, primes, r1);
    th.join();
    total.lower = r1.lower + r2.lower;
    total.upper = r1.upper + r2.upper;
  }
  const u128 count = total.lower + total.upper;
  Fmpz c;
  fmpz_set_ui(c.get(), (ulong)(count >> 64));
  fmpz_mul_2exp(c.get(), c.get(), 64);
  fmpz_add_ui(c.get(), c.get(), (ulong)count);
  Fmpq H(c);
  // Weights: the class of a(x² + y²) (N = 4a², a = A1) counts 1/2, that of
  // a(x² + xy + y²) (N = 3a², a = A2) counts 1/3; both were counted once above.
  if ((u128)A1 * A1 * 4 == N) fmpq_sub(H.get(), H.get(), Fmpq(1, 2).get());
  if ((u128)A2 * A2 * 3 == N) fmpq_sub(H.get(), H.get(), Fmpq(2, 3).get());
  return H;
}

Fmpq hurwitz_class_number_bernoulli(ulong N) {
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
