#include "quadratic/local_density.hpp"

#include <flint/fmpz_factor.h>
#include <flint/fmpz_poly.h>
#include <flint/ulong_extras.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <mutex>

#include "core/error.hpp"

// Local densities β_p(n) = lim_j N_j(n)/p^{j(r−1)} (docs/MATH.md §3–4).
//
// Three cases cover every family and prime (see classify()):
//   Structural   p | t for c_t, sc_t.                     β_p = 1, ν_j = 1 for every j.
//   Unimodular   p odd, p ∤ t (every odd p for sq_S), and p = 2 for c_t with t odd:
//                the form is unimodular at p (even unimodular at 2); closed forms of docs/MATH.md §4.
//   TwoAdicSq    p = 2 for sc_t with t odd and for sq_S: β_2 is the 2-adic density of a sum of
//                m squares at N = X/t (sq_S: N = X = n), by the primitive/imprimitive recursion.
// Here ν_j := N_j(n)/p^{j(r−1)} (the normalised count modulo p^j), ν_0 = 1.
//
// Stabilisation (why local_density_stable_exponent is proved, not observed). Write P in free
// coordinates as an integer polynomial with gradient ∇P(x). Hensel step: if P(x₀) ≡ n (p^j)
// and v_p(∇P(x₀)) = k with j ≥ 2k + 1, then on the class x₀ + p^{j−k}Z_p^r
//   P(x₀ + p^{j−k}y) = P(x₀) + p^{j−k}∇P(x₀)·y + p^{2(j−k)}Q(y),  2(j−k) ≥ j + 1,
// so P ≡ n (p^j) on the whole class, v_p(∇P) = k on it, and P mod p^{j+1} takes each of the
// p lifts of n equally often (∇P(x₀)·y has content exactly p^k). Hence the part of ν_j coming
// from points with v(∇P) = k is unchanged from j to j + 1. So ν_j = ν_{j+1} = … as soon as every
// solution modulo p^j has 2k + 1 ≤ j. Per case:
//   Structural: ∇P has a unit coordinate everywhere (c_t free coordinates: ∇P = t(I+J)x + ℓ
//     with ℓ_0 = −(t−1) a unit; sc_t: ∂_0 P = 2ty_0 + 1 − t, a unit), so k = 0: stable from
//     j = 1, and ν_1 = 1 because P mod p is a non-constant affine function.
//   Unimodular: ∇P(x) = 2S(x + s) with 2S invertible over Z_p and s p-integral, so
//     k = v(x + s) and X − (n − P(x)) = Q(x + s) ≡ 0 mod p^{2k}. For j ≥ v + 1 (v = v_p(X))
//     a solution mod p^j forces 2k ≤ v, i.e. 2k + 1 ≤ j: stable from j = v + 1.
//   TwoAdicSq: ∇P = 2t(y + s), k = 1 + v(y + s) and Q(y + s) = tΣ(y+s)² ≡ 0 mod 2^{2(k−1)};
//     as above 2(k − 1) ≤ v for j ≥ v + 1, so stable from j = v + 3.

namespace circlet {

namespace {

enum class PrimeCase { Structural, Unimodular, TwoAdicSquares };

void check_prime(ulong p) {
  if (p < 2 || !n_is_prime(p)) throw UserError("p = " + std::to_string(p) + " is not a prime");
}

void check_prime(const Fmpz& p) {
  if (fmpz_cmp_ui(p.get(), 2) < 0 || !fmpz_is_prime(p.get())) throw UserError("p = " + p.str() + " is not a prime");
}

void check_model(const QuadraticModel& m) {
  if (m.rank <= 0)
    throw UserError("family " + m.family.name() + " has rank 0: local densities are not defined");
}

PrimeCase classify(const QuadraticModel& m, ulong p) {
  const FamilyKind kind = m.family.kind;
  const ulong t = static_cast<ulong>(m.family.t);
  if (kind != FamilyKind::SumOfSquares && t % p == 0) return PrimeCase::Structural;
  if (p != 2) return PrimeCase::Unimodular;
  if (kind == FamilyKind::Core) return PrimeCase::Unimodular;  // t odd here: 2S = t(I+J) even unimodular
  return PrimeCase::TwoAdicSquares;                              // sc_t (t odd) or sq_S
}

// A prime beyond 64 bits exceeds t ≤ 1000 and is odd: unimodular.
PrimeCase classify(const QuadraticModel& m, const Fmpz& p) {
  return fmpz_abs_fits_ui(p.get()) ? classify(m, fmpz_get_ui(p.get())) : PrimeCase::Unimodular;
}

// X = n + Δ, required non-zero.
Fmpq model_X(const QuadraticModel& m, const Fmpz& n) {
  Fmpq x = m.X(n);
  if (x.is_zero()) throw UserError("X = n + Δ = 0 for " + m.family.name() + " at n = " + n.str() + ": the local density diverges");
  return x;
}

// v_p of a non-zero rational.
long valuation(const Fmpq& x, const Fmpz& p) {
  Fmpz tmp;
  long v = fmpz_remove(tmp.get(), fmpq_numref(x.get()), p.get());
  v -= fmpz_remove(tmp.get(), fmpq_denref(x.get()), p.get());
  return v;
}

// p^e for any integer e, exactly.
Fmpq ppow(const Fmpz& p, long e) {
  Fmpq r(1);
  Fmpz pe;
  fmpz_pow_ui(pe.get(), p.get(), static_cast<ulong>(std::labs(e)));
  if (e >= 0) fmpq_set_fmpz_frac(r.get(), pe.get(), Fmpz(1).get());
  else fmpq_set_fmpz_frac(r.get(), Fmpz(1).get(), pe.get());
  return r;
}
Fmpq ppow(ulong p, long e) { return ppow(Fmpz::from_ui(p), e); }

Fmpq mul(const Fmpq& a, const Fmpq& b) { Fmpq r; fmpq_mul(r.get(), a.get(), b.get()); return r; }
Fmpq add(const Fmpq& a, const Fmpq& b) { Fmpq r; fmpq_add(r.get(), a.get(), b.get()); return r; }
Fmpq sub(const Fmpq& a, const Fmpq& b) { Fmpq r; fmpq_sub(r.get(), a.get(), b.get()); return r; }
Fmpq scale(const Fmpq& a, long c) { Fmpq r; fmpq_mul_si(r.get(), a.get(), c); return r; }

// Legendre symbol (x/p) of a rational x whose numerator and denominator are prime to p (p odd)
// or 0 if p divides either: (a/b / p) = (a/p)(b/p) since (b⁻¹/p) = (b/p).
int legendre(const Fmpq& x, const Fmpz& p) {
  Fmpz a, b;
  fmpz_mod(a.get(), fmpq_numref(x.get()), p.get());
  fmpz_mod(b.get(), fmpq_denref(x.get()), p.get());
  return fmpz_jacobi(a.get(), p.get()) * fmpz_jacobi(b.get(), p.get());
}

// Kronecker symbol (D/2) for an odd 2-adic number D = a/b (a, b odd): 1 if D ≡ ±1 mod 8, else −1.
int kronecker2(const Fmpq& x) {
  const ulong a = fmpz_fdiv_ui(fmpq_numref(x.get()), 8), b = fmpz_fdiv_ui(fmpq_denref(x.get()), 8);
  CIRCLET_ASSERT(a % 2 == 1 && b % 2 == 1, "kronecker2: even argument");
  const ulong d = (a * b) % 8;  // b⁻¹ ≡ b mod 8
  return (d == 1 || d == 7) ? 1 : -1;
}

// The quadratic character of a form unimodular at p, r even: χ(p) = ((−1)^{r/2} det S / p) for p odd,
// the Kronecker symbol (D/2) with D = (−1)^{r/2} det(2S) at p = 2 (docs/MATH.md §4).
int even_rank_chi(const QuadraticModel& m, const Fmpz& p) {
  Fmpq d = m.det_gram;
  if ((m.rank / 2) % 2 == 1) fmpq_neg(d.get(), d.get());
  if (fmpz_cmp_ui(p.get(), 2) != 0) return legendre(d, p);
  fmpq_mul_2exp(d.get(), d.get(), static_cast<ulong>(m.rank));  // det(2S) = 2^r det S
  return kronecker2(d);
}

// χ_u = ((−1)^{(r−1)/2} det S · u / p), r odd, p odd, u = X/p^v.
int odd_rank_chi(const QuadraticModel& m, const Fmpq& X, const Fmpz& p, long v) {
  Fmpq d = mul(m.det_gram, mul(X, ppow(p, -v)));
  if (((m.rank - 1) / 2) % 2 == 1) fmpq_neg(d.get(), d.get());
  return legendre(d, p);
}

// ---- Unimodular case: the arc pieces a_i and β (docs/MATH.md §4) ------------------------------

// a_i = A_{p^i}(n)/p^{iw}. From the Gauss sums of a unimodular form (G(a/p^i) = χ(p)^i p^{ir/2}
// for r even) times the Ramanujan sum c_{p^i}(X):
//   r even: a_i = χ^i p^{i(1−r/2)}(1 − 1/p) for 1 ≤ i ≤ v, a_{v+1} = −χ^{v+1} p^{(v+1)(1−r/2)−1}.
//   r odd:  docs/MATH.md §4 (a_i = 0 for odd i ≤ v; the last one carries χ_u).
Fmpq unimodular_arc(const QuadraticModel& m, const Fmpq& X, const Fmpz& p, long i) {
  if (i == 0) return Fmpq(1);
  const long r = m.rank;
  const long v = valuation(X, p);
  if (i > v + 1) return Fmpq(0);
  const Fmpq one_minus = sub(Fmpq(1), ppow(p, -1));
  if (r % 2 == 0) {
    const int chi = even_rank_chi(m, p);
    const int sign = (i % 2 == 0) ? 1 : chi;  // χ^i
    const long e = i * (2 - r) / 2;           // i(1 − r/2)
    if (i <= v) return scale(mul(ppow(p, e), one_minus), sign);
    return scale(ppow(p, e - 1), -sign);
  }
  // r odd: twice the exponent of p in p^{i(1−r/2)} is i(2 − r).
  if (i <= v) {
    if (i % 2 == 1) return Fmpq(0);
    return mul(one_minus, ppow(p, i * (2 - r) / 2));
  }
  // i = v + 1
  if (i % 2 == 0) return scale(ppow(p, i * (2 - r) / 2 - 1), -1);
  const int chi_u = odd_rank_chi(m, X, p, v);
  return scale(ppow(p, (i * (2 - r) - 1) / 2), chi_u);  // χ_u p^{i(1−r/2) − 1/2}
}

Fmpq unimodular_level(const QuadraticModel& m, const Fmpq& X, const Fmpz& p, long j) {
  Fmpq s(0);
  for (long i = 0; i <= j; ++i) s = add(s, unimodular_arc(m, X, p, i));
  return s;
}

// β_p for r even written as the closed product–sum (not as Σ a_i, so that tests compare two forms):
//   β_p = (1 − χ p^{−r/2}) · Σ_{i=0}^{v} (χ p^{1−r/2})^i.
Fmpq unimodular_beta(const QuadraticModel& m, const Fmpq& X, const Fmpz& p) {
  const long r = m.rank;
  const long v = valuation(X, p);
  if (r % 2 == 1) return unimodular_level(m, X, p, v + 1);
  const int chi = even_rank_chi(m, p);
  Fmpq ratio = scale(ppow(p, 1 - r / 2), chi), term(1), sum(0);
  for (long i = 0; i <= v; ++i) {
    sum = add(sum, term);
    term = mul(term, ratio);
  }
  return mul(sub(Fmpq(1), scale(ppow(p, -r / 2), chi)), sum);
}

// ---- The 2-adic density of a sum of m squares ----------------------------------------------

// Primitive normalised counts ν*_j(c) = #{z mod 2^j : some z_i odd, Σz_i² ≡ c (2^j)} / 2^{j(m−1)}
// for j = 1, 2, 3 and c mod 2^j, by dynamic programming over the m coordinates with state
// (Σz² mod 8, whether an odd z_i was seen). By the Hensel step above with k = 1 (z_i odd gives
// v(∇) = v(2z) = 1) the primitive part is constant in j from j = 3 on, so ν*_3 is β*.
struct PrimitiveTable {
  Fmpq nu[4][8];  // nu[j][c], j = 1..3
};

PrimitiveTable primitive_table(long m) {
  static std::mutex mutex;
  static std::map<long, PrimitiveTable> cache;
  std::lock_guard<std::mutex> lock(mutex);
  auto it = cache.find(m);
  if (it != cache.end()) return it->second;
  PrimitiveTable tab;
  for (int j = 1; j <= 3; ++j) {
    const int q = 1 << j;
    std::vector<Fmpz> cnt(2 * q), next(2 * q);  // index value + q·odd_seen
    cnt[0] = Fmpz(1);
    for (long i = 0; i < m; ++i) {
      for (auto& c : next) c = Fmpz(0);
      for (int val = 0; val < q; ++val)
        for (int odd = 0; odd < 2; ++odd) {
          const Fmpz& c = cnt[val + q * odd];
          if (fmpz_is_zero(c.get())) continue;
          for (int z = 0; z < q; ++z) {
            const int nv = (val + z * z) % q, no = odd | (z & 1);
            fmpz_add(next[nv + q * no].get(), next[nv + q * no].get(), c.get());
          }
        }
      std::swap(cnt, next);
    }
    for (int c = 0; c < q; ++c) {
      Fmpq x(cnt[c + q]);
      fmpq_div_2exp(x.get(), x.get(), static_cast<ulong>(j * (m - 1)));
      tab.nu[j][c] = x;
    }
  }
  cache.emplace(m, tab);
  return tab;
}

// N mod 2^k for a 2-adic integer N = a/b (b odd), k ≤ 3.
ulong mod_2k(const Fmpq& N, int k) {
  const ulong q = 1UL << k;
  const ulong a = fmpz_fdiv_ui(fmpq_numref(N.get()), q), b = fmpz_fdiv_ui(fmpq_denref(N.get()), q);
  return (a * n_invmod(b % q, q)) % q;  // b odd, invertible mod 2^k (for q = 2: b ≡ 1)
}

// ν_j(N) for Σ_{i=1}^m z_i² = N: primitive part + imprimitive part. The imprimitive z = 2w
// (w mod 2^{j−1}) need 4 | N and Σw² ≡ N/4 mod 2^{j−2}: 2^m·N_{j−2}(N/4) points, i.e.
// 2^{2−m}·ν_{j−2}(N/4) after normalising by 2^{j(m−1)} (j ≥ 2). For j = 1 the only imprimitive
// point z ≡ 0 counts when N is even: 1/2^{m−1}.
Fmpq squares_level(long m, const Fmpq& N, long j) {
  if (j == 0) return Fmpq(1);
  const PrimitiveTable& tab = primitive_table(m);
  const int jj = static_cast<int>(std::min<long>(j, 3));
  Fmpq out = tab.nu[jj][mod_2k(N, jj)];
  if (j == 1) {
    if (mod_2k(N, 1) == 0) out = add(out, ppow(2, 1 - m));
    return out;
  }
  if (mod_2k(N, 2) == 0) {
    Fmpq quarter;
    fmpq_div_2exp(quarter.get(), N.get(), 2);
    out = add(out, mul(ppow(2, 2 - m), squares_level(m, quarter, j - 2)));
  }
  return out;
}

// β(N) = β*(N mod 8) + 2^{2−m}·β(N/4)·[4 | N]  (docs/MATH.md §4), N ≠ 0.
Fmpq squares_beta(long m, const Fmpq& N) {
  const PrimitiveTable& tab = primitive_table(m);
  Fmpq out = tab.nu[3][mod_2k(N, 3)];
  if (mod_2k(N, 2) == 0) {
    Fmpq quarter;
    fmpq_div_2exp(quarter.get(), N.get(), 2);
    out = add(out, mul(ppow(2, 2 - m), squares_beta(m, quarter)));
  }
  return out;
}

// N = X/t for sc_t (t odd: t and 3 are 2-adic units), N = X for sq_S.
Fmpq squares_target(const QuadraticModel& m, const Fmpq& X) {
  if (m.family.kind == FamilyKind::SumOfSquares) return X;
  Fmpq N;
  fmpq_div_fmpz(N.get(), X.get(), Fmpz(m.family.t).get());
  return N;
}

// ---- Counting modulo p^j ----------------------------------------------------------------

constexpr ulong kMaxModulus = 1UL << 22;

ulong modulus(ulong p, int j) {
  if (j < 0) throw UserError("the exponent j must be non-negative (got " + std::to_string(j) + ")");
  ulong q = 1;
  for (int i = 0; i < j; ++i) {
    if (q > kMaxModulus / p) throw UserError("counting modulo " + std::to_string(p) + "^" + std::to_string(j) + " is too large");
    q *= p;
  }
  return q;
}

long smod(long a, long q) { a %= q; return a < 0 ? a + q : a; }

// a ← a·b in Z[z]/(z^q − 1).
void cyclic_mul(fmpz_poly_t a, const fmpz_poly_t b, ulong q) {
  fmpz_poly_mul(a, a, b);
  const slong len = fmpz_poly_length(a);
  for (slong i = static_cast<slong>(q); i < len; ++i) {
    fmpz_add(a->coeffs + (i - q), a->coeffs + (i - q), a->coeffs + i);
  }
  fmpz_poly_truncate(a, static_cast<slong>(q));
}

// acc ← acc · Σ_c hist[c] x^c in Z[x]/(x^q − 1): one more block's value table
// convolved in (h is scratch space).
void cyclic_mul_histogram(fmpz_poly_t acc, fmpz_poly_t h, const std::vector<ulong>& hist, ulong q) {
  fmpz_poly_zero(h);
  for (ulong c = 0; c < q; ++c)
    if (hist[c]) fmpz_poly_set_coeff_ui(h, static_cast<slong>(c), hist[c]);
  cyclic_mul(acc, h, q);
}

std::vector<Fmpz> poly_to_table(const fmpz_poly_t a, ulong q) {
  std::vector<Fmpz> out(q);
  for (ulong c = 0; c < q; ++c) fmpz_poly_get_coeff_fmpz(out[c].get(), a, static_cast<slong>(c));
  return out;
}

// Separable P = Σ (q_i y_i² + l_i y_i) with integer q_i, l_i (sc_t, sq_S).
std::vector<Fmpz> separable_counts(const QuadraticModel& m, ulong q) {
  fmpz_poly_t acc, h;
  fmpz_poly_init(acc);
  fmpz_poly_init(h);
  fmpz_poly_set_ui(acc, 1);
  for (int i = 0; i < m.vars; ++i) {
    CIRCLET_ASSERT(fmpz_is_one(fmpq_denref(m.quad[i].get())) && fmpz_is_one(fmpq_denref(m.lin[i].get())),
                   "separable_counts: non-integral coefficient");
    const long a = smod(static_cast<long>(fmpz_fdiv_ui(fmpq_numref(m.quad[i].get()), q)), q);
    const long b = smod(fmpz_get_si(fmpq_numref(m.lin[i].get())), static_cast<long>(q));
    std::vector<ulong> hist(q, 0);
    for (ulong y = 0; y < q; ++y) {
      const unsigned __int128 val = (unsigned __int128)a * y % q * y + (unsigned __int128)b * y;
      hist[static_cast<ulong>(val % q)]++;
    }
    cyclic_mul_histogram(acc, h, hist, q);
  }
  auto out = poly_to_table(acc, q);
  fmpz_poly_clear(acc);
  fmpz_poly_clear(h);
  return out;
}

// c_t at p ∤ t. Free coordinates x_0..x_{r−1} (x_{t−1} = −Σ): P = ½xᵀAx + ℓᵀx with
// A = t(I + J) (det A = t^t, a p-unit) and ℓ_i = i − (t − 1). Column operations x = Uy with U
// invertible mod p^j (adding multiples of one coordinate to another, swaps) permute (Z/p^j)^r,
// so they keep the value table. We work modulo Mq = p^j (p odd) or 2^{j+1} (p = 2, so that the
// even diagonal A_ii gives A_ii/2 mod 2^j). Odd p: unit pivots, 1×1 blocks (if every remaining
// diagonal entry is ≡ 0 mod p, e_i ← e_i + e_l with a unit A_il gives the unit A_ii + 2A_il + A_ll).
// p = 2: A stays even with odd determinant, so row k has an odd off-diagonal entry; 2×2 blocks
// with odd determinant are eliminated against. Then the table is the cyclic product of the
// blocks' histograms.
std::vector<Fmpz> core_block_counts(const QuadraticModel& m, ulong p, ulong q) {
  const long t = m.family.t, r = m.rank;
  const long Mq = static_cast<long>(p == 2 ? 2 * q : q);
  using Mat = std::vector<std::vector<long>>;
  Mat A(r, std::vector<long>(r));
  std::vector<long> l(r);
  for (long i = 0; i < r; ++i) {
    for (long k = 0; k < r; ++k) A[i][k] = smod(i == k ? 2 * t : t, Mq);
    l[i] = smod(i - (t - 1), Mq);
  }
  auto mulm = [&](long a, long b) { return static_cast<long>((__int128)a * b % Mq); };
  // e_dst ← e_dst + c·e_src: row dst += c·row src, col dst += c·col src, ℓ_dst += c·ℓ_src.
  auto add_col = [&](long dst, long src, long c) {
    c = smod(c, Mq);
    for (long k = 0; k < r; ++k) A[dst][k] = smod(A[dst][k] + mulm(c, A[src][k]), Mq);
    for (long k = 0; k < r; ++k) A[k][dst] = smod(A[k][dst] + mulm(c, A[k][src]), Mq);
    l[dst] = smod(l[dst] + mulm(c, l[src]), Mq);
  };
  auto swap_idx = [&](long a, long b) {
    if (a == b) return;
    std::swap(A[a], A[b]);
    for (long k = 0; k < r; ++k) std::swap(A[k][a], A[k][b]);
    std::swap(l[a], l[b]);
  };
  auto unit = [&](long x) { return x % static_cast<long>(p) != 0; };
  auto inv = [&](long x) { return static_cast<long>(n_invmod(static_cast<ulong>(smod(x, Mq)), static_cast<ulong>(Mq))); };

  struct Block { int size; long a, b, c, l1, l2; };
  std::vector<Block> blocks;
  long k = 0;
  while (k < r) {
    if (p != 2) {
      long piv = -1;
      for (long i = k; i < r && piv < 0; ++i)
        if (unit(A[i][i])) piv = i;
      if (piv < 0) {
        for (long i = k; i < r && piv < 0; ++i)
          for (long i2 = i + 1; i2 < r && piv < 0; ++i2)
            if (unit(A[i][i2])) { add_col(i, i2, 1); piv = i; }
      }
      CIRCLET_ASSERT(piv >= 0, "core_block_counts: the form is not unimodular at p");
      swap_idx(k, piv);
      const long ip = inv(A[k][k]);
      for (long i = k + 1; i < r; ++i) add_col(i, k, -mulm(A[k][i], ip));
      blocks.push_back({1, A[k][k], 0, 0, l[k], 0});
      k += 1;
    } else {
      long other = -1;
      for (long i = k + 1; i < r && other < 0; ++i)
        if (unit(A[k][i])) other = i;
      CIRCLET_ASSERT(other >= 0 && !unit(A[k][k]), "core_block_counts: the form is not even unimodular at 2");
      swap_idx(k + 1, other);
      const long a = A[k][k], b = A[k][k + 1], c = A[k + 1][k + 1];
      const long idet = inv(smod(mulm(a, c) - mulm(b, b), Mq));
      // For each later coordinate i solve B(α, β)ᵀ = (A_ki, A_{k+1,i})ᵀ, B⁻¹ = adj(B)/det B.
      for (long i = k + 2; i < r; ++i) {
        const long u = A[k][i], w = A[k + 1][i];
        const long alpha = mulm(idet, smod(mulm(c, u) - mulm(b, w), Mq));
        const long beta = mulm(idet, smod(mulm(a, w) - mulm(b, u), Mq));
        add_col(i, k, -alpha);
        add_col(i, k + 1, -beta);
      }
      blocks.push_back({2, A[k][k], A[k][k + 1], A[k + 1][k + 1], l[k], l[k + 1]});
      k += 2;
    }
  }
  // Invariant: A is now block diagonal modulo Mq (entries outside the recorded blocks vanish).
  {
    std::vector<long> block_of(r);
    long pos = 0;
    for (size_t b = 0; b < blocks.size(); ++b)
      for (int s = 0; s < blocks[b].size; ++s) block_of[pos++] = static_cast<long>(b);
    for (long i = 0; i < r; ++i)
      for (long i2 = 0; i2 < r; ++i2)
        CIRCLET_ASSERT(block_of[i] == block_of[i2] || A[i][i2] == 0, "core_block_counts: elimination left a coupling");
  }
  fmpz_poly_t acc, h;
  fmpz_poly_init(acc);
  fmpz_poly_init(h);
  fmpz_poly_set_ui(acc, 1);
  const long qq = static_cast<long>(q);
  const long half = (p == 2) ? 0 : static_cast<long>(n_invmod(2, q));
  for (const auto& B : blocks) {
    std::vector<ulong> hist(q, 0);
    if (B.size == 1) {
      // ½a y² + l y mod p^j, ½ = 2⁻¹ mod p^j.
      const long a2 = smod(static_cast<long>((__int128)B.a * half % qq), qq);
      for (long y = 0; y < qq; ++y) {
        const __int128 val = (__int128)a2 * y % qq * y + (__int128)(B.l1 % qq) * y;
        hist[static_cast<ulong>(val % qq)]++;
      }
    } else {
      CIRCLET_ASSERT(B.a % 2 == 0 && B.c % 2 == 0, "core_block_counts: odd diagonal at p = 2");
      // q = 2^j: reduce with a mask (values stay below 2^{2j+2} < 2^63).
      const ulong mask = q - 1;
      const ulong a2 = static_cast<ulong>(B.a / 2) & mask, c2 = static_cast<ulong>(B.c / 2) & mask;
      const ulong b = static_cast<ulong>(B.b) & mask, l1 = static_cast<ulong>(B.l1) & mask, l2 = static_cast<ulong>(B.l2) & mask;
      for (ulong y1 = 0; y1 < q; ++y1) {
        const ulong base = ((a2 * y1 & mask) * y1 + l1 * y1) & mask, lin = (b * y1 + l2) & mask;
        for (ulong y2 = 0; y2 < q; ++y2) hist[(base + ((lin + c2 * y2) & mask) * y2) & mask]++;
      }
    }
    cyclic_mul_histogram(acc, h, hist, q);
  }
  auto out = poly_to_table(acc, q);
  fmpz_poly_clear(acc);
  fmpz_poly_clear(h);
  return out;
}

std::string u128_str(unsigned __int128 x) {
  if (x == 0) return "0";
  std::string s;
  while (x) { s.push_back(static_cast<char>('0' + static_cast<int>(x % 10))); x /= 10; }
  std::reverse(s.begin(), s.end());
  return s;
}

}  // namespace

std::vector<Fmpz> local_value_counts_literal(const QuadraticModel& model, ulong p, int j) {
  check_prime(p);
  check_model(model);
  if (!model.sum_zero) throw UserError("local_value_counts_literal is for c_t only");
  const ulong q = modulus(p, j);
  const long t = model.family.t;
  // p odd: P mod p^j with ½ = 2⁻¹. p = 2 (t may be odd, then P has the coefficient t/2): count
  // 2P mod 2^{j+1}. For integers x with Σx ≡ 0 mod 2^j, Σx_i² ≡ Σx_i ≡ 0 mod 2 makes P an
  // integer, and changing one x_i by 2^j changes 2P by t(2^{j+1}x_i + 2^{2j}) + 2i·2^j ≡ 0 mod
  // 2^{j+1} (j ≥ 1): so 2P mod 2^{j+1} is a function of x mod 2^j, it is even, and
  // 2P ≡ 2c (2^{j+1}) ⟺ P ≡ c (2^j). The same argument makes P mod 2^j agree with the free
  // coordinate polynomial used by core_block_counts.
  const ulong M = (p == 2) ? 2 * q : q;
  const double cost = static_cast<double>(t) * M * q * q;
  if (cost > 4e8) throw UserError("literal counting modulo " + std::to_string(q) + " for " + model.family.name() + " is too slow");
  // Counts are ≤ q^t; keep them below 2^127.
  if (t * std::log2(static_cast<double>(q)) > 126) throw UserError("literal counting: counts overflow 128 bits");
  const ulong half = (p == 2) ? 0 : n_invmod(2, q);
  std::vector<unsigned __int128> cnt(M * q, 0), next(M * q);
  cnt[0] = 1;  // state (value, sum) at index value·q + sum
  for (long i = 0; i < t; ++i) {
    std::fill(next.begin(), next.end(), 0);
    std::vector<ulong> f(q);
    for (ulong x = 0; x < q; ++x) {
      if (p == 2) f[x] = (static_cast<ulong>(t) % M * x % M * x + 2 * static_cast<ulong>(i) * x) % M;
      else f[x] = (static_cast<ulong>(t) % q * half % q * x % q * x + static_cast<ulong>(i) % q * x) % q;
    }
    for (ulong v = 0; v < M; ++v)
      for (ulong s = 0; s < q; ++s) {
        const unsigned __int128 c = cnt[v * q + s];
        if (!c) continue;
        for (ulong x = 0; x < q; ++x) next[((v + f[x]) % M) * q + (s + x) % q] += c;
      }
    std::swap(cnt, next);
  }
  std::vector<Fmpz> out(q);
  for (ulong v = 0; v < M; ++v) {
    const unsigned __int128 c = cnt[v * q + 0];
    if (p == 2) CIRCLET_ASSERT(v % 2 == 0 || c == 0, "literal counting: odd 2P on Σx ≡ 0");
    if (!c) continue;
    const ulong target = (p == 2) ? v / 2 : v;
    Fmpz add_c = Fmpz::from_str(u128_str(c));
    fmpz_add(out[target].get(), out[target].get(), add_c.get());
  }
  return out;
}

std::vector<Fmpz> local_value_counts(const QuadraticModel& model, ulong p, int j) {
  check_prime(p);
  check_model(model);
  const ulong q = modulus(p, j);
  if (q == 1) return {Fmpz(1)};  // j = 0: the single residue class modulo 1
  if (!model.sum_zero) return separable_counts(model, q);
  if (classify(model, p) == PrimeCase::Structural) return local_value_counts_literal(model, p, j);
  return core_block_counts(model, p, q);
}

Fmpq local_density_by_counting(const QuadraticModel& model, const Fmpz& n, ulong p, int j) {
  const auto table = local_value_counts(model, p, j);
  const ulong q = table.size();
  Fmpq out(table[fmpz_fdiv_ui(n.get(), q)]);
  // Normalise by p^{j(r−1)} (for c_t, r − 1 = t − 2).
  Fmpz norm;
  fmpz_set_ui(norm.get(), q);
  fmpz_pow_ui(norm.get(), norm.get(), static_cast<ulong>(model.rank - 1));
  fmpq_div_fmpz(out.get(), out.get(), norm.get());
  return out;
}

Fmpq local_density(const QuadraticModel& model, const Fmpz& n, ulong p) {
  return local_density(model, n, Fmpz::from_ui(p));
}

Fmpq local_density(const QuadraticModel& model, const Fmpz& n, const Fmpz& p) {
  check_prime(p);
  check_model(model);
  const Fmpq X = model_X(model, n);
  switch (classify(model, p)) {
    case PrimeCase::Structural: return Fmpq(1);
    case PrimeCase::Unimodular: return unimodular_beta(model, X, p);
    case PrimeCase::TwoAdicSquares: return squares_beta(model.rank, squares_target(model, X));
  }
  return Fmpq(0);
}

Fmpq local_density_level(const QuadraticModel& model, const Fmpz& n, ulong p, int j) {
  return local_density_level(model, n, Fmpz::from_ui(p), j);
}

Fmpq local_density_level(const QuadraticModel& model, const Fmpz& n, const Fmpz& p, int j) {
  check_prime(p);
  check_model(model);
  if (j < 0) throw UserError("the exponent j must be non-negative (got " + std::to_string(j) + ")");
  const Fmpq X = model_X(model, n);
  if (j == 0) return Fmpq(1);
  switch (classify(model, p)) {
    case PrimeCase::Structural: return Fmpq(1);
    case PrimeCase::Unimodular: return unimodular_level(model, X, p, j);
    case PrimeCase::TwoAdicSquares: return squares_level(model.rank, squares_target(model, X), j);
  }
  return Fmpq(0);
}

int local_density_stable_exponent(const QuadraticModel& model, const Fmpz& n, ulong p) {
  return local_density_stable_exponent(model, n, Fmpz::from_ui(p));
}

int local_density_stable_exponent(const QuadraticModel& model, const Fmpz& n, const Fmpz& p) {
  check_prime(p);
  check_model(model);
  const Fmpq X = model_X(model, n);
  // See the argument at the top of this file.
  switch (classify(model, p)) {
    case PrimeCase::Structural: return 1;
    case PrimeCase::Unimodular: return static_cast<int>(valuation(X, p) + 1);
    case PrimeCase::TwoAdicSquares: return static_cast<int>(valuation(X, p) + 3);
  }
  return 0;
}

Fmpq local_arc_piece(const QuadraticModel& model, const Fmpz& n, ulong p, int j) {
  return local_arc_piece(model, n, Fmpz::from_ui(p), j);
}

Fmpq local_arc_piece(const QuadraticModel& model, const Fmpz& n, const Fmpz& p, int j) {
  if (j < 0) throw UserError("the exponent j must be non-negative (got " + std::to_string(j) + ")");
  if (j == 0) {
    check_prime(p);
    check_model(model);
    model_X(model, n);
    return Fmpq(1);
  }
  return sub(local_density_level(model, n, p, j), local_density_level(model, n, p, j - 1));
}

bool is_structural_prime(const QuadraticModel& model, ulong p) {
  if (p == 2) return true;
  return model.family.kind != FamilyKind::SumOfSquares && model.family.t % static_cast<long>(p) == 0;
}

// ---- Assembly helpers (docs/MATH.md §5) ---------------------------------------------------------

namespace {

// Squarefree kernel of a non-zero integer (sign kept), by factoring.
Fmpz squarefree_kernel(const Fmpz& x) {
  fmpz_factor_t f;
  fmpz_factor_init(f);
  fmpz_factor(f, x.get());
  Fmpz k(f->sign);
  for (slong i = 0; i < f->num; ++i)
    if (f->exp[i] % 2 == 1) fmpz_mul(k.get(), k.get(), f->p + i);
  fmpz_factor_clear(f);
  return k;
}

// A squarefree integer in the square class of det S, without factoring det S (which has
// thousands of digits for large t): c_t: det = t^t / 2^{t−1}; sc_t: t^m; sq_S: 1.
Fmpz det_square_class(const QuadraticModel& m) {
  const long t = m.family.t;
  switch (m.family.kind) {
    case FamilyKind::Core:
      // t odd: t^t ~ t, 2^{t−1} a square. t even: t^t a square, 1/2^{t−1} ~ 2.
      return t % 2 == 1 ? squarefree_kernel(Fmpz(t)) : Fmpz(2);
    case FamilyKind::SelfConjugateCore:
      return (t / 2) % 2 == 1 ? squarefree_kernel(Fmpz(t)) : Fmpz(1);
    case FamilyKind::SumOfSquares: return Fmpz(1);
  }
  return Fmpz(1);
}

}  // namespace

std::vector<Fmpz> local_density_special_primes(const QuadraticModel& model, const Fmpz& n) {
  check_model(model);
  const Fmpq X = model_X(model, n);
  std::vector<Fmpz> out{Fmpz(2)};
  if (model.family.kind != FamilyKind::SumOfSquares) {
    for (ulong p = 3; p <= static_cast<ulong>(model.family.t); ++p)
      if (model.family.t % static_cast<long>(p) == 0 && n_is_prime(p)) out.push_back(Fmpz::from_ui(p));
  }
  // Primes of num(X) and of den(X) (den(X) divides 24, so the latter are among 2, 3).
  for (const fmpz* part : {fmpq_numref(X.get()), fmpq_denref(X.get())}) {
    fmpz_factor_t f;
    fmpz_factor_init(f);
    fmpz_factor(f, part);
    for (slong i = 0; i < f->num; ++i) {
      Fmpz q;
      fmpz_set(q.get(), f->p + i);
      out.push_back(q);
    }
    fmpz_factor_clear(f);
  }
  std::sort(out.begin(), out.end());
  out.erase(std::unique(out.begin(), out.end()), out.end());
  return out;
}

Fmpz local_character_discriminant(const QuadraticModel& model, const Fmpz& n) {
  check_model(model);
  const Fmpq X = model_X(model, n);
  const long r = model.rank;
  Fmpz d = det_square_class(model);
  if (r % 2 == 0) {
    if ((r / 2) % 2 == 1) fmpz_neg(d.get(), d.get());
  } else {
    // (−1)^{(r−1)/2} det S · X: X = a/b is in the square class of a·b.
    Fmpz ab;
    fmpz_mul(ab.get(), fmpq_numref(X.get()), fmpq_denref(X.get()));
    fmpz_mul(d.get(), d.get(), squarefree_kernel(ab).get());
    if (((r - 1) / 2) % 2 == 1) fmpz_neg(d.get(), d.get());
  }
  d = squarefree_kernel(d);
  // Fundamental discriminant of Q(√d): d if d ≡ 1 mod 4, else 4d.
  if (fmpz_fdiv_ui(d.get(), 4) != 1) fmpz_mul_ui(d.get(), d.get(), 4);
  return d;
}

Fmpq local_density_generic_factor(const QuadraticModel& model, const Fmpz& n, ulong p) {
  return local_density_generic_factor(model, n, Fmpz::from_ui(p));
}

Fmpq local_density_generic_factor(const QuadraticModel& model, const Fmpz& n, const Fmpz& p) {
  check_prime(p);
  const auto special = local_density_special_primes(model, n);
  if (std::binary_search(special.begin(), special.end(), p))
    throw UserError("p = " + p.str() + " is a special prime for " + model.family.name() + " at n = " + n.str());
  const Fmpz D = local_character_discriminant(model, n);
  const int chi = fmpz_kronecker(D.get(), p.get());
  const long r = model.rank;
  if (r % 2 == 0) return sub(Fmpq(1), scale(ppow(p, -r / 2), chi));
  return add(Fmpq(1), scale(ppow(p, (1 - r) / 2), chi));
}

}  // namespace circlet
