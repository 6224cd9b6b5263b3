#include "arcs/arc_terms.hpp"

#include <arb.h>
#include <flint/fmpq.h>
#include <flint/fmpz_factor.h>
#include <flint/ulong_extras.h>

#include <algorithm>
#include <map>
#include <set>
#include <utility>

#include "core/error.hpp"
#include "mainterm/singular_integral.hpp"
#include "quadratic/local_density.hpp"

namespace circlet {

namespace {

// Prime-power pieces f(p^j) = A_{p^j}(n)/p^{jw}, each computed once.
class PieceCache {
 public:
  PieceCache(const QuadraticModel& model, const Fmpz& n) : model_(model), n_(n) {}
  const Fmpq& piece(ulong p, int j) { return piece(Fmpz::from_ui(p), j); }
  const Fmpq& piece(const Fmpz& p, int j) {
    auto key = std::make_pair(p, j);
    auto it = cache_.find(key);
    if (it != cache_.end()) return it->second;
    return cache_.emplace(key, local_arc_piece(model_, n_, p, j)).first->second;
  }
  // Σ_{j ≥ 0} |f(p^j)|, exact: f(p^j) = 0 beyond the stable exponent.
  Fmpq abs_sum(const Fmpz& p) {
    const int J = local_density_stable_exponent(model_, n_, p);
    Fmpq s(1), a;
    for (int j = 1; j <= J + 1; ++j) {
      fmpq_abs(a.get(), piece(p, j).get());
      fmpq_add(s.get(), s.get(), a.get());
    }
    return s;
  }

 private:
  const QuadraticModel& model_;
  const Fmpz& n_;
  std::map<std::pair<Fmpz, int>, Fmpq> cache_;
};

std::vector<Fmpq> coefficients_with(PieceCache& cache, ulong K) {
  std::vector<Fmpq> out(K);
  n_factor_t fac;
  for (ulong k = 1; k <= K; ++k) {
    Fmpq f(1);
    n_factor_init(&fac);
    if (k > 1) n_factor(&fac, k, 1);
    for (int i = 0; i < fac.num && !f.is_zero(); ++i)
      fmpq_mul(f.get(), f.get(), cache.piece(fac.p[i], static_cast<int>(fac.exp[i])).get());
    out[k - 1] = f;
  }
  return out;
}

}  // namespace

std::vector<Fmpq> arc_coefficients(const QuadraticModel& model, const Fmpz& n, ulong K) {
  PieceCache cache(model, n);
  return coefficients_with(cache, K);
}

ArcTailBound arc_tail_bound(const QuadraticModel& model, const Fmpz& n, const std::vector<Fmpq>& coeffs,
                            slong prec, ulong prime_cutoff) {
  const ulong K = coeffs.size();
  ArcTailBound out;
  out.decay = model.rank / 2;  // s = ⌊r/2⌋
  out.prime_cutoff = prime_cutoff ? prime_cutoff : std::max<ulong>(100000, 100 * K);
  const ulong P0 = std::max(out.prime_cutoff, K);
  out.prime_cutoff = P0;
  const int s = out.decay;
  if (s < 2) {
    arb_pos_inf(out.coefficient_tail.get());
    arb_pos_inf(out.euler_product.get());
    out.method = "no bound: rank " + std::to_string(model.rank) +
                 " <= 3, the singular series does not converge absolutely";
    return out;
  }
  const Fmpq X = model.X(n);
  // The primes where the good-prime closed form |f(p)| = p^{−s}, f(p^j) = 0 (j ≥ 2)
  // is not used: p | 2t and p | X (numerator or denominator).
  const std::vector<Fmpz> special_list = local_density_special_primes(model, n);
  const std::set<Fmpz> special(special_list.begin(), special_list.end());
  PieceCache cache(model, n);
  const slong wp = prec + 30;

  // E = Π_{p ≤ P₀ or special} F_p · exp(P₀^{1−s}/(s−1)),
  // F_p = Σ_j |f(p^j)| exactly for p ≤ K or p special, F_p = 1 + p^{−s} otherwise.
  Arb E, F, term;
  arb_one(E.get());
  n_primes_t it;
  n_primes_init(it);
  for (ulong p = n_primes_next(it); p <= P0; p = n_primes_next(it)) {
    if (p <= K || special.count(Fmpz::from_ui(p))) {
      arb_set_fmpq(F.get(), cache.abs_sum(Fmpz::from_ui(p)).get(), wp);
    } else {
      arb_ui_pow_ui(term.get(), p, static_cast<ulong>(s), wp);
      arb_inv(term.get(), term.get(), wp);
      arb_add_ui(F.get(), term.get(), 1, wp);  // 1 + p^{−s}
    }
    arb_mul(E.get(), E.get(), F.get(), wp);
  }
  n_primes_clear(it);
  const Fmpz P0z = Fmpz::from_ui(P0), Kz = Fmpz::from_ui(K);
  for (const Fmpz& p : special)
    if (P0z < p) {
      out.special_primes.push_back(p);
      arb_set_fmpq(F.get(), cache.abs_sum(p).get(), wp);
      arb_mul(E.get(), E.get(), F.get(), wp);
    }
  // × exp(P₀^{1−s}/(s−1)) ≥ Π_{p > P₀, good} (1 + p^{−s})
  arb_ui_pow_ui(term.get(), P0, static_cast<ulong>(s - 1), wp);
  arb_mul_ui(term.get(), term.get(), static_cast<ulong>(s - 1), wp);
  arb_inv(term.get(), term.get(), wp);
  arb_exp(term.get(), term.get(), wp);
  arb_mul(E.get(), E.get(), term.get(), wp);
  arb_set(out.euler_product.get(), E.get());

  // T = E − Σ_{k≤K} |f(k)| ≥ Σ_{k>K} |f(k)|
  Fmpq S, a;
  for (const auto& c : coeffs) {
    fmpq_abs(a.get(), c.get());
    fmpq_add(S.get(), S.get(), a.get());
  }
  arb_set_fmpq(term.get(), S.get(), wp);
  arb_sub(E.get(), E.get(), term.get(), wp);
  arf_t up;
  arf_init(up);
  arb_get_ubound_arf(up, E.get(), prec);
  if (arf_sgn(up) < 0) arf_zero(up);  // cannot happen mathematically; keep the bound non-negative
  arb_set_arf(out.coefficient_tail.get(), up);
  arf_clear(up);
  for (const Fmpz& p : special)
    if (Kz < p && !(P0z < p)) out.special_primes.push_back(p);
  std::sort(out.special_primes.begin(), out.special_primes.end());
  out.method = "Euler product of |A_k/k^w| minus the partial sum: exact local factors at p <= K and at "
               "primes dividing 2tX, factors 1 + p^-" + std::to_string(s) + " at good primes up to " +
               std::to_string(P0) + ", exp(P0^(1-s)/(s-1)) beyond";
  return out;
}

ArcExpansion arc_expansion(const QuadraticModel& model, const Fmpz& n, ulong K, slong prec) {
  if (K == 0) throw UserError("--upto must be at least 1");
  ArcExpansion out;
  out.n = n;
  out.K = K;
  out.X = model.X(n);
  if (fmpq_sgn(out.X.get()) <= 0)
    throw UserError("X = n + Delta = " + out.X.str() + " is not positive; choose n >= 0");
  singular_integral(out.singular_integral.get(), model.rank, model.det_gram, out.X, prec);

  PieceCache cache(model, n);
  const std::vector<Fmpq> coeffs = coefficients_with(cache, K);
  Arb partial;
  for (ulong k = 1; k <= K; ++k) {
    ArcTerm t;
    t.k = k;
    t.coefficient = coeffs[k - 1];
    fmpq_add(out.coefficient_partial_sum.get(), out.coefficient_partial_sum.get(), t.coefficient.get());
    arb_mul_fmpz(t.term.get(), out.singular_integral.get(), fmpq_numref(t.coefficient.get()), prec);
    arb_div_fmpz(t.term.get(), t.term.get(), fmpq_denref(t.coefficient.get()), prec);
    // The partial sum is σ_∞ times the exact partial sum (no accumulated rounding).
    arb_mul_fmpz(t.partial_sum.get(), out.singular_integral.get(),
                 fmpq_numref(out.coefficient_partial_sum.get()), prec);
    arb_div_fmpz(t.partial_sum.get(), t.partial_sum.get(), fmpq_denref(out.coefficient_partial_sum.get()), prec);
    out.terms.push_back(std::move(t));
  }
  out.tail = arc_tail_bound(model, n, coeffs, prec);

  // Per-k tails from the same Euler product: σ_∞·(E − Σ_{k' ≤ k} |f(k')|) ≥ σ_∞·Σ_{k' > k} |f(k')|.
  {
    Fmpq S, a;
    Arb T;
    arf_t up;
    arf_init(up);
    for (auto& t : out.terms) {
      fmpq_abs(a.get(), t.coefficient.get());
      fmpq_add(S.get(), S.get(), a.get());
      if (!arb_is_finite(out.tail.euler_product.get())) {
        arb_pos_inf(t.tail_bound.get());
        continue;
      }
      arb_set_fmpq(T.get(), S.get(), prec + 30);
      arb_sub(T.get(), out.tail.euler_product.get(), T.get(), prec + 30);
      arb_mul(T.get(), T.get(), out.singular_integral.get(), prec);
      arb_get_ubound_arf(up, T.get(), prec);
      if (arf_sgn(up) < 0) arf_zero(up);
      arb_set_arf(t.tail_bound.get(), up);
    }
    arf_clear(up);
  }

  // σ_∞·T, as an upper bound
  Arb st;
  arb_mul(st.get(), out.singular_integral.get(), out.tail.coefficient_tail.get(), prec);
  arf_t up;
  arf_init(up);
  arb_get_ubound_arf(up, st.get(), prec);
  arb_set_arf(out.term_tail.get(), up);
  arf_clear(up);
  // M(n) ∈ σ_∞·Σ_{k≤K} f(k) ± σ_∞·T
  arb_set(out.enclosure.get(), out.terms.back().partial_sum.get());
  arb_add_error(out.enclosure.get(), out.term_tail.get());
  return out;
}

}  // namespace circlet
