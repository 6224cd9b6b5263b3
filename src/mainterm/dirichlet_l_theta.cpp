// L(k, χ_d) by the theta functional equation with rigorous tails, and its exact
// value by rounding. Formulas and the denominator argument in the header.
#include "mainterm/dirichlet_l_theta.hpp"

#include <arb.h>
#include <arb_hypgeom.h>
#include <flint/arith.h>

#include <algorithm>
#include <atomic>
#include <exception>
#include <mutex>
#include <cmath>
#include <thread>
#include <vector>

#include "core/error.hpp"
#include "mainterm/dirichlet_l.hpp"

namespace circlet {

namespace {

constexpr double kLn2 = 0.69314718055994530942;
constexpr int kSplitExponent = 1;  // A = 4^{−1}: fewer terms on the costly half-integral side

// The fixed data of one evaluation; doubles only choose truncation points and precisions.
struct ThetaPlan {
  ulong f = 0;
  slong ds = 0;         // d as a signed word
  ulong a = 0;          // 0 (d > 0) or 1 (d < 0)
  ulong alpha = 0;      // σ = (k + a)/2, an integer
  ulong m = 0;          // σ' = 1/2 − m
  int e = kSplitExponent;
  double A = 0;         // 4^{−e}
  double log2_tau = 0;  // target absolute error of Λ (log2)
  ulong N1 = 0, N2 = 0; // last n of the integral and of the half-integral series
  double log2_term_tau = 0;
};

// log2 of the double estimate e^{−X} (M^a + M^{a−1}/(2κ)) / D with X = κM²: the
// shape of both tail bounds (the ball versions are in tail_ball).
double log2_tail(double kappa, double M, ulong a, double D) {
  const double X = kappa * M * M;
  const double lead = std::log2(std::pow(M, (double)a) + std::pow(M, (double)a - 1) / (2 * kappa));
  return (-X / kLn2) + lead - std::log2(D);
}

// Smallest N (up to a factor 1 + 1/64) whose tail estimate is below 2^{target}.
// `offset`: the tail is valid once κ(N+1)² > offset; D(X) = X − offset.
ulong choose_cutoff(double kappa, ulong a, double offset, double target) {
  auto tail = [&](double M) {
    const double X = kappa * M * M;
    if (X <= offset + 1) return 1e300;
    return log2_tail(kappa, M, a, X - offset);
  };
  double hi = std::max(2.0, std::sqrt((offset + 2) / kappa) + 1);
  while (tail(hi + 1) > target) hi *= 1.25;
  double lo = hi / 1.25;
  while (hi - lo > std::max(1.0, lo / 64)) {
    const double mid = 0.5 * (lo + hi);
    (tail(mid + 1) > target ? lo : hi) = mid;
  }
  return (ulong)std::ceil(hi);
}

ThetaPlan make_plan(const Fmpz& d, ulong k, double log2_abs_error) {
  CIRCLET_ASSERT(k >= 2, "dirichlet theta route: need k ≥ 2");
  CIRCLET_ASSERT(fmpz_bits(d.get()) < 62 && !fmpz_is_pm1(d.get()),
                 "dirichlet theta route: need 1 < |d| < 2^61");
  CIRCLET_ASSERT(is_fundamental_discriminant(d), "dirichlet theta route: d must be fundamental");
  ThetaPlan p;
  p.ds = fmpz_get_si(d.get());
  p.f = (ulong)(p.ds < 0 ? -p.ds : p.ds);
  p.a = p.ds < 0 ? 1 : 0;
  CIRCLET_ASSERT((k + p.a) % 2 == 0, "dirichlet theta route: need χ(−1) = (−1)^k");
  p.alpha = (k + p.a) / 2;
  p.m = (k - p.a) / 2;
  p.A = std::ldexp(1.0, -2 * p.e);
  p.log2_tau = log2_abs_error;
  const double kappa1 = p.A * M_PI / (double)p.f, kappa2 = M_PI / (p.A * (double)p.f);
  // Each tail gets a quarter of the budget; rounding the terms gets the other half.
  const double l2A1 = -2.0 * p.e * (double)p.alpha, l2A2 = -(double)p.e * (2.0 * p.m - 1);
  p.N1 = choose_cutoff(kappa1, p.a, (double)p.alpha - 1, log2_abs_error - 2 - l2A1);
  p.N2 = choose_cutoff(kappa2, p.a, 0, log2_abs_error - 2 - l2A2);
  CIRCLET_ASSERT(p.N1 < (UWORD(1) << 31) && p.N2 < (UWORD(1) << 31), "dirichlet theta route: too many terms");
  p.log2_term_tau = log2_abs_error - 1 - std::log2((double)(p.N1 + p.N2));
  return p;
}

// log2 of an upper estimate of |n^a A^α E(α, x)|, x = κ1 n².
double log2_term1(const ThetaPlan& p, double n) {
  const double x = p.A * M_PI * n * n / (double)p.f;
  double best = -1e300;
  double c = 1;  // (α−1)!/(α−1−j)!
  for (ulong j = 0; j < p.alpha; ++j) {
    if (j > 0) c *= (double)(p.alpha - j);
    best = std::max(best, std::log2(c) - (double)(j + 1) * std::log2(x));
  }
  return best + std::log2((double)p.alpha) - x / kLn2 + (double)p.a * std::log2(n) - 2.0 * p.e * (double)p.alpha;
}

// log2 of an upper estimate of |n_hi^a A^{−σ'} E(1/2 − m, y)| over a block, y = κ2 n_lo²:
// E(β, y) ≤ min(1/(m − 1/2), e^{−y}/y) for β = 1/2 − m ≤ 0.
double log2_term2(const ThetaPlan& p, double n_lo, double n_hi) {
  const double y = M_PI * n_lo * n_lo / (p.A * (double)p.f);
  const double E = std::min(-std::log2((double)p.m - 0.5), (-y / kLn2) - std::log2(y));
  return E + (double)p.a * std::log2(n_hi) - (double)p.e * (2.0 * p.m - 1);
}

slong block_prec(const ThetaPlan& p, double log2_term) {
  const double bits = log2_term - p.log2_term_tau + 24 + 7.0 * (double)p.m;
  return std::max<slong>(64, (slong)std::ceil(bits));
}

// E(1/2 − m, y) from erfc and the downward recursion E(β, y) = (y E(β+1, y) − e^{−y})/β.
void half_integral_direct(arb_t res, const arb_t y, const arb_t ey, ulong m, slong prec) {
  Arb s, t, pi;
  arb_sqrt(s, y, prec);
  arb_hypgeom_erfc(t, s, prec);
  arb_const_sqrt_pi(pi, prec);
  arb_mul(t, t, pi, prec);
  arb_div(res, t, s, prec);  // E(1/2, y) = sqrt(π/y) erfc(sqrt y)
  for (ulong i = 0; i < m; ++i) {
    // β = 1/2 − (i+1) = −(2i+1)/2:  E(β) = −2 (y E(β+1) − e^{−y}) / (2i+1)
    arb_mul(t, y, res, prec);
    arb_sub(t, t, ey, prec);
    arb_mul_si(t, t, -2, prec);
    arb_div_ui(res, t, 2 * i + 1, prec);
  }
}

struct PartialSums {
  Arb S1, S2;  // Σ χ(n) n^a E(α, x_n) and Σ χ(n) n^a E(1/2 − m, y_n) over the range
};

// The two series over n in [lo, hi] (hi ≤ N1), in blocks that restart every recurrence.
void sum_range(const ThetaPlan& p, ulong lo, ulong hi, PartialSums& out) {
  arb_zero(out.S1);
  arb_zero(out.S2);
  // (α−1)!/(α−1−j)!, j < α: the coefficients of E(α, x) e^{x} in powers of 1/x.
  std::vector<ulong> coef(p.alpha);
  coef[0] = 1;
  for (ulong j = 1; j < p.alpha; ++j) coef[j] = coef[j - 1] * (p.alpha - j);
  Arb pi, kap1, kap2, inv1, inv2, ex, g1, q1, ey, g2, q2, r0, eyh, t, u, poly, term, y, delta, w, eta, rung, acc;
  const slong b2 = 1 - 2 * (slong)p.m;  // 2β0, β0 = 1/2 − m
  // The sums are accumulated at the precision of the largest term (n = 1), the terms at their own.
  const slong sum_prec = block_prec(p, std::max(log2_term1(p, 1), log2_term2(p, 1, (double)p.N2)));
  // 1/j! for the Taylor terms, at the highest precision any block uses.
  std::vector<Arb> invfact(400);
  arb_one(invfact[0]);
  for (size_t j = 1; j < invfact.size(); ++j) arb_div_ui(invfact[j], invfact[j - 1], j, sum_prec + 64);
  for (ulong ns = lo; ns <= hi;) {
    const ulong len = ns < 64 ? 1 : std::min<ulong>(4096, ns / 4);
    const ulong ne = std::min(hi, ns + len - 1);
    const bool half = ns <= p.N2;
    const ulong ne2 = std::min(ne, p.N2);
    const slong wp1 = block_prec(p, log2_term1(p, (double)ns));
    const slong wp2 = half ? block_prec(p, log2_term2(p, (double)ns, (double)ne2)) : 0;
    const slong wpc = std::max(wp1, wp2) + 10;
    // κ1 = Aπ/f, κ2 = π/(A f) (A = 4^{−e} exact), their inverses, and the exponentials at ns.
    arb_const_pi(pi, wpc);
    arb_div_ui(kap1, pi, p.f, wpc);
    arb_mul_2exp_si(kap2, kap1, 2 * p.e);
    arb_mul_2exp_si(kap1, kap1, -2 * p.e);
    arb_inv(inv1, kap1, wpc);
    arb_inv(inv2, kap2, wpc);
    auto exp_neg = [&](arb_t res, const arb_t kap, ulong mult, slong prec) {  // e^{−κ·mult}
      arb_mul_ui(res, kap, mult, prec);
      arb_neg(res, res);
      arb_exp(res, res, prec);
    };
    // e^{−κ(n+1)²} = e^{−κn²} · g_n,  g_n = e^{−κ(2n+1)},  g_{n+1} = g_n · e^{−2κ}.
    exp_neg(ex, kap1, ns * ns, wp1);
    exp_neg(g1, kap1, 2 * ns + 1, wp1);
    exp_neg(q1, kap1, 2, wp1);
    ulong nh = ns;  // position of the half-integral state (r0 = E(β0, y_nh), eyh = e^{−y_nh})
    if (half) {
      exp_neg(ey, kap2, ns * ns, wp2);
      exp_neg(g2, kap2, 2 * ns + 1, wp2);
      exp_neg(q2, kap2, 2, wp2);
      arb_mul_ui(y, kap2, ns * ns, wp2);
      half_integral_direct(r0, y, ey, p.m, wp2);
      arb_set(eyh, ey);
    }
    for (ulong n = ns; n <= ne; ++n) {
      const int chi = kronecker_symbol(p.ds, n);
      if (chi != 0) {
        // E(α, x) = e^{−x} Σ_j coef_j x^{−j−1}, 1/x = inv1/n², by Horner.
        arb_div_ui(u, inv1, n * n, wp1);
        arb_set_ui(poly, coef[p.alpha - 1]);
        for (ulong j = p.alpha - 1; j-- > 0;) {
          arb_mul(poly, poly, u, wp1);
          arb_add_ui(poly, poly, coef[j], wp1);
        }
        arb_mul(poly, poly, u, wp1);
        arb_mul(term, poly, ex, wp1);
        if (p.a == 1) arb_mul_ui(term, term, n, wp1);
        (chi > 0 ? arb_add : arb_sub)(out.S1, out.S1, term, sum_prec);
        if (n <= ne2) {
          if (n != nh) {
            // Taylor from y_nh to y_n: E(β0, y+δ) = Σ_j (−δ)^j/j! E(β0+j, y) + R_J,
            // |R_J| ≤ δ^J/J! E(β0+J, y); rungs E(β+1) = (β E(β) + e^{−y})/y, 1/y = inv2/nh².
            // With σ_j = (−δ)^j E(β0+j, y) and η_j = (−δ)^j e^{−y}, the rungs read
            //   σ_{j+1} = w ((β0+j) σ_j + η_j),  η_{j+1} = −δ η_j,  w = −δ/y = −(n² − nh²)/nh²,
            // and the Taylor terms are σ_j/j!.
            arb_set_ui(w, n * n - nh * nh);
            arb_neg(w, w);
            arb_div_ui(w, w, nh * nh, wp2);
            arb_mul_ui(delta, kap2, n * n - nh * nh, wp2);
            arb_neg(delta, delta);
            arb_set(rung, r0);
            arb_set(eta, eyh);
            arb_set(acc, r0);
            mag_t lim, tm;
            mag_init(lim);
            mag_init(tm);
            arb_get_mag_lower(lim, acc);
            mag_mul_2exp_si(lim, lim, -wp2);
            const slong acc_exp = arf_abs_bound_lt_2exp_si(arb_midref(acc.get()));
            slong pj = wp2;  // later rungs contribute less: each is computed to the bits it needs
            for (ulong j = 0;; ++j) {
              CIRCLET_ASSERT(j + 1 < invfact.size(), "dirichlet theta route: Taylor step did not converge");
              arb_mul_si(rung, rung, b2 + 2 * (slong)j, pj);
              arb_mul_2exp_si(rung, rung, -1);
              arb_add(rung, rung, eta, pj);
              arb_mul(rung, rung, w, pj);  // σ_{j+1}
              arb_mul(eta, eta, delta, pj);
              arb_mul(t, rung, invfact[j + 1], pj);  // (−δ)^{j+1}/(j+1)! E(β0+j+1, y)
              arb_get_mag(tm, t);
              if (mag_cmp(tm, lim) <= 0) {
                arb_add_error_mag(acc, tm);  // Lagrange remainder, |R_{j+1}| ≤ δ^{j+1}/(j+1)! E(β0+j+1, y)
                break;
              }
              arb_add(acc, acc, t, wp2);
              pj = std::max<slong>(32, wp2 - (acc_exp - arf_abs_bound_lt_2exp_si(arb_midref(t.get()))) + 8);
            }
            mag_clear(lim);
            mag_clear(tm);
            arb_swap(r0, acc);
            arb_set(eyh, ey);
            nh = n;
          }
          if (p.a == 1)
            arb_mul_ui(term, r0, n, wp2);
          else
            arb_set(term, r0);
          (chi > 0 ? arb_add : arb_sub)(out.S2, out.S2, term, sum_prec);
        }
      }
      arb_mul(ex, ex, g1, wp1);
      arb_mul(g1, g1, q1, wp1);
      if (half && n < ne2) {
        arb_mul(ey, ey, g2, wp2);
        arb_mul(g2, g2, q2, wp2);
      }
    }
    ns = ne + 1;
  }
}

// Ball bound of e^{−X} (M^a + M^{a−1}/(2κ)) / (X − offset), X = κ M² (the tails; see below).
void tail_ball(arb_t res, const arb_t kappa, ulong M, ulong a, ulong offset, slong prec) {
  Arb X, t, u;
  arb_mul_ui(X, kappa, M, prec);
  arb_mul_ui(X, X, M, prec);
  arb_sub_ui(t, X, offset, prec);
  // Validity: X > offset (the bound on E) and 2X > a (n^a e^{−κn²} decreasing for n ≥ M).
  arb_mul_2exp_si(u, X, 1);
  arb_sub_ui(u, u, a, prec);
  if (!arb_is_positive(t) || !arb_is_positive(u)) {
    arb_indeterminate(res);
    return;
  }
  arb_neg(u, X);
  arb_exp(u, u, prec);
  arb_div(u, u, t, prec);
  // M^a + M^{a−1}/(2κ)
  Arb lead;
  arb_mul_2exp_si(t, kappa, 1);
  if (a == 1) {
    arb_inv(t, t, prec);
    arb_add_ui(lead, t, M, prec);
  } else {
    arb_mul_ui(t, t, M, prec);
    arb_inv(t, t, prec);
    arb_add_ui(lead, t, 1, prec);
  }
  arb_mul(res, u, lead, prec);
}

// Λ(k, χ) = A^α (S1 + tail1) + A^{−σ'} (S2 + tail2), tails as balls [0 ± bound]:
//   E(α, x) ≤ e^{−x}/(x − α + 1) for x > α − 1 (u^{α−1} ≤ e^{(α−1)(u−1)} on u ≥ 1),
//   E(1/2 − m, y) ≤ e^{−y}/y (u^{β−1} ≤ 1),
//   Σ_{n≥M} n^a e^{−κn²} ≤ M^a e^{−κM²} + ∫_M^∞ t^a e^{−κt²} dt ≤ e^{−κM²}(M^a + M^{a−1}/(2κ))
// (the summand decreases for 2κM² > a; ∫_M^∞ e^{−κt²} ≤ ∫_M^∞ (t/M) e^{−κt²}).
void lambda_from_plan(arb_t res, const ThetaPlan& p, int threads, const ThetaProgress& progress) {
  // Chunks of [1, N1] taken by the threads from a shared counter (the cost per
  // term varies with n: precision, and the half-integral series ends at N2);
  // summed in chunk order, so the ball does not depend on the scheduling.
  std::vector<std::pair<ulong, ulong>> chunks;
  const ulong step = std::max<ulong>(1 << 14, p.N1 / 64);
  for (ulong lo = 1; lo <= p.N1; lo += step) chunks.emplace_back(lo, std::min(p.N1, lo + step - 1));
  std::vector<PartialSums> part(chunks.size());
  // Progress by estimated cost: a half-integral step costs about ten integral terms.
  std::vector<double> cost(chunks.size());
  double total_cost = 0, done_cost = 0;
  for (size_t c = 0; c < chunks.size(); ++c) {
    const ulong lo = chunks[c].first, hi = chunks[c].second;
    cost[c] = (double)(hi - lo + 1) + 9.0 * (double)(lo <= p.N2 ? std::min(hi, p.N2) - lo + 1 : 0);
    total_cost += cost[c];
  }
  std::atomic<size_t> next{0};
  std::exception_ptr failure;  // an assertion in a helper thread is rethrown here
  std::mutex failure_mu;
  auto worker = [&] {
    try {
      for (size_t c; (c = next.fetch_add(1)) < chunks.size();) {
        sum_range(p, chunks[c].first, chunks[c].second, part[c]);
        if (progress) {
          std::lock_guard<std::mutex> lock(failure_mu);
          done_cost += cost[c];
          progress(std::min(1.0, done_cost / total_cost));
        }
      }
    } catch (...) {
      std::lock_guard<std::mutex> lock(failure_mu);
      if (!failure) failure = std::current_exception();
      next = chunks.size();
    }
  };
  const int nt = std::max(1, std::min<int>(threads, (int)chunks.size()));
  std::vector<std::thread> pool;
  for (int t = 1; t < nt; ++t) pool.emplace_back(worker);
  worker();
  for (auto& th : pool) th.join();
  if (failure) std::rethrow_exception(failure);
  const slong prec = std::max<slong>(64, (slong)std::ceil(log2_term1(p, 1) - p.log2_tau) + 40);
  Arb S1, S2, pi, kap, tl;
  for (const PartialSums& ps : part) {
    arb_add(S1, S1, ps.S1, prec);
    arb_add(S2, S2, ps.S2, prec);
  }
  arb_const_pi(pi, prec);
  arb_div_ui(kap, pi, p.f, prec);
  arb_mul_2exp_si(kap, kap, -2 * p.e);  // κ1 = Aπ/f
  tail_ball(tl, kap, p.N1 + 1, p.a, p.alpha - 1, prec);
  arb_add_error(S1, tl);
  arb_mul_2exp_si(kap, kap, 4 * p.e);  // κ2 = π/(A f)
  tail_ball(tl, kap, p.N2 + 1, p.a, 0, prec);
  arb_add_error(S2, tl);
  arb_mul_2exp_si(S1, S1, -2 * p.e * (slong)p.alpha);        // A^α
  arb_mul_2exp_si(S2, S2, -p.e * (2 * (slong)p.m - 1));      // A^{−σ'} = 4^{−e(m − 1/2)}
  arb_add(res, S1, S2, prec);
}

// log2 of an estimate of |Λ(k, χ)| = (f/π)^α (α−1)! L, with L ≥ ζ(2k)/ζ(k) > 1/2.
double log2_lambda(const Fmpz& d, ulong k) {
  const double f = std::fabs(fmpz_get_d(d.get()));
  const ulong alpha = (k + (fmpz_sgn(d.get()) < 0 ? 1 : 0)) / 2;
  return (double)alpha * std::log2(f / M_PI) + std::lgamma((double)alpha) / kLn2 - 1;
}

// L = Λ / ((f/π)^α (α−1)!).
void l_from_lambda(arb_t res, const arb_t lambda, const Fmpz& d, ulong k, slong prec) {
  const ulong alpha = (k + (fmpz_sgn(d.get()) < 0 ? 1 : 0)) / 2;
  Arb t, pi;
  arb_const_pi(pi, prec);
  arb_set_fmpz(t, d.get());
  arb_abs(t, t);
  arb_div(t, t, pi, prec);
  arb_pow_ui(t, t, alpha, prec);
  Fmpz fac;
  fmpz_fac_ui(fac.get(), alpha - 1);
  arb_mul_fmpz(t, t, fac.get(), prec);
  arb_div(res, lambda, t, prec);
}

// D_k = lcm of the denominators of B_0, …, B_k.
Fmpz bernoulli_denominator_lcm(ulong k) {
  Fmpz D(1);
  Fmpq b;
  for (ulong j = 0; j <= k; ++j) {
    arith_bernoulli_number(b.get(), j);
    fmpz_lcm(D.get(), D.get(), fmpq_denref(b.get()));
  }
  return D;
}

// log2 of |D_k f B_{k,χ}| (estimate), the integer the rounding determines:
// |B_{k,χ}| = 2 k! f^{k−1/2} L / (2π)^k with L ≤ ζ(k) < 2.
double log2_rounding_integer(const Fmpz& d, ulong k, const Fmpz& D) {
  const double f = std::fabs(fmpz_get_d(d.get()));
  return std::log2(fmpz_get_d(D.get())) + ((double)k + 0.5) * std::log2(f) +
         std::lgamma((double)k + 1) / kLn2 + 2 - (double)k * std::log2(2 * M_PI);
}

}  // namespace

double dirichlet_l_theta_terms(const Fmpz& d, ulong k) {
  const double bits = log2_rounding_integer(d, k, bernoulli_denominator_lcm(k)) + 6;
  const ThetaPlan p = make_plan(d, k, log2_lambda(d, k) - bits);
  return (double)(p.N1 + p.N2);
}

void dirichlet_lambda_theta(arb_t res, const Fmpz& d, ulong k, double log2_abs_error, int threads,
                            const ThetaProgress& progress) {
  const ThetaPlan p = make_plan(d, k, log2_abs_error);
  lambda_from_plan(res, p, threads, progress);
}

void dirichlet_l_theta(arb_t res, const Fmpz& d, ulong k, slong bits, int threads, const ThetaProgress& progress) {
  Arb lambda;
  dirichlet_lambda_theta(lambda, d, k, log2_lambda(d, k) - (double)bits - 2, threads, progress);
  l_from_lambda(res, lambda, d, k, bits + 64);
}

std::optional<Fmpq> dirichlet_l_rational_theta(const Fmpz& d, ulong k, int threads, const ThetaProgress& progress) {
  const Fmpz D = bernoulli_denominator_lcm(k);
  Fmpz f;
  fmpz_abs(f.get(), d.get());
  for (int attempt = 0; attempt < 2; ++attempt) {
    // Enough relative accuracy that the integer's ball is narrower than 1/32.
    const slong bits = (slong)std::ceil(log2_rounding_integer(d, k, D)) + 6 + 32 * attempt;
    Arb L, t, pi;
    dirichlet_l_theta(L, d, k, bits, threads, progress);
    // D f B_{k,χ} = D f · f^{k−1} k! L sqrt(f) / (2^{k−1} π^k) · (−1)^{1+⌊k/2⌋}.
    const slong prec = bits + 64;
    arb_const_pi(pi, prec);
    arb_pow_ui(pi, pi, k, prec);
    arb_set_fmpz(t, f.get());
    arb_sqrt(t, t, prec);
    arb_mul(t, t, L, prec);
    arb_div(t, t, pi, prec);
    Fmpz s;
    fmpz_pow_ui(s.get(), f.get(), k);
    fmpz_mul(s.get(), s.get(), D.get());
    Fmpz fac;
    fmpz_fac_ui(fac.get(), k);
    fmpz_mul(s.get(), s.get(), fac.get());
    arb_mul_fmpz(t, t, s.get(), prec);
    arb_mul_2exp_si(t, t, -((slong)k - 1));
    if (((1 + k / 2) & 1) == 1) arb_neg(t, t);
    Fmpz N;
    if (!arb_get_unique_fmpz(N.get(), t)) continue;
    // B_{k,χ} = N / (D f).
    Fmpz den;
    fmpz_mul(den.get(), D.get(), f.get());
    Fmpq B;
    fmpq_set_fmpz_frac(B.get(), N.get(), den.get());
    return dirichlet_l_rational_from_bernoulli(B, d, k);
  }
  return std::nullopt;
}

}  // namespace circlet

