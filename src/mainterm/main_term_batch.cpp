// Batched main terms: one pass over the primes for all rows (see the header).
#include "mainterm/main_term_batch.hpp"

#include <flint/ulong_extras.h>

#include <cmath>
#include <algorithm>
#include <atomic>
#include <exception>
#include <mutex>
#include <cstdint>
#include <thread>

#include "core/error.hpp"
#include "mainterm/dirichlet_l.hpp"
#include "mainterm/main_term.hpp"
#include "mainterm/singular_integral.hpp"

namespace circlet {

namespace {

constexpr int kFixedBits = 56;

// Nearest integer to 2^56 · (−log(1 − c p^{−k})), c = ±1.
int64_t fixed_log_factor(ulong p, ulong k, int c) {
  Arb t;
  arb_ui_pow_ui(t, p, k, 128);
  arb_inv(t, t, 128);
  if (c > 0) arb_neg(t, t);
  arb_log1p(t, t, 128);  // log(1 − c p^{−k})
  arb_neg(t, t);
  arb_mul_2exp_si(t, t, kFixedBits);
  Fmpz z;
  arf_get_fmpz(z.get(), arb_midref(t.get()), ARF_RND_NEAR);
  // |mid − value| ≤ rad < 2^{−57} at 128 bits for these magnitudes (values < 1)
  CIRCLET_ASSERT(mag_cmp_2exp_si(arb_radref(t.get()), -2) < 0, "fixed_log_factor: ball too wide");
  return (int64_t)fmpz_get_si(z.get());
}

ulong mod_signed(const Fmpz& x, ulong p) { return fmpz_fdiv_ui(x.get(), p); }

}  // namespace

ulong main_term_batch_prime_bound(int rank, slong bits) {
  if (rank % 2 == 0 || rank < 5) return 0;
  ulong k = (rank - 1) / 2;
  // Smallest P (doubling, then bisection on a double estimate only to choose P)
  // with ε(P, k) = 1.25506 k P^{1−k}/((k−1) log P (1 − P^{−k})) ≤ 2^{−bits−1}.
  auto eps = [&](double P) {
    return 1.25506 * k * std::pow(P, 1.0 - k) / ((k - 1) * std::log(P) * (1 - std::pow(P, -(double)k)));
  };
  double target = std::ldexp(1.0, -(int)bits - 1);
  double lo = 100, hi = 100;
  while (eps(hi) > target && hi < 1e12) hi *= 2;
  for (int it = 0; it < 60 && hi - lo > 1; ++it) {
    double mid = 0.5 * (lo + hi);
    (eps(mid) > target ? lo : hi) = mid;
  }
  return (ulong)std::ceil(hi);
}

std::vector<Arb> main_term_batch(const QuadraticModel& model, long first, long step, long count, ulong P,
                                 slong prec) {
  CIRCLET_ASSERT(first >= 0 && step >= 1 && count >= 0, "main_term_batch: bad row range");
  std::vector<Arb> out(count);
  const int r = model.rank;
  MainTermOptions opt;
  opt.with_parts = false;
  const bool batched_l = r % 2 == 1 && r >= 5;
  if (batched_l) {
    opt.max_exact_conductor = 0;
    opt.skip_l_value = true;
  }
  // Per row, only what the batched L-values need: σ_∞, C and d0.
  std::vector<char> valid(count, 0);
  std::vector<Arb> sigma(batched_l ? count : 0);
  std::vector<Fmpq> corr(batched_l ? count : 0);
  std::vector<slong> d0(batched_l ? count : 0, 0);
  Arb sigma_const;  // σ_∞(1), zero until first needed
  for (long i = 0; i < count; ++i) {
    Fmpz n(first + step * i);
    Fmpq X = model.X(n);
    if (fmpq_sgn(X.get()) <= 0) {
      arb_indeterminate(out[i].get());
      continue;
    }
    MainTerm m = main_term(model, n, prec, opt);
    if (m.exact || !batched_l) {
      out[i] = std::move(m.ball);
      continue;
    }
    valid[i] = 1;
    // σ_∞(X) = K · X^{(r−2)/2} with K = π^{r/2}/(Γ(r/2) sqrt(det S)) computed once;
    // r odd: X^{(r−2)/2} = X^{(r−3)/2} · sqrt(X).
    if (i == 0 || arb_is_zero(sigma_const)) {
      Fmpq one(1);
      singular_integral(sigma_const.get(), r, model.det_gram, one, prec + 20);
    }
    {
      Arb x, t;
      arb_set_fmpq(x, m.parts.X.get(), prec + 20);
      arb_sqrt(t, x, prec + 20);
      arb_pow_ui(x, x, (r - 3) / 2, prec + 20);
      arb_mul(t, t, x, prec + 20);
      arb_mul(sigma[i].get(), t, sigma_const, prec + 20);
    }
    if (fmpz_bits(m.parts.discriminant.get()) >= 62) {
      // The batched pass keeps d0(n) in 64 bits; beyond that the row takes the
      // single-value route (main_term with its own L-value), which has no such limit.
      MainTermOptions single;
      single.with_parts = false;
      out[i] = main_term(model, n, prec, single).ball;
      valid[i] = 0;
      continue;
    }
    corr[i] = std::move(m.parts.correction);
    d0[i] = fmpz_get_si(m.parts.discriminant.get());
  }
  if (!batched_l) return out;

  const ulong k = (r - 1) / 2;
  std::vector<int64_t> acc(count, 0);

  // E(n) = s·(a + b n), s = (−1)^k num(det) den(det) b.
  Fmpz a, b, s;
  fmpz_set(a.get(), fmpq_numref(model.delta.get()));
  fmpz_set(b.get(), fmpq_denref(model.delta.get()));
  fmpz_mul(s.get(), fmpq_numref(model.det_gram.get()), fmpq_denref(model.det_gram.get()));
  fmpz_mul(s.get(), s.get(), b.get());
  if (k % 2 == 1) fmpz_neg(s.get(), s.get());

  // p = 2: directly.
  ulong nprimes = 0;
  {
    int64_t Lp = fixed_log_factor(2, k, 1), Lm = fixed_log_factor(2, k, -1);
    for (long i = 0; i < count; ++i)
      if (valid[i]) {
        int c = kronecker_symbol(d0[i], 2);
        acc[i] += c > 0 ? Lp : (c < 0 ? Lm : 0);
      }
    ++nprimes;
  }
  std::vector<int8_t> period;
  period.reserve(P + 1);
  n_primes_t it;
  n_primes_init(it);
  n_primes_next(it);  // skip 2
  for (ulong p = n_primes_next(it); p <= P; p = n_primes_next(it)) {
    ++nprimes;
    const ulong sp = mod_signed(s, p), ap = mod_signed(a, p), bp = mod_signed(b, p);
    ulong rr = n_mulmod2(sp, (ap + n_mulmod2(bp, (ulong)first % p, p)) % p, p);
    const ulong delta = n_mulmod2(n_mulmod2(sp, bp, p), (ulong)step % p, p);
    if ((ulong)count * 32 < p) {  // a Jacobi symbol costs ~ 30 table steps
      // Few rows for this prime: Jacobi symbols directly instead of a table of size p.
      const int64_t v3[3] = {fixed_log_factor(p, k, -1), 0, fixed_log_factor(p, k, 1)};
      for (long i = 0; i < count; ++i) {
        if (valid[i]) {
          int c = rr == 0 ? kronecker_symbol(d0[i], p) : n_jacobi_unsigned(rr, p);
          acc[i] += v3[c + 1];
        }
        rr += delta;
        if (rr >= p) rr -= p;
      }
      continue;
    }
    // Period table in row order: U[j] = (E(n_{i}) / p) for i ≡ j (mod p), since
    // E(n_i) ≡ rr + j·delta. Squares x² sit at j ≡ (x² − rr)·delta^{−1} (mod p);
    // when delta ≡ 0 every row has the same symbol. Rows are then read sequentially.
    const int64_t val[3] = {fixed_log_factor(p, k, -1), 0, fixed_log_factor(p, k, 1)};
    if (delta == 0) {
      const int c = rr == 0 ? 0 : n_jacobi_unsigned(rr, p);
      for (long i = 0; i < count; ++i) {
        if (!valid[i]) continue;
        acc[i] += c != 0 ? val[c + 1] : val[kronecker_symbol(d0[i], p) + 1];
      }
      continue;
    }
    const ulong dinv = n_invmod(delta, p);
    // period[t] = index into val of the rows i ≡ t (mod p): 0 = non-residue by
    // default, 2 = square, 1 = the zero class (p | E), fixed below. An int8 table
    // stays in cache while the squares are scattered into it.
    period.assign(p, 0);
    ulong J = n_mulmod2((p - rr) % p, dinv, p);
    const ulong zero_class = J;
    period[J] = 1;
    {
      // J(x) = (x² − rr)·dinv mod p by additions only: J(x) = J(x−1) + inc(x),
      // inc(x) = (2x − 1)·dinv, inc(x+1) = inc(x) + 2·dinv (all mod p).
      const ulong two_dinv = (2 * dinv) % p;
      ulong inc = dinv;
      for (ulong x = 1; x <= p / 2; ++x) {
        J += inc;
        if (J >= p) J -= p;
        period[J] = 2;
        inc += two_dinv;
        if (inc >= p) inc -= p;
      }
    }
    const int8_t* per = period.data();
    for (long base = 0; base < count; base += (long)p) {
      const long len = std::min<long>((long)p, count - base);
      int64_t* a = acc.data() + base;
      for (long t = 0; t < len; ++t) a[t] += val[per[t]];  // sequential in rows and table
    }
    // Rows with p | E(n): the character of d0(n) itself decides.
    for (long i = (long)zero_class; i < count; i += (long)p)
      if (valid[i]) acc[i] += val[kronecker_symbol(d0[i], p) + 1];
  }
  n_primes_clear(it);

  // Radius: rounding nprimes·2^{−56} plus the tail ε(P, k).
  Arb eps, zeta, logL, rnd;
  dirichlet_l_euler_tail(eps, k, P, prec + 10);
  arb_set_ui(rnd, nprimes);
  arb_mul_2exp_si(rnd, rnd, -kFixedBits);
  arb_add(eps, eps, rnd, prec + 10);
  arb_zeta_ui(zeta, 2 * k, prec + 10);
  Arb c;
  for (long i = 0; i < count; ++i) {
    if (!valid[i]) continue;
    arb_set_si(logL, acc[i]);
    arb_mul_2exp_si(logL, logL, -kFixedBits);
    arb_add_error(logL, eps);
    arb_exp(logL, logL, prec + 10);  // L(k, χ) ∈ exp(Σ_{p≤P} ... ± (rounding + ε))
    arb_mul(out[i].get(), sigma[i].get(), logL, prec + 10);
    arb_div(out[i].get(), out[i].get(), zeta, prec + 10);
    arb_set_fmpq(c, corr[i].get(), prec + 10);
    arb_mul(out[i].get(), out[i].get(), c, prec);
  }
  return out;
}

std::vector<TableMainTerm> main_term_table(const QuadraticModel& model, long first, long step, long count,
                                           slong bits, ulong max_prime, slong prec, const MainTermOptions& options,
                                           const std::function<void(double)>& progress) {
  CIRCLET_ASSERT(first >= 0 && step >= 1 && count >= 0, "main_term_table: bad row range");
  std::vector<TableMainTerm> out(count);
  const int r = model.rank;
  // Odd rank ≥ 7 exact row by row costs O(f·k) per row (generalised Bernoulli numbers,
  // f ≤ det S·X): affordable for small tables only.
  const double last_n = (double)first + (double)step * (double)std::max<long>(count - 1, 0);
  const double bernoulli_work = (double)count * std::fabs(fmpq_get_d(model.det_gram.get())) * (last_n + 2);
  // Weight 5/2 exact rows (divisor sums) cost ≈ sqrt(f) each: the batched Euler
  // product is cheaper for large tables (10^6 rows of c_6: about 35 s of balls
  // against about 150 s exact).
  const double divisor_sum_work = (double)count * std::sqrt(std::fabs(fmpq_get_d(model.det_gram.get())) * (last_n + 2));
  if ((r % 2 == 1 && r >= 7 && bernoulli_work > 3e7) || (r == 5 && divisor_sum_work > 2e9)) {
    // One pass over the primes for all rows (exact sums would cost O(X) or O(sqrt X) per row).
    const ulong P = std::min<ulong>(main_term_batch_prime_bound(r, bits), max_prime);
    std::vector<Arb> b = main_term_batch(model, first, step, count, P, prec);
    for (long i = 0; i < count; ++i) {
      TableMainTerm& t = out[i];
      if (fmpq_sgn(model.X(Fmpz(first + step * i)).get()) <= 0) continue;  // no main term: invalid row
      t.valid = true;
      if (arb_is_zero(b[i].get())) t.exact = Fmpq(0);  // a local obstruction stays exact
      t.ball = std::move(b[i]);
    }
    return out;
  }
  // Row by row (exact), two threads taking blocks of rows in turn (the cost grows with n).
  MainTermOptions opt = options;
  opt.with_parts = false;
  const long block = 256;
  std::atomic<long> next{0};
  std::exception_ptr failure;  // a refusal (UserError) in the helper thread is rethrown here
  std::mutex failure_mu;
  auto work = [&] {
    try {
    for (;;) {
      const long lo = next.fetch_add(block);
      if (lo >= count) return;
      const long hi = std::min(count, lo + block);
      for (long i = lo; i < hi; ++i) {
        Fmpz n(first + step * i);
        if (fmpq_sgn(model.X(n).get()) <= 0) continue;
        MainTerm m = main_term(model, n, prec, opt);
        out[i].valid = true;
        out[i].exact = std::move(m.exact);
        out[i].ball = std::move(m.ball);
      }
      if (progress) {
        std::lock_guard<std::mutex> lock(failure_mu);
        progress((double)hi / (double)count);
      }
    }
    } catch (...) {
      std::lock_guard<std::mutex> lock(failure_mu);
      if (!failure) failure = std::current_exception();
      next = count;  // the other thread stops too
    }
  };
  if (count >= 2 * block) {
    std::thread th(work);
    work();
    th.join();
  } else {
    work();
  }
  if (failure) std::rethrow_exception(failure);
  return out;
}

}  // namespace circlet
