// Quadratic characters and L(k, χ): exact (generalised Bernoulli numbers) and
// balls (Euler product with a rigorous tail bound). Formulas in the header.
#include "mainterm/dirichlet_l.hpp"

#include <arb.h>
#include <flint/arith.h>
#include <flint/fmpz_factor.h>
#include <flint/ulong_extras.h>

#include <algorithm>
#include <cmath>
#include <thread>
#include <vector>

#include "core/error.hpp"

namespace circlet {

int kronecker_symbol(slong d, ulong n) {
  CIRCLET_ASSERT(n >= 1, "kronecker_symbol: n must be positive");
  int s = 1;
  unsigned e = 0;
  while ((n & 1) == 0) {
    n >>= 1;
    ++e;
  }
  if (e > 0) {
    if ((d & 1) == 0) return 0;
    // (d/2) = 1 for d ≡ ±1 (mod 8), −1 for d ≡ ±3 (mod 8).
    slong r = ((d % 8) + 8) % 8;
    if ((r == 3 || r == 5) && (e & 1)) s = -s;
  }
  if (n == 1) return s;
  slong x = d % (slong)n;  // n odd < 2^63 here because d fits a slong and n is bounded by callers
  ulong ux = x < 0 ? (ulong)(x + (slong)n) : (ulong)x;
  return s * n_jacobi_unsigned(ux, n);
}

int kronecker_symbol(const Fmpz& d, const Fmpz& n) {
  CIRCLET_ASSERT(fmpz_sgn(n.get()) > 0, "kronecker_symbol: n must be positive");
  return fmpz_kronecker(d.get(), n.get());
}

int kronecker_symbol_prime(const Fmpz& d, ulong p) {
  if (p == 2) {
    if (fmpz_is_even(d.get())) return 0;
    // (d/2) = 1 for d ≡ ±1 (mod 8), −1 for d ≡ ±3 (mod 8).
    const ulong r = fmpz_fdiv_ui(d.get(), 8);
    return (r == 1 || r == 7) ? 1 : -1;
  }
  const ulong r = fmpz_fdiv_ui(d.get(), p);
  return r == 0 ? 0 : n_jacobi_unsigned(r, p);
}

namespace {

// Squarefree kernel with sign of a non-zero integer times the one of another:
// sign(a b) · Π_{p : v_p(ab) odd} p.
void signed_core(fmpz_t core, const fmpz_t a, const fmpz_t b) {
  fmpz_one(core);
  for (const fmpz* x : {a, b}) {
    fmpz_factor_t fac;
    fmpz_factor_init(fac);
    fmpz_factor(fac, x);
    for (slong i = 0; i < fac->num; ++i)
      if (fac->exp[i] & 1) fmpz_mul(core, core, fac->p + i);
    fmpz_factor_clear(fac);
  }
  if (fmpz_sgn(a) * fmpz_sgn(b) < 0) fmpz_neg(core, core);
}

}  // namespace

bool is_fundamental_discriminant(const Fmpz& d) {
  if (fmpz_is_one(d.get())) return true;
  if (fmpz_is_zero(d.get())) return false;
  Fmpz one(1), core;
  signed_core(core.get(), d.get(), one.get());
  Fmpz four_core;
  fmpz_mul_ui(four_core.get(), core.get(), 4);
  if (fmpz_fdiv_ui(core.get(), 4) == 1) return fmpz_equal(core.get(), d.get());
  return fmpz_equal(four_core.get(), d.get());
}

Fmpz fundamental_discriminant(const Fmpq& D) {
  CIRCLET_ASSERT(!D.is_zero(), "fundamental_discriminant: D must be non-zero");
  Fmpz core;
  signed_core(core.get(), fmpq_numref(D.get()), fmpq_denref(D.get()));
  // Q(sqrt(s)) for squarefree s: discriminant s if s ≡ 1 (mod 4), else 4s.
  if (fmpz_fdiv_ui(core.get(), 4) != 1) fmpz_mul_ui(core.get(), core.get(), 4);
  return core;
}

Fmpq discriminant_cofactor(const Fmpq& D, const Fmpz& d0) {
  Fmpq q;
  fmpq_set_fmpz_frac(q.get(), d0.get(), Fmpz(1).get());
  fmpq_div(q.get(), D.get(), q.get());
  CIRCLET_ASSERT(fmpq_sgn(q.get()) > 0, "discriminant_cofactor: D and d0 differ in sign");
  Fmpz rn, rd, rem;
  fmpz_sqrtrem(rn.get(), rem.get(), fmpq_numref(q.get()));
  CIRCLET_ASSERT(fmpz_is_zero(rem.get()), "discriminant_cofactor: D/d0 is not a square");
  fmpz_sqrtrem(rd.get(), rem.get(), fmpq_denref(q.get()));
  CIRCLET_ASSERT(fmpz_is_zero(rem.get()), "discriminant_cofactor: D/d0 is not a square");
  Fmpq g;
  fmpq_set_fmpz_frac(g.get(), rn.get(), rd.get());
  return g;
}

Fmpq generalised_bernoulli(const Fmpz& d, ulong k) {
  CIRCLET_ASSERT(k >= 1, "generalised_bernoulli: k must be positive");
  CIRCLET_ASSERT(fmpz_bits(d.get()) < 62, "generalised_bernoulli: conductor too large");
  slong ds = fmpz_get_si(d.get());
  ulong f = (ulong)(ds < 0 ? -ds : ds);
  // S_j = Σ_{a=1}^{f} χ(a) a^j, j = 0..k, exact integers.
  std::vector<Fmpz> S(k + 1);
  // Fast path: when f^{k+1} < 2^120 every partial sum fits a signed 128-bit integer
  // (|S_j| ≤ f·f^j), so accumulate in __int128 and convert once.
  const bool fits128 = (double)(k + 1) * std::log2((double)f + 1) < 120;
  if (fits128) {
    std::vector<__int128> T(k + 1, 0);
    for (ulong a = 1; a <= f; ++a) {
      int c = (f == 1) ? 1 : kronecker_symbol(ds, a);
      if (c == 0) continue;
      __int128 pw = 1;
      for (ulong j = 0; j <= k; ++j) {
        T[j] += c > 0 ? pw : -pw;
        pw *= a;
      }
    }
    for (ulong j = 0; j <= k; ++j) {
      // split into high and low 64-bit halves for FLINT
      __int128 v = T[j];
      bool neg = v < 0;
      unsigned __int128 u = neg ? (unsigned __int128)(-v) : (unsigned __int128)v;
      Fmpz hi = Fmpz::from_ui((ulong)(u >> 64)), lo = Fmpz::from_ui((ulong)u);
      fmpz_mul_2exp(S[j].get(), hi.get(), 64);
      fmpz_add(S[j].get(), S[j].get(), lo.get());
      if (neg) fmpz_neg(S[j].get(), S[j].get());
    }
  }
  Fmpz pw;
  for (ulong a = 1; !fits128 && a <= f; ++a) {
    int c = (f == 1) ? 1 : kronecker_symbol(ds, a);
    if (c == 0) continue;
    fmpz_one(pw.get());
    for (ulong j = 0; j <= k; ++j) {
      if (c > 0)
        fmpz_add(S[j].get(), S[j].get(), pw.get());
      else
        fmpz_sub(S[j].get(), S[j].get(), pw.get());
      fmpz_mul_ui(pw.get(), pw.get(), a);
    }
  }
  // B_{k,χ} = f^{k−1} Σ_a χ(a) B_k(a/f) = Σ_{j=0}^{k} C(k,j) B_{k−j} f^{k−1−j} S_j.
  Fmpq total, term, b;
  Fmpz binom, fpow;
  for (ulong j = 0; j <= k; ++j) {
    arith_bernoulli_number(b.get(), k - j);
    fmpz_bin_uiui(binom.get(), k, j);
    fmpq_mul_fmpz(term.get(), b.get(), binom.get());
    fmpq_mul_fmpz(term.get(), term.get(), S[j].get());
    long e = (long)k - 1 - (long)j;
    if (e >= 0) {
      fmpz_ui_pow_ui(fpow.get(), f, (ulong)e);
      fmpq_mul_fmpz(term.get(), term.get(), fpow.get());
    } else {
      fmpz_set_ui(fpow.get(), f);  // e = −1
      fmpq_div_fmpz(term.get(), term.get(), fpow.get());
    }
    fmpq_add(total.get(), total.get(), term.get());
  }
  return total;
}

Fmpq dirichlet_l_rational(const Fmpz& d, ulong k) {
  CIRCLET_ASSERT(k >= 1, "dirichlet_l_rational: k must be positive");
  CIRCLET_ASSERT(is_fundamental_discriminant(d), "dirichlet_l_rational: d must be fundamental");
  int sign = fmpz_sgn(d.get());
  CIRCLET_ASSERT((sign > 0) == (k % 2 == 0), "dirichlet_l_rational: need χ(−1) = (−1)^k");
  CIRCLET_ASSERT(!(fmpz_is_one(d.get()) && k == 1), "dirichlet_l_rational: ζ(1) diverges");
  return dirichlet_l_rational_from_bernoulli(generalised_bernoulli(d, k), d, k);
}

Fmpq dirichlet_l_rational_from_bernoulli(const Fmpq& B, const Fmpz& d, ulong k) {
  // R = (−1)^{1+⌊k/2⌋} 2^{k−1}/k! · B_{k,χ}/f^{k−1}.
  Fmpz f, fac, two;
  fmpz_abs(f.get(), d.get());
  fmpz_pow_ui(f.get(), f.get(), k - 1);
  fmpz_fac_ui(fac.get(), k);
  fmpz_one(two.get());
  fmpz_mul_2exp(two.get(), two.get(), k - 1);
  Fmpq R;
  fmpq_mul_fmpz(R.get(), B.get(), two.get());
  fmpq_div_fmpz(R.get(), R.get(), fac.get());
  fmpq_div_fmpz(R.get(), R.get(), f.get());
  if (((1 + k / 2) & 1) == 1) fmpq_neg(R.get(), R.get());
  return R;
}

double dirichlet_l2_steps(const Fmpz& d) {
  Fmpz r;
  fmpz_sqrt(r.get(), d.get());
  return fmpz_get_d(r.get()) / 2;
}

Fmpq dirichlet_l2_rational_divisor_sums(const Fmpz& dz) {
  CIRCLET_ASSERT(fmpz_sgn(dz.get()) > 0 && !fmpz_is_one(dz.get()) && fmpz_bits(dz.get()) <= 62,
                 "dirichlet_l2_rational_divisor_sums: need 1 < d < 2^62");
  CIRCLET_ASSERT(is_fundamental_discriminant(dz), "dirichlet_l2_rational_divisor_sums: d must be fundamental");
  using u128 = unsigned __int128;
  const ulong d = fmpz_get_ui(dz.get());
  const ulong B = n_sqrt(d - 1);  // b² < d (d is not a square)
  const ulong b0 = d & 1;         // b ≡ d (mod 2); b = b0 + 2j, j = 0..J
  if (B < b0) return Fmpq(0);
  const ulong J = (B - b0) / 2;
  // m_b = (d − b²)/4 ≤ d/4: primes up to sqrt(d/4) leave at most one prime factor.
  const ulong Pmax = n_sqrt(d / 4) + 1;
  struct Root {
    ulong p, j1, j2;  // j ≡ j1 or j2 (mod p) ⟺ p | m_b
    ulong inv, lim;   // p^{−1} mod 2^64 and ⌊(2^64 − 1)/p⌋: exact division and divisibility by multiplication
  };
  // Roots of b² ≡ d (mod p) for the odd primes p ≤ Pmax, in two halves on two threads.
  auto find_roots = [&](ulong plo, ulong phi, std::vector<Root>& out) {
    n_primes_t it;
    n_primes_init(it);
    n_primes_jump_after(it, plo);
    for (ulong p = n_primes_next(it); p <= phi; p = n_primes_next(it)) {
      if (p == 2) continue;  // 2 is handled by trailing zeros
      const ulong dp = d % p;
      // p | m_b ⟺ b² ≡ d (mod p) (4 is invertible): no root when d is a non-residue.
      if (dp != 0 && n_jacobi_unsigned(dp, p) != 1) continue;
      const ulong r = dp == 0 ? 0 : n_sqrtmod(dp, p);
      const ulong inv2 = (p + 1) / 2;
      // b0 + 2j ≡ ±r (mod p) ⟺ j ≡ (±r − b0)/2 (mod p)
      const ulong j1 = n_mulmod2((r + p - b0 % p) % p, inv2, p);
      const ulong j2 = n_mulmod2(((p - r) % p + p - b0 % p) % p, inv2, p);
      ulong inv = p;  // Newton's iteration doubles the correct low bits: 5 steps reach 64 from 3
      for (int it = 0; it < 5; ++it) inv *= 2 - p * inv;
      out.push_back({p, j1, j2, inv, ~UWORD(0) / p});
    }
    n_primes_clear(it);
  };
  // σ_1(m_b) for j in [jlo, jhi], summed with multiplicity 2 for b ≠ 0 (b and −b).
  auto sieve = [&](ulong jlo, ulong jhi, const std::vector<Root>& roots, u128& total) {
    const ulong S = std::min<ulong>(1 << 16, jhi - jlo + 1);  // small calls: no large allocation
    std::vector<ulong> rem(S), val(S);
    // The next j ≥ L of each root class (2 per prime; ULONG_MAX when the roots coincide),
    // carried from block to block instead of recomputed with two divisions per block.
    std::vector<ulong> next(2 * roots.size());
    for (size_t r = 0; r < roots.size(); ++r) {
      const ulong p = roots[r].p, off = jlo % p;
      next[2 * r] = jlo + (roots[r].j1 + p - off) % p;
      next[2 * r + 1] = roots[r].j2 == roots[r].j1 ? ~UWORD(0) : jlo + (roots[r].j2 + p - off) % p;
    }
    for (ulong L = jlo; L <= jhi; L += S) {
      const ulong R = std::min<ulong>(jhi, L + S - 1);
      const ulong len = R - L + 1;
      for (ulong i = 0; i < len; ++i) {
        const ulong b = b0 + 2 * (L + i);
        ulong m = (d - b * b) / 4;
        const int v = __builtin_ctzl(m);  // σ(2^v) = 2^{v+1} − 1
        m >>= v;
        rem[i] = m;
        val[i] = (UWORD(2) << v) - 1;
      }
      for (size_t r = 0; r < roots.size(); ++r) {
        const ulong p = roots[r].p;
        for (int w = 0; w < 2; ++w) {
          ulong j = next[2 * r + w];
          for (; j <= R; j += p) {  // j ≡ j1 or j2 (mod p), L ≤ j ≤ R
            const ulong i = j - L;
            // p | rem[i] here; for odd p and p | x, x/p = x·p^{−1} mod 2^64, and
            // p | x ⟺ x·p^{−1} mod 2^64 ≤ ⌊(2^64 − 1)/p⌋ (T. Granlund, P. Montgomery,
            // "Division by invariant integers using multiplication", PLDI 1994, quoted from memory; docs/MATH.md §5).
            const ulong inv = roots[r].inv, lim = roots[r].lim;
            ulong x = rem[i] * inv, pe = p, sig = 1 + p;
            for (ulong y = x * inv; y <= lim; y = x * inv) {
              x = y;
              pe *= p;
              sig += pe;
            }
            rem[i] = x;
            val[i] *= sig;
          }
          next[2 * r + w] = j;
        }
      }
      for (ulong i = 0; i < len; ++i) {
        if (rem[i] > 1) val[i] *= 1 + rem[i];  // the one prime factor above sqrt(d/4)
        const ulong b = b0 + 2 * (L + i);
        total += (u128)val[i] * (b == 0 ? 1 : 2);
      }
    }
  };
  std::vector<Root> roots, roots2;
  u128 total = 0;
  if (J < (1u << 17)) {
    find_roots(0, Pmax, roots);
    sieve(0, J, roots, total);
  } else {
    // Primes thin out: the second thread takes the larger upper part of the range.
    const ulong pmid = Pmax / 3;
    std::thread th([&] { find_roots(pmid, Pmax, roots2); });
    find_roots(0, pmid, roots);
    th.join();
    roots.insert(roots.end(), roots2.begin(), roots2.end());
    u128 t2 = 0;
    const ulong jmid = J / 2;
    std::thread th2([&] { sieve(jmid + 1, J, roots, t2); });
    sieve(0, jmid, roots, total);
    th2.join();
    total += t2;
  }
  // R = B_{2,χ}/f = (2/5) Σ / d.
  Fmpz t;
  fmpz_set_ui(t.get(), (ulong)(total >> 64));
  fmpz_mul_2exp(t.get(), t.get(), 64);
  fmpz_add_ui(t.get(), t.get(), (ulong)total);
  fmpz_mul_ui(t.get(), t.get(), 2);
  Fmpz den;
  fmpz_mul_ui(den.get(), dz.get(), 5);
  Fmpq Rq;
  fmpq_set_fmpz_frac(Rq.get(), t.get(), den.get());
  return Rq;
}

void dirichlet_l_from_rational(arb_t res, const Fmpq& R, const Fmpz& d, ulong k, slong prec) {
  slong wp = prec + 10;
  Arb pi, f;
  arb_const_pi(pi, wp);
  arb_pow_ui(pi, pi, k, wp);
  arb_set_fmpz(f, d.get());
  arb_abs(f, f);
  arb_rsqrt(f, f, wp);
  arb_mul(pi, pi, f, wp);
  arb_mul_fmpz(res, pi, fmpq_numref(R.get()), wp);
  arb_div_fmpz(res, res, fmpq_denref(R.get()), prec);
}

Fmpq zeta_even_rational(ulong k) {
  CIRCLET_ASSERT(k >= 1, "zeta_even_rational: k must be positive");
  // ζ(2k) = (−1)^{k+1} B_{2k} (2π)^{2k} / (2 (2k)!)  (Euler).
  Fmpq Z;
  arith_bernoulli_number(Z.get(), 2 * k);
  Fmpz f;
  fmpz_fac_ui(f.get(), 2 * k);
  fmpq_div_fmpz(Z.get(), Z.get(), f.get());
  fmpq_mul_2exp(Z.get(), Z.get(), 2 * k - 1);
  if (k % 2 == 0) fmpq_neg(Z.get(), Z.get());
  return Z;
}

void dirichlet_l_euler_tail(arb_t eps, ulong k, ulong P, slong prec) {
  CIRCLET_ASSERT(k >= 2 && P >= 2, "dirichlet_l_euler_tail: need k ≥ 2, P ≥ 2");
  // For p > P:  |log (1 − χ(p)p^{−k})^{−1}| = |Σ_m χ(p)^m p^{−mk}/m| ≤ p^{−k}/(1 − p^{−k})
  //                                          ≤ p^{−k}/(1 − P^{−k}).
  // Σ_{p>P} p^{−k} = ∫_P^∞ x^{−k} dπ(x) = −π(P)P^{−k} + k ∫_P^∞ π(x) x^{−k−1} dx
  //                ≤ k ∫_P^∞ 1.25506 x^{−k}/log x dx ≤ 1.25506 k P^{1−k} / ((k−1) log P),
  // using π(x) < 1.25506 x/log x for x > 1 (J. B. Rosser and L. Schoenfeld,
  // "Approximate formulas for some functions of prime numbers", Illinois J.
  // Math. 6 (1962), 64–94; corollary number and constant quoted from memory)
  // and 1/log x ≤ 1/log P on [P, ∞). Hence
  //   ε = 1.25506 k P^{1−k} / ((k−1) log P (1 − P^{−k})).
  slong wp = prec + 20;
  Arb c, t, u;
  arb_set_str(c, "1.25506", wp);  // the decimal is exact enough: arb_set_str gives a ball containing 1.25506
  arb_mul_ui(c, c, k, wp);
  arb_set_ui(t, P);
  arb_pow_ui(u, t, k - 1, wp);  // P^{k−1}
  arb_div(c, c, u, wp);
  arb_div_ui(c, c, k - 1, wp);
  arb_log_ui(u, P, wp);
  arb_div(c, c, u, wp);
  // divide by 1 − P^{−k}
  arb_pow_ui(u, t, k, wp);
  arb_inv(u, u, wp);
  arb_sub_ui(u, u, 1, wp);
  arb_neg(u, u);
  arb_div(c, c, u, wp);
  // Return the upper end as an exact non-negative number.
  arb_get_ubound_arf(arb_midref(eps), c, prec);
  mag_zero(arb_radref(eps));
}

ulong dirichlet_l_euler_bound(ulong k, slong prec, ulong max_P) {
  CIRCLET_ASSERT(k >= 2, "dirichlet_l_euler_bound: need k ≥ 2");
  // Smallest P (to a factor 1 + 2^{−40}) with the double estimate of
  // ε(P, k) = 1.25506 k P^{1−k}/((k−1) log P (1 − P^{−k})) below 2^{−prec}.
  // A double only chooses the truncation point; the bound itself is a ball.
  auto eps = [k](double P) {
    return 1.25506 * k * std::pow(P, 1.0 - k) / ((k - 1) * std::log(P) * (1 - std::pow(P, -(double)k)));
  };
  const double target = std::ldexp(1.0, -(int)std::min<slong>(prec, 1000));
  double lo = 100, hi = 100;
  while (eps(hi) > target && hi < (double)max_P) hi *= 2;
  if (hi >= (double)max_P) return max_P;
  for (int it = 0; it < 60 && hi - lo > 1; ++it) {
    const double mid = 0.5 * (lo + hi);
    (eps(mid) > target ? lo : hi) = mid;
  }
  return (ulong)std::ceil(hi);
}

void dirichlet_l_euler(arb_t res, const Fmpz& d, ulong k, ulong P, slong prec) {
  CIRCLET_ASSERT(k >= 2, "dirichlet_l_euler: need k ≥ 2");
  slong wp = prec + 2 * FLINT_BIT_COUNT(P) + 20;
  // Π_{p ≤ P} (1 − χ(p)p^{−k})^{−1} = Π p^k / (p^k − χ(p)), accumulated as a
  // quotient of two balls (each factor an exact small integer when p^k < 2^63).
  Arb num, den, t;
  arb_one(num);
  arb_one(den);
  n_primes_t iter;
  n_primes_init(iter);
  for (ulong p = n_primes_next(iter); p <= P; p = n_primes_next(iter)) {
    int c = kronecker_symbol_prime(d, p);
    if (c == 0) continue;
    ulong hi, lo = 1;
    bool small = true;
    for (ulong i = 0; i < k && small; ++i) {
      umul_ppmm(hi, lo, lo, p);
      if (hi != 0 || lo >= (UWORD(1) << 62)) small = false;
    }
    if (small) {
      arb_mul_ui(num, num, lo, wp);
      arb_mul_ui(den, den, c > 0 ? lo - 1 : lo + 1, wp);
    } else {
      arb_ui_pow_ui(t, p, k, wp);
      arb_mul(num, num, t, wp);
      if (c > 0)
        arb_sub_ui(t, t, 1, wp);
      else
        arb_add_ui(t, t, 1, wp);
      arb_mul(den, den, t, wp);
    }
  }
  n_primes_clear(iter);
  arb_div(num, num, den, wp);
  // Tail factor exp(θ), |θ| ≤ ε (see dirichlet_l_euler_tail).
  Arb eps;
  dirichlet_l_euler_tail(eps, k, P, wp);
  arb_zero(t);
  arb_add_error(t, eps);
  arb_exp(t, t, wp);
  arb_mul(res, num, t, prec);
}

void dirichlet_l(arb_t res, const Fmpz& d, ulong k, slong prec, ulong max_exact_conductor,
                 ulong max_P) {
  Fmpz f;
  fmpz_abs(f.get(), d.get());
  if (fmpz_cmp_ui(f.get(), max_exact_conductor) <= 0) {
    Fmpq R = dirichlet_l_rational(d, k);
    dirichlet_l_from_rational(res, R, d, k, prec);
    return;
  }
  if (k >= 2) {
    dirichlet_l_euler(res, d, k, dirichlet_l_euler_bound(k, prec, max_P), prec);
    return;
  }
  arb_indeterminate(res);
}

}  // namespace circlet
