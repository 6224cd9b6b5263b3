#include "progression/verify.hpp"

#include <flint/ulong_extras.h>

#include <cmath>
#include <cstdio>
#include <map>
#include <mutex>
#include <tuple>

#include "circlet/version.hpp"
#include "core/error.hpp"
#include "progression/ball_io.hpp"
#include "progression/certificate.hpp"
#include "progression/certificate_reader.hpp"
#include "progression/certify.hpp"
#include "progression/tail_bound.hpp"
#include "quadratic/local_density.hpp"

namespace circlet {

namespace {

using nlohmann::json;

constexpr slong kTightBits = 40;
// Counting N_j modulo q = p^j: measured (Release, one core) about vars·q/10^5 s at
// odd p (c9 modulo 17^4: 1.4 s, c50 modulo 97^2: 3.6 s) and (vars/2)·q²/(3·10^8) s
// at p = 2 for c_t (2×2 blocks; c9 modulo 2^14: 5 s). Each table's time is
// estimated before it is counted as vars·q/10^5 s (and at least vars·q²/(4·10^8) s at p = 2 for c_t).
double estimated_count_seconds(const QuadraticModel& m, ulong p, ulong q) {
  const double v = static_cast<double>(m.vars), dq = static_cast<double>(q);
  const double linear = v * dq / 1e5;
  return (p == 2 && m.sum_zero) ? std::max(linear, v * dq * dq / 4e8) : linear;
}
constexpr ulong kMaxCountModulus = 1UL << 22;

/// Thrown for a check beyond the stated cost limits: bad input (exit 2), not a false claim.
struct CostLimit : UserError {
  using UserError::UserError;
};

struct Ctx {
  VerifyReport report;
  VerifyLimits limits;
  double cost = 0;  // estimated seconds of counting so far
  std::map<std::tuple<int, int, ulong, int>, std::vector<Fmpz>> tables;
  void fail(const std::string& s) { report.failures.push_back(s); }
  void ok(const std::string& s) { report.checked.push_back(s); }
};

std::string str_field(const json& j, const char* key) { return j.at(key).get<std::string>(); }
ulong int_field(const json& j, const char* key) { return j.at(key).get<ulong>(); }
Fmpq rat_field(const json& j, const char* key) { return Fmpq::from_str(str_field(j, key)); }
Fmpz nat_field(const json& j, const char* key) { return Fmpz::from_str(str_field(j, key)); }

// β_p at the family argument N by direct counting modulo p^j, j the proved
// stabilisation exponent (docs/certificate-format.md §3).
Fmpq counted_density(Ctx& ctx, const QuadraticModel& m, const Fmpz& N, ulong p) {
  const int j = local_density_stable_exponent(m, N, p);
  ulong q = 1;
  for (int i = 0; i < j; ++i) {
    if (q > kMaxCountModulus / p)
      throw CostLimit("counting beta_" + std::to_string(p) + " of " + m.family.name() + " modulo " +
                      std::to_string(p) + "^" + std::to_string(j) + " is beyond the limit 2^22 of verify");
    q *= p;
  }
  auto key = std::make_tuple(static_cast<int>(m.family.kind), m.family.t, p, j);
  auto it = ctx.tables.find(key);
  if (it == ctx.tables.end()) {
    const double cost = estimated_count_seconds(m, p, q);
    if (ctx.limits.max_count_seconds > 0 && ctx.cost + cost > ctx.limits.max_count_seconds) {
      char buf[64];
      std::snprintf(buf, sizeof buf, "%.3g", ctx.cost + cost);
      throw CostLimit("checking the local factors needs counting beta_" + std::to_string(p) + " of " + m.family.name() +
                      " modulo " + std::to_string(q) + ", an estimated " + buf + " s of counting in all, more than the limit of " +
                      std::to_string(static_cast<long>(ctx.limits.max_count_seconds)) +
                      " s (circlet verify --no-time-limit lifts it)");
    }
    ctx.cost += cost;
    it = ctx.tables.emplace(key, local_value_counts(m, p, j)).first;
  }
  const auto& table = it->second;
  Fmpq out(table[fmpz_fdiv_ui(N.get(), table.size())]);
  Fmpz norm;
  fmpz_set_ui(norm.get(), table.size());
  fmpz_pow_ui(norm.get(), norm.get(), static_cast<ulong>(m.rank - 1));
  fmpq_div_fmpz(out.get(), out.get(), norm.get());
  return out;
}

// Is β_p constant on n ≡ r (mod p^e) for this family (docs/MATH.md §7.1)? κ = 0
// when p | t for c_t, sc_t; otherwise κ = 3 (p = 2) or 1, and the class is pinned
// iff X(r) ≠ 0 and v_p(X(r)) + κ ≤ v_p(A) + e. Written here from the format
// document, not taken from pinning.hpp.
bool class_pinned(const QuadraticModel& m, const Progression& ap, ulong p, ulong e, const Fmpz& r) {
  const Family& f = m.family;
  if ((f.kind == FamilyKind::Core || f.kind == FamilyKind::SelfConjugateCore) && f.t % static_cast<long>(p) == 0)
    return true;
  const slong kappa = p == 2 ? 3 : 1;
  const Fmpq x = m.X(progression_at(ap, r));
  if (x.is_zero()) return false;
  Fmpz pp = Fmpz::from_ui(p), rest;
  if (fmpz_divisible(fmpq_denref(x.get()), pp)) return false;  // X not p-integral: no closed form there
  const slong v0 = static_cast<slong>(fmpz_remove(rest, fmpq_numref(x.get()), pp));
  const slong va = static_cast<slong>(fmpz_remove(rest, Fmpz(ap.A), pp));
  return v0 + kappa <= va + static_cast<slong>(e);
}

// The stored β_F, β_G of a class n ≡ r (mod pe) against counting at r and r + pe.
bool check_counted_factors(Ctx& ctx, const ProgressionPair& pair, ulong p, const Fmpz& pe, const Fmpz& r,
                           const Fmpq& bF, const Fmpq& bG, const std::string& name) {
  bool good = true;
  for (int rep = 0; rep < 2; ++rep) {
    Fmpz n = r;
    if (rep == 1) fmpz_add(n, n, pe);
    Fmpq cF = counted_density(ctx, pair.F, progression_at(pair.apF, n), p);
    Fmpq cG = counted_density(ctx, pair.G, progression_at(pair.apG, n), p);
    if (cF != bF) {
      ctx.fail(name + "/beta_F: local factor beta_F is " + bF.str() + " in the certificate, counting mod p^j at n = " + n.str() + " gives " + cF.str());
      good = false;
    }
    if (cG != bG) {
      ctx.fail(name + "/beta_G: local factor beta_G is " + bG.str() + " in the certificate, counting mod p^j at n = " + n.str() + " gives " + cG.str());
      good = false;
    }
  }
  return good;
}

void check_ball(Ctx& ctx, const json& stored_json, const arb_t recomputed, const std::string& what) {
  Arb stored;
  ball_from_json(stored, stored_json, what);
  if (!ball_contains_tightly(stored, recomputed, kTightBits)) {
    Arb r;
    arb_set(r, recomputed);
    ctx.fail(what + ": stored " + stored.str(12) + (arb_contains(stored, recomputed) ? " is wider than" : " does not contain") +
             " the recomputed " + r.str(12));
  } else {
    ctx.ok(what + " recomputed and contained");
  }
}

void sqrt_rational(arb_t res, const Fmpq& x, slong prec) {
  arb_set_fmpq(res, x, prec);
  arb_sqrt(res, res, prec);
}

// y^{(r−2)/2} for y > 0.
void power_w1(arb_t res, const Fmpq& y, int rank, slong prec) {
  Fmpq yk;
  fmpq_pow_si(yk, y, rank - 2);
  sqrt_rational(res, yk, prec);
}

std::string display(const json& ball) {
  Arb b;
  ball_from_json(b, ball, "ball");
  return interval_display(b);
}

void verify_nonconvergent(Ctx& ctx, const json& j, const ProgressionPair& pair, slong prec) {
  const int rank = pair.rank();
  if (!tail_converges(rank)) {
    ctx.fail("/verdict: NON-CONVERGENT needs weight > 2, but the weight is " + weight_string(rank));
    return;
  }
  const ulong Q = int_field(j, "Q");
  // The modulus: every prime ≤ Q exactly once, ascending (lengths bounded by the reader: ≤ 168).
  const json& mf = j.at("modulus_factors");
  std::vector<std::pair<ulong, ulong>> factors;
  Fmpz M(1);
  for (const auto& f : mf) {
    ulong p = int_field(f, "p"), e = int_field(f, "e");
    factors.emplace_back(p, e);
    Fmpz pe;
    fmpz_ui_pow_ui(pe, p, e);
    fmpz_mul(M, M, pe);
  }
  {
    size_t i = 0;
    bool good = true;
    for (ulong p = 2; p <= Q; p = n_nextprime(p, 1), ++i)
      if (i >= factors.size() || factors[i].first != p) good = false;
    if (!good || i != factors.size()) {
      ctx.fail("/modulus_factors: must list every prime q <= Q = " + std::to_string(Q) + " once, ascending");
      return;
    }
  }
  if (nat_field(j, "modulus") != M) ctx.fail("/modulus: " + str_field(j, "modulus") + " is not the product of modulus_factors (" + M.str() + ")");

  // σ and the power factor, recomputed here.
  Fmpq sq;
  fmpq_div(sq, pair.G.det_gram, pair.F.det_gram);
  const json& sc = j.at("sigma_constant");
  if (rat_field(sc, "square") != sq) ctx.fail("/sigma_constant/square: is not det S_G/det S_F = " + sq.str());
  Arb sigma;
  sqrt_rational(sigma, sq, prec);
  check_ball(ctx, sc.at("ball"), sigma, "/sigma_constant/ball");

  const json& pf = j.at("power_factor");
  Fmpq base;
  fmpq_set_si(base, pair.apF.A, static_cast<ulong>(pair.apG.A));
  if (rat_field(pf, "base") != base) ctx.fail("/power_factor/base: is not A/A2 = " + base.str());
  if (str_field(pf, "exponent") != weight_string(rank - 2))
    ctx.fail("/power_factor/exponent: is not w - 1 = " + weight_string(rank - 2));
  Arb plimit, pfrom;
  power_w1(plimit, base, rank, prec);
  check_ball(ctx, pf.at("limit"), plimit, "/power_factor/limit");
  {
    const Fmpz n0 = nat_field(pf, "n0");
    Fmpq xf = pair.xF.at(n0), xg = pair.xG.at(n0), y0;
    if (fmpq_sgn(xf.get()) <= 0 || fmpq_sgn(xg.get()) <= 0) {
      ctx.fail("/power_factor/n0: X_F or X_G is not positive at n0");
      return;
    }
    fmpq_div(y0, xf, xg);
    Arb p0;
    power_w1(p0, y0, rank, prec);
    // y(n) = X_F(n)/X_G(n) is a Möbius map without a pole on n ≥ 0, so monotone: between y(n0) and A/A2.
    arb_union(pfrom, p0, plimit, prec);
    check_ball(ctx, pf.at("for_n_ge_n0"), pfrom, "/power_factor/for_n_ge_n0");
  }

  // The tail.
  const json& tj = j.at("tail");
  const ulong q2 = int_field(tj, "explicit_primes_up_to");
  Arb S, T;
  if (str_field(tj, "route") == "proportional") {
    Fmpq lambda;
    if (!x_proportional(pair, &lambda)) {
      ctx.fail("/tail/route: proportional, but X_G is not a constant multiple of X_F");
      return;
    }
    if (rat_field(tj, "lambda") != lambda) ctx.fail("/tail/lambda: is not " + lambda.str());
    const Fmpq D = discriminant_product(pair, lambda);
    if (rat_field(tj, "discriminant_product") != D) ctx.fail("/tail/discriminant_product: is not " + D.str());
    if (!fmpq_is_square(D)) {
      ctx.fail("/tail/route: proportional, but the discriminant product is not a square");
      return;
    }
    if (constant_route_primes(pair, lambda).back() > Q) {
      ctx.fail("/tail/route: proportional, but a prime where rho_q may differ from 1 exceeds Q");
      return;
    }
    arb_zero(S);
    arb_one(T);
    ctx.ok("tail exactly 1: X_G = " + lambda.str() + " X_F, square discriminant product, finite primes <= Q");
  } else {
    // Shared between the certificates of one process (a scan with --verify).
    static std::mutex mu;
    static std::map<std::tuple<int, ulong, ulong, slong>, std::pair<Arb, Arb>> cache;
    std::lock_guard<std::mutex> lock(mu);
    auto key = std::make_tuple(rank, Q, q2, prec);
    auto it = cache.find(key);
    if (it == cache.end()) {
      tail_log_bound(S, rank, Q, q2, prec);
      tail_interval(T, rank, Q, q2, prec);
      it = cache.emplace(key, std::make_pair(S, T)).first;
    }
    S = it->second.first;
    T = it->second.second;
    if (!arb_is_finite(S)) {
      ctx.fail("/tail: no finite tail bound at Q = " + std::to_string(Q));
      return;
    }
  }
  check_ball(ctx, tj.at("log_bound"), S, "/tail/log_bound");
  check_ball(ctx, tj.at("interval"), T, "/tail/interval");

  const json& classes = j.at("classes");
  const ulong dp = int_field(j, "distinguishing_prime");
  for (int k = 0; k < 2; ++k)
    if (classes[k].at("local_factors").size() != factors.size()) {
      ctx.fail("/classes/" + std::to_string(k) + "/local_factors: must list every prime of the modulus, in its order");
      return;
    }
  Arb limits[2];
  Fmpz residues[2];
  Fmpq rho_at_dp[2];
  for (int k = 0; k < 2; ++k) {
    const json& cj = classes[k];
    const std::string name = "/classes/" + std::to_string(k);
    residues[k] = nat_field(cj, "residue");
    if (fmpz_cmp(residues[k], M) >= 0) ctx.fail(name + "/residue: " + residues[k].str() + " is not in [0, modulus)");
    const json& lf = cj.at("local_factors");
    if (lf.size() != factors.size()) {
      ctx.fail(name + "/local_factors: must list every prime of the modulus, in its order");
      continue;
    }
    Fmpq product(1);
    bool all_good = true;
    for (size_t i = 0; i < lf.size(); ++i) {
      const json& fj = lf[i];
      const std::string fname = name + "/local_factors/" + std::to_string(i);
      const ulong p = int_field(fj, "p"), e = int_field(fj, "e");
      if (p != factors[i].first || e > factors[i].second) {
        ctx.fail(fname + ": factor (p, e) = (" + std::to_string(p) + ", " + std::to_string(e) + ") does not match the modulus");
        all_good = false;
        continue;
      }
      const ulong e_other = int_field(classes[1 - k].at("local_factors").at(i), "e");
      if (factors[i].second != std::max(e, e_other))
        ctx.fail("/modulus_factors/" + std::to_string(i) + "/e: is not the larger of the two classes' exponents");
      Fmpz pe, pE, rp, rE;
      fmpz_ui_pow_ui(pe, p, e);
      fmpz_ui_pow_ui(pE, p, factors[i].second);
      fmpz_mod(rE, residues[k], pE);
      const Fmpz stored_rp = nat_field(fj, "residue");
      if (stored_rp != rE || fmpz_cmp(stored_rp, pe) >= 0) {
        ctx.fail(fname + "/residue: " + stored_rp.str() + " is not below " + pe.str() + " and equal to the class residue mod " +
                 pE.str() + " (" + rE.str() + ")");
        all_good = false;
        continue;
      }
      rp = stored_rp;
      if (!class_pinned(pair.F, pair.apF, p, e, rp) || !class_pinned(pair.G, pair.apG, p, e, rp)) {
        ctx.fail(fname + ": beta_p is not constant on n = " + rp.str() + " mod " + pe.str() + " (valuation not pinned)");
        all_good = false;
        continue;
      }
      const Fmpq bF = rat_field(fj, "beta_F"), bG = rat_field(fj, "beta_G");
      if (!check_counted_factors(ctx, pair, p, pe, rp, bF, bG, fname)) all_good = false;
      if (bG.is_zero()) {
        ctx.fail(fname + "/beta_G: is 0 on the class (no main term to compare with)");
        all_good = false;
        continue;
      }
      Fmpq rho;
      fmpq_div(rho, bF, bG);
      if (rat_field(fj, "rho") != rho) ctx.fail(fname + "/rho: is not beta_F/beta_G = " + rho.str());
      if (p == dp) rho_at_dp[k] = rho;
      // Outside the distinguishing prime both classes carry the same factor.
      if (p != dp && fj != classes[1 - k].at("local_factors").at(i))
        ctx.fail(fname + ": differs from the other class's factor at a prime other than distinguishing_prime");
      fmpq_mul(product, product, rho);
    }
    if (all_good)
      ctx.ok(name + ": " + std::to_string(lf.size()) + " local factors pinned and counted mod p^j at two representatives");
    if (rat_field(cj, "pinned_product") != product)
      ctx.fail(name + "/pinned_product: " + str_field(cj, "pinned_product") + " differs from the product of the factors " + product.str());
    Arb lim, from, kk;
    arb_set_fmpq(kk, product, prec);
    arb_mul(kk, kk, sigma, prec);
    arb_mul(kk, kk, T, prec);
    arb_mul(lim, kk, plimit, prec);
    arb_mul(from, kk, pfrom, prec);
    check_ball(ctx, cj.at("limit_interval"), lim, name + "/limit_interval");
    check_ball(ctx, cj.at("interval_n_ge_n0"), from, name + "/interval_n_ge_n0");
    ball_from_json(limits[k], cj.at("limit_interval"), name + "/limit_interval");
  }
  if (residues[0] == residues[1]) ctx.fail("/classes/1/residue: the two classes are the same residue");
  if (rho_at_dp[0] == rho_at_dp[1]) ctx.fail("/distinguishing_prime: rho at this prime is the same on both classes");
  else if (fmpq_cmp(rho_at_dp[0].get(), rho_at_dp[1].get()) < 0)
    ctx.fail("/classes: the class with the larger rho at distinguishing_prime comes first (canonical order)");
  if (arb_overlaps(limits[0], limits[1]))
    ctx.fail("/classes: the limit intervals of the two classes overlap: NON-CONVERGENT is not established");
  else
    ctx.ok("limit intervals disjoint");
  if (j.at("disjoint") != true) ctx.fail("/disjoint: must be true");

  ctx.report.summary.push_back("reason: rho_" + std::to_string(dp) +
                               " differs on the two classes and the limit intervals are disjoint at Q = " + std::to_string(Q));
  for (int k = 0; k < 2; ++k)
    ctx.report.summary.push_back("class n = " + residues[k].str() + " mod " + M.str() + ": limit points in " +
                                 display(classes[k].at("limit_interval")) + ", ratio for n >= " +
                                 str_field(pf, "n0") + " in " + display(classes[k].at("interval_n_ge_n0")));
}

void check_constant_value(Ctx& ctx, const json& cj, const Fmpq& sq, slong prec) {
  if (rat_field(cj, "square") != sq) ctx.fail("/constant/square: is not the recomputed " + sq.str());
  const Fmpq value = rat_field(cj, "value");
  Fmpq v2;
  fmpq_mul(v2, value, value);
  if (v2 != sq || fmpq_sgn(value.get()) <= 0) ctx.fail("/constant/value: its square is not constant.square");
  Arb ball;
  sqrt_rational(ball, sq, prec);
  check_ball(ctx, cj.at("interval"), ball, "/constant/interval");
  const bool integer = fmpz_is_one(fmpq_denref(value.get()));
  if (cj.at("contains_integer") != integer)
    ctx.fail(std::string("/constant/contains_integer: must be ") + (integer ? "true" : "false"));
  else if (integer && cj.at("integer") != value.str())
    ctx.fail("/constant/integer: must be " + value.str());
  ctx.report.summary.push_back("constant: " + value.str() + " (exact)" +
                               (integer ? " = " + value.str() + ", an INTEGER" : std::string(", not an integer")) +
                               ", interval " + display(cj.at("interval")));
}

void verify_constant_proportional(Ctx& ctx, const json& j, const ProgressionPair& pair, slong prec) {
  if (!tail_converges(pair.rank())) {
    ctx.fail("/verdict: CONSTANT for counts needs weight > 2 (the cusp part), weight is " + pair.weight_str());
    return;
  }
  Fmpq lambda;
  if (!x_proportional(pair, &lambda)) {
    ctx.fail("/constant_route: X_G is not a constant multiple of X_F on these progressions");
    return;
  }
  if (rat_field(j, "lambda") != lambda) ctx.fail("/lambda: is not " + lambda.str());
  const Fmpq D = discriminant_product(pair, lambda);
  if (rat_field(j, "discriminant_product") != D) ctx.fail("/discriminant_product: is not " + D.str());
  if (!fmpq_is_square(D)) {
    ctx.fail("/discriminant_product: " + D.str() + " is not a square, so the characters differ");
    return;
  }
  ctx.ok("X_G = " + lambda.str() + " X_F and " + D.str() + " is a square: rho_p = 1 outside the finite primes");
  const std::vector<ulong> primes = constant_route_primes(pair, lambda);
  const json& fin = j.at("finite_primes");
  if (fin.size() != primes.size()) {
    ctx.fail("/finite_primes: must list exactly the primes 2, 3 and those dividing t_F, t_G and lambda");
    return;
  }
  Fmpq product(1);
  for (size_t i = 0; i < primes.size(); ++i) {
    const ulong p = primes[i];
    const json& fp = fin[i];
    const std::string name = "/finite_primes/" + std::to_string(i);
    if (int_field(fp, "p") != p) {
      ctx.fail(name + "/p: expected " + std::to_string(p) + " at this position");
      continue;
    }
    const Fmpq rho = rat_field(fp, "rho");
    // The classes must partition Z: Σ p^{−e} = 1, none overlapping (at most 4096 classes: the reader's limit).
    Fmpq measure(0);
    std::vector<std::pair<ulong, Fmpz>> seen;
    bool good = true;
    const json& cls = fp.at("classes");
    for (size_t c = 0; c < cls.size(); ++c) {
      const json& cj = cls[c];
      const std::string cname = name + "/classes/" + std::to_string(c);
      const ulong e = int_field(cj, "e");
      const Fmpz r = nat_field(cj, "residue");
      Fmpz pe;
      fmpz_ui_pow_ui(pe, p, e);
      if (fmpz_cmp(r, pe) >= 0) {
        ctx.fail(cname + "/residue: " + r.str() + " is not in [0, p^e)");
        good = false;
        continue;
      }
      if (!seen.empty() && (e < seen.back().first || (e == seen.back().first && fmpz_cmp(r, seen.back().second) <= 0)))
        ctx.fail(cname + ": classes must be in ascending (e, residue) order");
      for (const auto& [e2, r2] : seen) {
        Fmpz pm, a, b;
        fmpz_ui_pow_ui(pm, p, std::min(e, e2));
        fmpz_mod(a, r, pm);
        fmpz_mod(b, r2, pm);
        if (a == b) {
          ctx.fail(cname + ": overlaps the class " + r2.str() + " mod " + std::to_string(p) + "^" + std::to_string(e2));
          good = false;
        }
      }
      seen.emplace_back(e, r);
      Fmpq part;
      fmpq_set_fmpz_frac(part, Fmpz(1), pe);
      fmpq_add(measure, measure, part);
      if (!class_pinned(pair.F, pair.apF, p, e, r) || !class_pinned(pair.G, pair.apG, p, e, r)) {
        ctx.fail(cname + ": beta_p is not constant on n = " + r.str() + " mod " + pe.str());
        good = false;
        continue;
      }
      const Fmpq bF = rat_field(cj, "beta_F"), bG = rat_field(cj, "beta_G");
      if (!check_counted_factors(ctx, pair, p, pe, r, bF, bG, cname)) good = false;
      if (bG.is_zero()) {
        ctx.fail(cname + "/beta_G: is 0");
        good = false;
        continue;
      }
      Fmpq q;
      fmpq_div(q, bF, bG);
      if (q != rho) {
        ctx.fail(cname + ": rho on n = " + r.str() + " mod " + pe.str() + " is " + q.str() + ", not the common value " + rho.str());
        good = false;
      }
    }
    if (measure != Fmpq(1)) ctx.fail(name + "/classes: do not cover every n (measure " + measure.str() + ")");
    else if (good) ctx.ok(name + ": rho_p = " + rho.str() + " on a partition of Z into pinned classes (counted)");
    fmpq_mul(product, product, rho);
  }
  Fmpq sq, base;
  fmpq_div(sq, pair.G.det_gram, pair.F.det_gram);
  fmpq_set_si(base, pair.apF.A, static_cast<ulong>(pair.apG.A));
  fmpq_pow_si(base, base, pair.rank() - 2);
  fmpq_mul(sq, sq, base);
  fmpq_mul(sq, sq, product);
  fmpq_mul(sq, sq, product);
  ctx.report.summary.push_back("reason: X_G = " + lambda.str() + " X_F and the characters agree; rho_p is constant at " +
                               std::to_string(primes.size()) + " finite primes and 1 elsewhere");
  check_constant_value(ctx, j.at("constant"), sq, prec);
}

void verify_constant(Ctx& ctx, const json& j, const ProgressionPair& pair, slong prec) {
  if (str_field(j, "constant_route") == "proportional") {
    verify_constant_proportional(ctx, j, pair, prec);
    return;
  }
  if (!pair.identical()) {
    ctx.fail("/constant_route: identical, but the families or progressions differ");
    return;
  }
  ctx.report.summary.push_back("reason: the same family on the same progression: the two sequences are identical");
  check_constant_value(ctx, j.at("constant"), Fmpq(1), prec);
}

}  // namespace

VerifyReport verify_certificate(const json& j, const VerifyLimits& limits) {
  check_certificate_schema(j);  // UserError naming the field
  const json& prov = j.at("provenance");
  if (prov.at("version") != kVersion)
    throw UserError("certificate field /provenance/version: certificate written by circlet version " + prov.at("version").get<std::string>() +
                    ", this is version " + kVersion + "; re-run certify with this version");
  Ctx ctx;
  ctx.limits = limits;
  const std::string digest = certificate_digest(j);
  if (j.at("digest") != digest)
    ctx.fail("/digest: " + j.at("digest").get<std::string>() + " is not the digest of the content, " + digest +
             " (the certificate was edited after certify wrote it)");
  else
    ctx.ok("digest of the canonical content");

  const Family f = Family::parse(str_field(j, "F")), g = Family::parse(str_field(j, "G"));
  const Progression ap{static_cast<long>(int_field(j.at("ap"), "A")), static_cast<long>(int_field(j.at("ap"), "B"))};
  const Progression ap2{static_cast<long>(int_field(j.at("ap2"), "A")), static_cast<long>(int_field(j.at("ap2"), "B"))};
  const ProgressionPair pair(f, ap, g, ap2);
  const slong stored_prec = static_cast<slong>(int_field(j, "precision_bits"));
  const ulong Q_max = int_field(j, "Q_max");
  if (str_field(j, "weight") != pair.weight_str()) ctx.fail("/weight: is not " + pair.weight_str());
  const std::string cmd = certify_command(f.name(), g.name(), ap, ap2, Q_max, stored_prec);
  if (prov.at("command") != cmd) ctx.fail("/provenance/command: is not the certify command of this certificate, '" + cmd + "'");

  const Verdict v = verdict_from_name(str_field(j, "verdict"));
  const std::string route = j.contains("constant_route") ? str_field(j, "constant_route") : std::string();
  const std::vector<std::string> want = required_theorems(v, route);
  if (j.at("theorems") != json(want)) ctx.fail("/theorems: must be exactly " + json(want).dump());
  else ctx.ok("theorems: the catalogue set for the verdict");

  // A different precision from the certificate's.
  const slong prec = stored_prec + 64;
  if (v == Verdict::Undecided)
    ctx.report.summary.push_back("verdict UNDECIDED: no claim about the pair");
  try {
    if (v == Verdict::NonConvergent) {
      verify_nonconvergent(ctx, j, pair, prec);
    } else if (v == Verdict::Constant) {
      verify_constant(ctx, j, pair, prec);
    } else {
      // UNDECIDED claims nothing; check that the decision really is UNDECIDED.
      CertifyOptions opt;
      opt.prec = stored_prec;
      opt.Q_max = Q_max;
      Certificate c = certify_pair(pair, opt);
      if (c.verdict != Verdict::Undecided)
        ctx.fail("/verdict: UNDECIDED disagrees with the recomputed verdict " + verdict_name(c.verdict));
      else
        ctx.report.summary.push_back("reason: " + c.reason);
    }
  } catch (const CostLimit&) {
    throw;
  } catch (const UserError& e) {
    ctx.fail(std::string("a check could not be carried out: ") + e.what());
  }
  if (ctx.report.failures.empty()) {
    for (const auto& id : want)
      for (const auto& t : theorem_catalogue())
        if (id == t.id) ctx.ok(std::string("theorem ") + t.id + ": " + t.statement + " [" + t.citation + "]");
  }
  return ctx.report;
}

VerifyReport verify_certificate_text(const std::string& text, const VerifyLimits& limits) {
  return verify_certificate(parse_certificate_text(text), limits);
}

}  // namespace circlet
