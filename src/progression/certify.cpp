#include "progression/certify.hpp"

#include <flint/fmpz_factor.h>
#include <flint/ulong_extras.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <mutex>
#include <tuple>

#include "core/error.hpp"
#include "progression/ball_io.hpp"
#include "progression/interval.hpp"
#include "progression/pinning.hpp"
#include "progression/tail_bound.hpp"

namespace circlet {

namespace {

// The tail bound depends only on (r, Q, q2, prec): cache it for scans.
void cached_tail(arb_t log_bound, arb_t interval, int rank, ulong Q, ulong q2, slong prec) {
  static std::mutex mu;
  static std::map<std::tuple<int, ulong, ulong, slong>, std::pair<Arb, Arb>> cache;
  std::lock_guard<std::mutex> lock(mu);
  auto key = std::make_tuple(rank, Q, q2, prec);
  auto it = cache.find(key);
  if (it == cache.end()) {
    Arb s, t;
    tail_log_bound(s, rank, Q, q2, prec);
    tail_interval(t, rank, Q, q2, prec);
    it = cache.emplace(key, std::make_pair(s, t)).first;
  }
  arb_set(log_bound, it->second.first);
  arb_set(interval, it->second.second);
}

struct PrimeData {
  ulong p;
  std::vector<PinnedClass> classes;  // defined ones only (β^G ≠ 0)
  size_t lo = 0, hi = 0;             // indices of min and max ρ
  bool varies = false;
};

PrimeData prime_data(const ProgressionPair& pair, ulong p) {
  PrimeData d;
  d.p = p;
  for (auto& c : pinned_classes(pair, p, default_pin_depth(pair, p)))
    if (c.defined()) d.classes.push_back(std::move(c));
  for (size_t i = 0; i < d.classes.size(); ++i) {
    if (fmpq_cmp(d.classes[i].rho().get(), d.classes[d.lo].rho().get()) < 0) d.lo = i;
    if (fmpq_cmp(d.classes[i].rho().get(), d.classes[d.hi].rho().get()) > 0) d.hi = i;
  }
  d.varies = !d.classes.empty() && d.classes[d.lo].rho() != d.classes[d.hi].rho();
  return d;
}

// log(max/min) as a double, only to rank primes (never used as a bound).
double spread(const PrimeData& d) {
  if (!d.varies) return 0.0;
  Fmpq lo = d.classes[d.lo].rho(), hi = d.classes[d.hi].rho();
  if (lo.is_zero()) return 1e300;
  return std::log(fmpq_get_d(hi.get()) / fmpq_get_d(lo.get()));
}

ClassFactor to_factor(const PinnedClass& c) {
  ClassFactor f;
  f.p = c.p;
  f.e = c.e;
  f.residue = c.r;
  f.betaF = c.betaF;
  f.betaG = c.betaG;
  return f;
}

// res ≡ r_i (mod m_i) for all i; 0 ≤ res < Π m_i.
void crt_combine(Fmpz& res, Fmpz& mod, const Fmpz& r, const Fmpz& m) {
  // res' = res + mod·((r − res)·mod^{-1} mod m)
  if (fmpz_is_one(m)) return;
  Fmpz inv, t;
  CIRCLET_ASSERT(fmpz_invmod(inv, mod, m) != 0, "CRT moduli not coprime");
  fmpz_sub(t, r, res);
  fmpz_mul(t, t, inv);
  fmpz_mod(t, t, m);
  fmpz_mul(t, t, mod);
  fmpz_add(res, res, t);
  fmpz_mul(mod, mod, m);
}

void add_prime_factors(std::vector<ulong>& ps, const fmpz_t n) {
  if (fmpz_is_zero(n)) return;
  fmpz_factor_t f;
  fmpz_factor_init(f);
  fmpz_factor(f, n);
  for (slong i = 0; i < f->num; ++i) ps.push_back(fmpz_get_ui(f->p + i));
  fmpz_factor_clear(f);
}

// Why an UNDECIDED with a varying ρ_p was undecided (certify.hpp, step 5).
struct OverlapCause {
  bool varies = false;          // some ρ_p varied (intervals were compared)
  bool finite_tail = false;     // some Q gave a finite tail bound
  bool nonfinite_tail = false;  // some Q gave no finite tail bound at this precision
  bool mathematics = false;     // at the last Q compared: |log(P_1/P_2)| ≤ 2S proved
  ulong Q = 0;
};

Certificate certify_pair_at(const ProgressionPair& pair, const CertifyOptions& opt, OverlapCause* cause);

}  // namespace

bool x_proportional(const ProgressionPair& pair, Fmpq* lambda) {
  // X_F = A n + b_F, X_G = A' n + b_G proportional  <=>  A'·b_F = A·b_G; then λ = A'/A.
  Fmpq l, r;
  fmpq_mul_fmpz(l, pair.xF.b, pair.xG.a);
  fmpq_mul_fmpz(r, pair.xG.b, pair.xF.a);
  if (l != r) return false;
  fmpq_set_fmpz_frac(*lambda, pair.xG.a, pair.xF.a);
  return true;
}

Fmpq discriminant_product(const ProgressionPair& pair, const Fmpq& lambda) {
  Fmpq d;
  fmpq_mul(d, pair.F.det_gram, pair.G.det_gram);
  if (pair.rank() % 2 == 1) fmpq_mul(d, d, lambda);
  return d;
}

bool fmpq_is_square(const Fmpq& x) {
  return fmpq_sgn(x.get()) >= 0 && fmpz_is_square(fmpq_numref(x.get())) && fmpz_is_square(fmpq_denref(x.get()));
}

std::vector<ulong> constant_route_primes(const ProgressionPair& pair, const Fmpq& lambda) {
  std::vector<ulong> ps{2, 3};
  add_prime_factors(ps, Fmpz(pair.F.family.t));
  add_prime_factors(ps, Fmpz(pair.G.family.t));
  {
    Fmpz n;
    fmpz_abs(n, fmpq_numref(lambda.get()));
    add_prime_factors(ps, n);
  }
  {
    Fmpz d;
    fmpz_set(d, fmpq_denref(lambda.get()));
    add_prime_factors(ps, d);
  }
  std::sort(ps.begin(), ps.end());
  ps.erase(std::unique(ps.begin(), ps.end()), ps.end());
  return ps;
}

namespace {

Certificate certify_pair_at(const ProgressionPair& pair, const CertifyOptions& opt, OverlapCause* cause) {
  *cause = OverlapCause{};
  cause->mathematics = true;
  Certificate c;
  c.F = pair.F.family.name();
  c.G = pair.G.family.name();
  c.apF = pair.apF;
  c.apG = pair.apG;
  c.rank = pair.rank();
  c.prec = opt.prec;
  c.Q_max = opt.Q_max;
  c.provenance = Provenance::now(command_line(), opt.prec);
  const slong prec = opt.prec;

  if (pair.identical()) {
    c.verdict = Verdict::Constant;
    c.constant_route = "identical";
    c.reason = "the same family on the same progression: the two sequences are identical, every rho_p = 1";
    c.constant_square = Fmpq(1);
    c.constant_value = Fmpq(1);
    arb_one(c.constant);
    c.contains_integer = true;
    c.integer = Fmpz(1);
    return c;
  }
  if (!tail_converges(c.rank)) {
    c.verdict = Verdict::Undecided;
    c.reason = "weight " + weight_string(c.rank) +
               " <= 2: the product over primes does not converge absolutely and the cusp part is not known "
               "to be o(main term); no certificate (compare exact counts instead)";
    return c;
  }
  CIRCLET_ASSERT(opt.Q_max >= 3 && opt.q2 > opt.Q_max, "bad certify options");

  // Route 1': proportional X and a square discriminant product.
  Fmpq lambda;
  ulong exact_tail_from = 0;  // proportional route: ρ_q = 1 for all q > this (0: no such argument)
  if (x_proportional(pair, &lambda) && fmpq_is_square(discriminant_product(pair, lambda))) {
    exact_tail_from = constant_route_primes(pair, lambda).back();
    bool all_constant = true;
    std::vector<ClassFactor> classes;
    std::vector<std::pair<ulong, Fmpq>> rhos;
    Fmpq product(1);
    std::string why;
    for (ulong p : constant_route_primes(pair, lambda)) {
      bool complete = false;
      auto cls = pinned_classes(pair, p, default_pin_depth(pair, p) + 2, &complete);
      if (!complete) {
        all_constant = false;
        why = "at p = " + std::to_string(p) + " X has a p-adic zero on the progression (beta_p not pinned near it)";
        break;
      }
      for (const auto& pc : cls) {
        if (!pc.defined() || pc.rho() != cls[0].rho()) {
          all_constant = false;
          why = "rho_" + std::to_string(p) + " takes different values";
          break;
        }
        classes.push_back(to_factor(pc));
      }
      if (!all_constant) break;
      rhos.emplace_back(p, cls[0].rho());
      fmpq_mul(product, product, cls[0].rho());
    }
    if (all_constant) {
      c.verdict = Verdict::Constant;
      c.constant_route = "proportional";
      c.lambda = lambda;
      c.discriminant_product = discriminant_product(pair, lambda);
      c.finite_classes = std::move(classes);
      c.finite_rho = std::move(rhos);
      // L² = (det S_G/det S_F)·(A/A')^{r−2}·Π ρ_p²
      Fmpq sq, base;
      fmpq_div(sq, pair.G.det_gram, pair.F.det_gram);
      fmpq_set_si(base, pair.apF.A, static_cast<ulong>(pair.apG.A));
      fmpq_pow_si(base, base, c.rank - 2);
      fmpq_mul(sq, sq, base);
      fmpq_mul(sq, sq, product);
      fmpq_mul(sq, sq, product);
      c.constant_square = sq;
      // L is rational on this route: det S_G/det S_F·(A/A')^{r−2} = D/(det S_F·λ^{[r odd]})²·(square).
      CIRCLET_ASSERT(fmpq_is_square(sq), "constant of the proportional route is not rational");
      fmpz_sqrt(fmpq_numref(c.constant_value.get()), fmpq_numref(sq.get()));
      fmpz_sqrt(fmpq_denref(c.constant_value.get()), fmpq_denref(sq.get()));
      arb_set_fmpq(c.constant, sq, prec);
      arb_sqrt(c.constant, c.constant, prec);
      c.contains_integer = fmpz_is_one(fmpq_denref(sq.get())) && fmpz_is_square(fmpq_numref(sq.get()));
      if (c.contains_integer) fmpz_sqrt(c.integer, fmpq_numref(sq.get()));
      ball_add_margin(c.constant, prec / 2);
      c.reason = "X_G = " + lambda.str() + " X_F and the characters agree: rho_p = 1 outside {2, 3, primes of t_F t_G lambda}, "
                 "constant on the progression at those primes; the constant is " + c.constant_value.str() + " (exact)" +
                 (c.contains_integer ? " = " + c.integer.str() + ", an INTEGER" : ", not an integer");
      return c;
    }
    c.reason = why;  // fall through to the search for a varying ρ_p
  }

  std::vector<PrimeData> primes;
  size_t best = 0;
  bool any_varies = false;
  const ulong search_limit = std::max<ulong>(opt.Q_max, exact_tail_from);
  for (ulong p = 2; p <= search_limit; p = n_nextprime(p, 1)) {
    primes.push_back(prime_data(pair, p));
    const PrimeData& d = primes.back();
    if (d.classes.empty()) {
      c.verdict = Verdict::Undecided;
      c.reason = "no pinned class at p = " + std::to_string(p) + " on which beta_p^G is non-zero";
      return c;
    }
    if (d.varies && (!any_varies || spread(d) > spread(primes[best]))) best = primes.size() - 1;
    any_varies = any_varies || d.varies;
    if (p < 3 || !any_varies) continue;

    // Try Q = p.
    c.Q = p;
    c.q2 = opt.q2;
    if (exact_tail_from != 0 && p >= exact_tail_from) {
      // ρ_q = 1 for every q > Q (route 1' argument in certify.hpp): the tail is exactly 1.
      c.tail_exact = true;
      c.lambda = lambda;
      c.discriminant_product = discriminant_product(pair, lambda);
      arb_zero(c.tail_log);
      arb_one(c.tail);
    } else {
      c.tail_exact = false;
      cached_tail(c.tail_log, c.tail, c.rank, c.Q, c.q2, prec);
    }
    if (!arb_is_finite(c.tail_log)) {
      cause->nonfinite_tail = true;
      cause->mathematics = false;
      continue;
    }
    cause->finite_tail = true;
    c.distinguishing_prime = primes[best].p;
    c.classes.assign(2, CertClass{});
    c.modulus_factors.clear();
    Fmpz mods[2] = {Fmpz(1), Fmpz(1)};
    Fmpz res[2] = {Fmpz(0), Fmpz(0)};
    for (size_t i = 0; i < primes.size(); ++i) {
      const PrimeData& d = primes[i];
      for (int k = 0; k < 2; ++k) {
        const PinnedClass& pc = (i == best) ? d.classes[k == 0 ? d.hi : d.lo] : d.classes[0];
        c.classes[k].factors.push_back(to_factor(pc));
      }
      // Both classes use the modulus p^{max e} at p (a class mod p^e is a union of classes mod p^{e'}, e' ≥ e).
      ulong e = std::max(c.classes[0].factors.back().e, c.classes[1].factors.back().e);
      c.modulus_factors.emplace_back(d.p, e);
      Fmpz pe;
      fmpz_ui_pow_ui(pe, d.p, e);
      for (int k = 0; k < 2; ++k) crt_combine(res[k], mods[k], c.classes[k].factors.back().residue, pe);
    }
    c.modulus = mods[0];
    sigma_and_power(c, pair, opt.n0, prec);
    for (int k = 0; k < 2; ++k) {
      c.classes[k].residue = res[k];
      c.classes[k].pinned_product = Fmpq(1);
      for (const auto& f : c.classes[k].factors) {
        fmpq_mul(c.classes[k].pinned_product, c.classes[k].pinned_product, f.betaF);
        fmpq_div(c.classes[k].pinned_product, c.classes[k].pinned_product, f.betaG);
      }
      class_intervals(c.classes[k].limit, c.classes[k].from_n0, c.sigma, c.power_limit, c.power_from_n0,
                      c.classes[k].pinned_product, c.tail, prec);
    }
    c.disjoint = !arb_overlaps(c.classes[0].limit, c.classes[1].limit);
    if (!c.disjoint) {
      // Exact-interval test of step 5: |log(P_1/P_2)| ≤ 2S (both sides balls; "≤" only when proved).
      Fmpq q;
      fmpq_div(q, c.classes[0].pinned_product, c.classes[1].pinned_product);
      Arb lr, two_s;
      arb_set_fmpq(lr, q, prec);
      arb_log(lr, lr, prec);
      arb_abs(lr, lr);
      arb_mul_2exp_si(two_s, c.tail_log, 1);
      cause->Q = c.Q;
      if (c.tail_exact || !arb_le(lr, two_s)) cause->mathematics = false;
    }
    if (c.disjoint) {
      c.verdict = Verdict::NonConvergent;
      c.reason = "rho_" + std::to_string(c.distinguishing_prime) +
                 " differs on the two classes and the limit intervals are disjoint at Q = " + std::to_string(c.Q);
      // Margins so that recomputation at another precision lands inside the stored balls.
      for (auto* b : {c.sigma.get(), c.power_limit.get(), c.power_from_n0.get(), c.tail_log.get(), c.tail.get()})
        ball_add_margin(b, prec / 2);
      for (auto& k : c.classes) {
        ball_add_margin(k.limit, prec / 2);
        ball_add_margin(k.from_n0, prec / 2);
      }
      c.disjoint = !arb_overlaps(c.classes[0].limit, c.classes[1].limit);
      if (c.disjoint) return c;
      cause->mathematics = false;  // disjoint before the margins: precision
    }
  }
  Certificate u;
  u.F = c.F;
  u.G = c.G;
  u.apF = c.apF;
  u.apG = c.apG;
  u.rank = c.rank;
  u.prec = c.prec;
  u.Q_max = c.Q_max;
  u.provenance = c.provenance;
  u.verdict = Verdict::Undecided;
  cause->varies = any_varies;
  u.reason = any_varies ? "some rho_p varies, but the limit intervals overlap for every Q <= " +
                              std::to_string(opt.Q_max)
                        : "rho_p is constant on the progression for every p <= " + std::to_string(opt.Q_max) +
                              "; constancy at larger primes is not proved";
  return u;
}

}  // namespace

Certificate certify_pair(const ProgressionPair& pair, const CertifyOptions& opt) {
  // Adaptive precision (certify.hpp, step 5): only the decision is repeated; a
  // higher precision never changes which Q and classes are tried.
  CertifyOptions o = opt;
  for (;;) {
    OverlapCause cause;
    Certificate c = certify_pair_at(pair, o, &cause);
    const std::string bits = std::to_string(o.prec) + " bits";
    if (c.verdict != Verdict::Undecided || !cause.varies) {
      if (o.prec > opt.prec) c.reason += " (decided at " + bits + "; " + std::to_string(opt.prec) + " bits did not separate the intervals)";
      return c;
    }
    // Mathematics only when every Q was compared with a finite tail bound (a Q
    // skipped for its tail at this precision might separate at a higher one).
    if (cause.mathematics) {
      c.reason += "; cause: mathematics (at every Q compared, up to Q = " + std::to_string(cause.Q) +
                  ", the exact intervals overlap: |log(P1/P2)| <= 2 S(Q), so more precision cannot separate them)";
      return c;
    }
    if (o.prec >= opt.prec_max) {
      c.reason += "; cause: precision (the exact intervals would be disjoint" +
                  std::string(cause.nonfinite_tail ? ", or some Q had no finite tail bound" : "") + ", but " + bits +
                  " did not separate the balls; the cap is --prec-max " + std::to_string(opt.prec_max) + ")";
      return c;
    }
    o.prec = std::min<slong>(2 * o.prec, opt.prec_max);
  }
}

}  // namespace circlet
