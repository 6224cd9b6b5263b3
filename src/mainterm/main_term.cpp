// Assembly of M(n) = σ_∞(X) Π_p β_p(n); the formulas are in main_term.hpp.
#include "mainterm/main_term.hpp"

#include <flint/fmpz_factor.h>
#include <flint/ulong_extras.h>

#include <algorithm>
#include <cstdio>
#include <cmath>
#include <map>
#include <mutex>

#include "core/error.hpp"
#include "mainterm/class_number.hpp"
#include "mainterm/dirichlet_l.hpp"
#include "mainterm/dirichlet_l_theta.hpp"
#include "mainterm/singular_integral.hpp"
#include "quadratic/local_density.hpp"

namespace circlet {

namespace {

int valuation(const Fmpq& X, const Fmpz& pp) {
  Fmpz q;
  int v = 0;
  fmpz_set(q.get(), fmpq_numref(X.get()));
  while (fmpz_divisible(q.get(), pp.get())) {
    fmpz_divexact(q.get(), q.get(), pp.get());
    ++v;
  }
  fmpz_set(q.get(), fmpq_denref(X.get()));
  while (fmpz_divisible(q.get(), pp.get())) {
    fmpz_divexact(q.get(), q.get(), pp.get());
    --v;
  }
  return v;
}

// 1 − c·p^{−e} as an exact rational.
Fmpq one_minus_chi_over(int c, const Fmpz& p, ulong e) {
  Fmpz pe;
  fmpz_pow_ui(pe.get(), p.get(), e);
  Fmpq q;
  fmpq_set_si(q.get(), -c, 1);
  fmpq_div_fmpz(q.get(), q.get(), pe.get());
  fmpq_add_si(q.get(), q.get(), 1);
  return q;
}

// The fixed-character data of an even-rank family, cached (R costs O(f·w)).
struct EvenRankData {
  Fmpz d0;
  Fmpq g;
  Fmpq R;
};

const EvenRankData& even_rank_data(const QuadraticModel& model) {
  static std::mutex mu;
  static std::map<std::pair<int, int>, EvenRankData> cache;
  std::lock_guard<std::mutex> lock(mu);
  auto key = std::make_pair(static_cast<int>(model.family.kind), model.family.t);
  auto it = cache.find(key);
  if (it != cache.end()) return it->second;
  ulong w = model.rank / 2;
  Fmpq D = model.det_gram;
  if (w % 2 == 1) fmpq_neg(D.get(), D.get());
  EvenRankData data;
  data.d0 = fundamental_discriminant(D);
  data.g = discriminant_cofactor(D, data.d0);
  data.R = dirichlet_l_rational(data.d0, w);
  return cache.emplace(key, std::move(data)).first->second;
}

}  // namespace

std::string class_number_refusal(const Fmpz& f, double max_steps) {
  const double steps = hurwitz_class_number_steps(f);
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.3g", steps);
  std::string msg = "the weight-3/2 main term needs the class number H(" + f.str() + "), about " + buf +
                    " sieve steps (cost grows like sqrt|D|)";
  if (!hurwitz_class_number_in_range(f)) return msg + ": beyond the counting route's range |D| < 3*2^64";
  std::snprintf(buf, sizeof buf, "%.0f", std::ceil(steps));
  return msg + "; allow it with --class-number-steps " + buf;
}

void check_main_term_input(const QuadraticModel& model, const Fmpz& n) {
  if (model.rank < 2)
    throw UserError("the main term needs rank ≥ 2, but " + model.family.name() + " has rank " +
                    std::to_string(model.rank));
  if (fmpz_sgn(n.get()) < 0) throw UserError("n must be non-negative, got " + n.str());
  Fmpq X = model.X(n);
  if (fmpq_sgn(X.get()) <= 0)
    throw UserError("X = n + Δ must be positive for the main term; n = " + n.str() + " gives X = " + X.str());
}

MainTerm main_term(const QuadraticModel& model, const Fmpz& n, slong prec, const MainTermOptions& options) {
  check_main_term_input(model, n);
  MainTerm out;
  MainTermParts& P = out.parts;
  const int r = model.rank;
  const bool even = r % 2 == 0;
  const ulong s = even ? r / 2 : (r - 1) / 2;
  P.X = model.X(n);
  P.rank = r;
  P.det_gram = model.det_gram;
  P.L_argument = s;

  const EvenRankData* ed = nullptr;
  if (even) {
    ed = &even_rank_data(model);
    if (fmpz_is_one(ed->d0.get()) && s == 1)
      throw UserError("the main term of " + model.family.name() + " involves ζ(1): no main term of this shape");
    P.discriminant = ed->d0;
    P.cofactor = ed->g;
  } else {
    // D = (−1)^k det S · X; its squarefree kernel fixes the character (docs/MATH.md §5).
    Fmpq D;
    fmpq_mul(D.get(), model.det_gram.get(), P.X.get());
    if (s % 2 == 1) fmpq_neg(D.get(), D.get());
    P.discriminant = fundamental_discriminant(D);
    P.cofactor = discriminant_cofactor(D, P.discriminant);
  }

  // Special primes and the correction C.
  const std::vector<Fmpz> primes = local_density_special_primes(model, n);
  Fmpq C(1);
  for (const Fmpz& p : primes) {
    SpecialPrimeFactor sp;
    sp.p = p;
    sp.valuation = valuation(P.X, p);
    sp.beta = local_density(model, n, p);
    sp.chi = kronecker_symbol(P.discriminant, p);
    if (even) {
      // β_p / (1 − χ(p) p^{−w})
      fmpq_div(sp.correction.get(), sp.beta.get(), one_minus_chi_over(sp.chi, p, s).get());
    } else {
      // β_p (1 − χ(p) p^{−k}) / (1 − p^{−2k})
      fmpq_mul(sp.correction.get(), sp.beta.get(), one_minus_chi_over(sp.chi, p, s).get());
      fmpq_div(sp.correction.get(), sp.correction.get(), one_minus_chi_over(1, p, 2 * s).get());
    }
    fmpq_mul(C.get(), C.get(), sp.correction.get());
    P.special.push_back(std::move(sp));
  }
  P.correction = C;

  Fmpz f;
  fmpz_abs(f.get(), P.discriminant.get());
  // Weight 3/2: L(1, χ) = π H(f)/sqrt(f) (d0 < 0 fundamental, R = H(f)), with H(f) from
  // the counting route of class_number.hpp at cost ≈ sqrt(f/3): exact at every size
  // below the user's limit.
  const bool class_number_route = !even && s == 1 && hurwitz_class_number_in_range(f) &&
                                  hurwitz_class_number_steps(f) <= options.max_class_number_steps;
  if (!even && s == 1 && !class_number_route && fmpz_cmp_ui(f.get(), options.max_exact_conductor) > 0)
    throw UserError(class_number_refusal(f, options.max_class_number_steps));
  // Weight 5/2: L(2, χ) exact from Siegel's divisor sums (dirichlet_l.hpp) at cost ≈ sqrt(f)/2,
  // cheaper than the O(f) Bernoulli sum above a small conductor.
  const bool divisor_sum_route = !even && s == 2 && fmpz_cmp_ui(f.get(), 20000) > 0 && fmpz_bits(f.get()) <= 62 &&
                                 dirichlet_l2_steps(f) <= options.max_divisor_sum_steps;
  // Weight ≥ 7/2 above the Bernoulli limit: the theta functional equation, rounded to the
  // proven denominator (dirichlet_l_theta.hpp), when the user's term limit allows it.
  std::optional<Fmpq> theta_R;
  double theta_terms = 0;
  if (!even && s >= 2 && !divisor_sum_route && !C.is_zero() && !options.skip_l_value &&
      fmpz_cmp_ui(f.get(), options.max_exact_conductor) > 0 && !fmpz_is_one(f.get()) && fmpz_bits(f.get()) <= 60 &&
      (fmpz_sgn(P.discriminant.get()) < 0) == (s % 2 == 1) && options.max_theta_terms > 0) {
    theta_terms = dirichlet_l_theta_terms(P.discriminant, s);
    if (theta_terms <= options.max_theta_terms)
      theta_R = dirichlet_l_rational_theta(P.discriminant, s, options.theta_threads, options.theta_progress);
  }
  const bool exact_route = even || class_number_route || divisor_sum_route || theta_R ||
                           fmpz_cmp_ui(f.get(), options.max_exact_conductor) <= 0;
  const bool need_balls = options.with_parts || (!exact_route && !options.skip_l_value);
  if (need_balls) singular_integral(P.sigma_inf.get(), r, model.det_gram, P.X, prec);

  if (exact_route) {
    Fmpq R = even                 ? ed->R
             : class_number_route ? hurwitz_class_number(f)
             : divisor_sum_route  ? dirichlet_l2_rational_divisor_sums(P.discriminant)
             : theta_R            ? *theta_R
                                  : dirichlet_l_rational(P.discriminant, s);
    P.L_rational = R;
    P.L_route = theta_R
                    ? "exact: L(" + std::to_string(s) + ", chi) by the theta functional equation (" +
                          std::to_string((long)theta_terms) + " terms), rounded to the denominator of B_{k,chi}"
                : divisor_sum_route
                    ? "exact: L(2, chi) from Siegel's divisor sums for zeta_K(-1), K = Q(sqrt(" + f.str() + ")) (" +
                          std::to_string((long)dirichlet_l2_steps(f)) + " sieve steps)"
                : class_number_route
                    ? "exact: class number, H(" + f.str() + ") by counting reduced forms (" +
                          std::to_string((long)hurwitz_class_number_steps(f)) + " sieve steps)"
                    : "exact: generalised Bernoulli number B_{k,χ} (conductor " + f.str() + ")";
    if (need_balls) dirichlet_l_from_rational(P.L_value.get(), R, P.discriminant, s, prec);
    Fmpq M;
    Fmpz xpow, fac;
    if (even) {
      // M = X^{w−1} C / ((w−1)! R g)
      fmpq_pow_si(M.get(), P.X.get(), (slong)s - 1);
      fmpq_mul(M.get(), M.get(), C.get());
      fmpz_fac_ui(fac.get(), s - 1);
      fmpq_div_fmpz(M.get(), M.get(), fac.get());
      fmpq_div(M.get(), M.get(), R.get());
      fmpq_div(M.get(), M.get(), P.cofactor.get());
      // r = 2: Siegel's factor ε = 1/2 (binary forms; the product over p then
      // converges only conditionally and counts each representation twice).
      // C. L. Siegel, "Über die analytische Theorie der quadratischen Formen",
      // Ann. of Math. 36 (1935), 527–606, Hauptsatz with ε = 1/2 for m = n + 1
      // (quoted from memory); the tests check M = r_2 for sq2.
      if (s == 1) fmpq_div_2exp(M.get(), M.get(), 1);
    } else {
      // M = X^k 4^k k! R C / ((2k)! Z f g)
      fmpq_pow_si(M.get(), P.X.get(), (slong)s);
      fmpq_mul_2exp(M.get(), M.get(), 2 * s);
      fmpz_fac_ui(fac.get(), s);
      fmpq_mul_fmpz(M.get(), M.get(), fac.get());
      fmpq_mul(M.get(), M.get(), R.get());
      fmpq_mul(M.get(), M.get(), C.get());
      fmpz_fac_ui(fac.get(), 2 * s);
      fmpq_div_fmpz(M.get(), M.get(), fac.get());
      fmpq_div(M.get(), M.get(), zeta_even_rational(s).get());
      fmpq_div_fmpz(M.get(), M.get(), f.get());
      fmpq_div(M.get(), M.get(), P.cofactor.get());
    }
    arb_set_fmpq(out.ball.get(), M.get(), prec);
    out.exact = std::move(M);
    return out;
  }

  // Ball route (odd rank, large conductor): σ_∞ · L(k, χ)/ζ(2k) · C.
  if (C.is_zero()) {
    // A local obstruction: M(n) = 0 exactly, whatever the L-value.
    out.exact = Fmpq(0);
    arb_zero(out.ball.get());
    P.L_route = "not needed: a special prime has β_p = 0";
    return out;
  }
  if (options.skip_l_value) {
    arb_indeterminate(out.ball.get());
    P.L_route = "skipped";
    return out;
  }
  if (s >= 2) {
    // Tail below 2^{−(prec−18)}: main_term_certified works 20 bits above its target.
    ulong Pmax = dirichlet_l_euler_bound(s, std::max<slong>(prec - 18, 8), options.max_euler_prime);
    dirichlet_l_euler(P.L_value.get(), P.discriminant, s, Pmax, prec);
    P.accuracy_limited = Pmax >= options.max_euler_prime;
    P.L_route = "ball: Euler product over p ≤ " + std::to_string(Pmax) + " with rigorous tail bound";
    if (theta_terms > options.max_theta_terms)  // computed only when the route was allowed
      P.L_route += " (the exact theta route needs " + std::to_string((long)theta_terms) +
                   " terms, above --l-value-terms " + std::to_string((long)options.max_theta_terms) + ")";
  } else {
    arb_indeterminate(P.L_value.get());
    P.L_route = "unavailable: L(1, χ) with conductor " + f.str() + " above the exact-route limit";
    P.accuracy_limited = true;
  }
  Arb z;
  arb_zeta_ui(z, 2 * s, prec + 10);
  arb_mul(out.ball.get(), P.sigma_inf.get(), P.L_value.get(), prec + 10);
  arb_div(out.ball.get(), out.ball.get(), z, prec + 10);
  Arb c;
  arb_set_fmpq(c, C.get(), prec + 10);
  arb_mul(out.ball.get(), out.ball.get(), c, prec);
  return out;
}

CertifiedMainTerm main_term_certified(const QuadraticModel& model, const Fmpz& n, slong digits, slong max_prec,
                                      const MainTermOptions& options) {
  CertifiedMainTerm res;
  const slong want_bits = (slong)std::ceil(digits * 3.3219280948873623) + 1;
  slong prec = want_bits + 20;
  slong last_acc = -1;
  for (;;) {
    res.term = main_term(model, n, prec, options);
    res.prec = prec;
    if (res.term.exact) {
      res.certified = true;
      return res;
    }
    if (arb_rel_accuracy_bits(res.term.ball.get()) >= want_bits) {
      res.certified = true;
      return res;
    }
    // Stop when raising the precision no longer helps: the accuracy is then
    // limited by the Euler-product tail (capped prime bound), not by rounding.
    const slong acc = arb_rel_accuracy_bits(res.term.ball.get());
    if (prec >= max_prec || acc <= last_acc + 2 || res.term.parts.accuracy_limited) return res;
    last_acc = acc;
    prec = std::min(2 * prec, max_prec);
  }
}

double main_term_fast(const QuadraticModel& model, const Fmpz& n, ulong euler_prime) {
  check_main_term_input(model, n);
  if (model.rank % 2 == 0) {
    MainTermOptions o;
    o.with_parts = false;
    MainTerm m = main_term(model, n, 64, o);
    return fmpq_get_d(m.exact->get());
  }
  // Odd rank: σ_∞ · Π_{p≤P} (1 − χ(p)p^{−k})^{−1} / ζ(2k) · C in double (NOT CERTIFIED).
  MainTermOptions o;
  o.with_parts = false;
  o.max_exact_conductor = 0;  // no O(f) work
  o.skip_l_value = true;      // the L-value is approximated below instead
  const int r = model.rank;
  const ulong k = (r - 1) / 2;
  MainTerm m = main_term(model, n, 32, o);
  if (m.exact) return fmpq_get_d(m.exact->get());
  static std::vector<ulong> primes;
  static ulong primes_to = 0;
  static std::mutex mu;
  {
    std::lock_guard<std::mutex> lock(mu);
    if (primes_to < euler_prime) {
      primes.clear();
      n_primes_t it;
      n_primes_init(it);
      for (ulong p = n_primes_next(it); p <= euler_prime; p = n_primes_next(it)) primes.push_back(p);
      n_primes_clear(it);
      primes_to = euler_prime;
    }
  }
  const Fmpz& d = m.parts.discriminant;
  double L = 1.0;
  for (ulong p : primes) {
    if (p > euler_prime) break;
    int c = kronecker_symbol_prime(d, p);
    if (c) L /= 1.0 - c * std::pow((double)p, -(double)k);
  }
  const double X = fmpq_get_d(m.parts.X.get());
  const double det = fmpq_get_d(model.det_gram.get());
  const double sigma = std::exp(0.5 * r * std::log(M_PI) + (0.5 * r - 1) * std::log(X) - std::lgamma(0.5 * r) -
                                0.5 * std::log(det));
  // ζ(2k) = Z π^{2k}
  const double z = fmpq_get_d(zeta_even_rational(k).get()) * std::pow(M_PI, 2.0 * (double)k);
  return sigma * L / z * fmpq_get_d(m.parts.correction.get());
}

}  // namespace circlet
