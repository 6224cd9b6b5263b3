#include "progression/verify.hpp"

#include <flint/ulong_extras.h>

#include <map>
#include <mutex>
#include <tuple>

#include "circlet/version.hpp"
#include "core/error.hpp"
#include "progression/ball_io.hpp"
#include "progression/certificate.hpp"
#include "progression/certify.hpp"
#include "progression/interval.hpp"
#include "progression/pinning.hpp"
#include "progression/tail_bound.hpp"
#include "quadratic/local_density.hpp"

namespace circlet {

namespace {

constexpr slong kTightBits = 40;

std::string str_field(const nlohmann::json& j, const char* key) {
  if (!j.contains(key) || !j[key].is_string()) throw UserError(std::string("missing or non-string field '") + key + "'");
  return j[key].get<std::string>();
}

long int_field(const nlohmann::json& j, const char* key) {
  if (!j.contains(key) || !j[key].is_number_integer())
    throw UserError(std::string("missing or non-integer field '") + key + "'");
  return j[key].get<long>();
}

// β_p(n) by direct counting modulo p^j, j the proved stabilisation exponent.
Fmpq density_by_counting(const QuadraticModel& m, const Fmpz& n, ulong p) {
  int j = local_density_stable_exponent(m, n, p);
  return local_density_by_counting(m, n, p, j);
}

struct Ctx {
  VerifyReport report;
  void fail(const std::string& s) { report.failures.push_back(s); }
  void ok(const std::string& s) { report.checked.push_back(s); }
};

// The stored β_F, β_G of a pinned class n ≡ r (mod pe = p^e) against direct
// counting mod p^j at two representatives, r and r + pe (not the closed forms).
void check_counted_factors(Ctx& ctx, const ProgressionPair& pair, ulong p, const Fmpz& pe, const Fmpz& r,
                           const Fmpq& bF, const Fmpq& bG, const std::string& name) {
  for (int rep = 0; rep < 2; ++rep) {
    Fmpz n = r;
    if (rep == 1) fmpz_add(n, n, pe);
    Fmpq cF = density_by_counting(pair.F, progression_at(pair.apF, n), p);
    Fmpq cG = density_by_counting(pair.G, progression_at(pair.apG, n), p);
    if (cF != bF) ctx.fail(name + ": local factor beta_F is " + bF.str() + " in the certificate, counting mod p^j at n = " + n.str() + " gives " + cF.str());
    if (cG != bG) ctx.fail(name + ": local factor beta_G is " + bG.str() + " in the certificate, counting mod p^j at n = " + n.str() + " gives " + cG.str());
  }
}

void check_ball(Ctx& ctx, const nlohmann::json& stored_json, const arb_t recomputed, const std::string& what) {
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

void verify_nonconvergent(Ctx& ctx, const nlohmann::json& j, const ProgressionPair& pair, slong prec) {
  const int rank = pair.rank();
  if (!tail_converges(rank)) {
    ctx.fail("verdict NON-CONVERGENT needs weight > 2, but the weight is " + weight_string(rank));
    return;
  }
  const ulong Q = static_cast<ulong>(int_field(j, "Q"));
  if (Q < 3) ctx.fail("Q must be at least 3");
  // The modulus: every prime ≤ Q exactly once, ascending.
  const auto& mf = j.at("modulus_factors");
  std::vector<std::pair<ulong, ulong>> factors;
  Fmpz M(1);
  for (const auto& f : mf) {
    ulong p = static_cast<ulong>(int_field(f, "p")), e = static_cast<ulong>(int_field(f, "e"));
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
    if (!good || i != factors.size()) ctx.fail("modulus_factors must list every prime q <= Q = " + std::to_string(Q) + " once");
  }
  Fmpz Mstored = Fmpz::from_str(str_field(j, "modulus"));
  if (Mstored != M) ctx.fail("modulus " + Mstored.str() + " is not the product of modulus_factors (" + M.str() + ")");

  // σ and power factor, recomputed.
  Certificate re;
  re.rank = rank;
  sigma_and_power(re, pair, 0, prec);  // n0 replaced below
  Fmpz n0 = Fmpz::from_str(str_field(j.at("power_factor"), "n0"));
  if (fmpz_sgn(n0) < 0 || fmpz_cmp_si(n0, 1000000000L) > 0) ctx.fail("power_factor.n0 out of range");
  else sigma_and_power(re, pair, fmpz_get_si(n0), prec);
  if (Fmpq::from_str(str_field(j.at("sigma_constant"), "square")) != re.sigma_square)
    ctx.fail("sigma_constant.square is not det S_G/det S_F = " + re.sigma_square.str());
  if (Fmpq::from_str(str_field(j.at("power_factor"), "base")) != re.power_base)
    ctx.fail("power_factor.base is not A/A' = " + re.power_base.str());
  check_ball(ctx, j.at("sigma_constant").at("ball"), re.sigma, "sigma_constant.ball");
  check_ball(ctx, j.at("power_factor").at("limit"), re.power_limit, "power_factor.limit");
  check_ball(ctx, j.at("power_factor").at("for_n_ge_n0"), re.power_from_n0, "power_factor.for_n_ge_n0");

  // Tail, recomputed at this (different) precision.
  const ulong q2 = static_cast<ulong>(int_field(j.at("tail"), "explicit_primes_up_to"));
  if (static_cast<ulong>(int_field(j.at("tail"), "Q")) != Q) ctx.fail("tail.Q differs from Q");
  if (q2 <= Q || q2 > 10000000) {
    ctx.fail("tail.explicit_primes_up_to must lie in (Q, 10^7]");
    return;
  }
  Arb S, T;
  if (j.value("tail_route", std::string()) == "proportional") {
    Fmpq lambda;
    if (!x_proportional(pair, &lambda)) {
      ctx.fail("tail_route proportional: X_G is not a constant multiple of X_F");
      return;
    }
    if (!fmpq_is_square(discriminant_product(pair, lambda))) {
      ctx.fail("tail_route proportional: the discriminant product is not a square");
      return;
    }
    if (constant_route_primes(pair, lambda).back() > Q) {
      ctx.fail("tail_route proportional: a prime where rho_q may differ from 1 exceeds Q");
      return;
    }
    arb_zero(S);
    arb_one(T);
    ctx.ok("tail exactly 1: X_G = " + lambda.str() + " X_F, square discriminant product, finite primes <= Q");
  } else {
    // Shared between the certificates of one process (a scan with --verify).
    static std::map<std::tuple<int, ulong, ulong, slong>, std::pair<Arb, Arb>> cache;
    static std::mutex mu;  // scans verify on several threads
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
  }
  check_ball(ctx, j.at("tail").at("log_bound"), S, "tail.log_bound");
  check_ball(ctx, j.at("tail").at("interval"), T, "tail.interval");

  const auto& classes = j.at("classes");
  if (!classes.is_array() || classes.size() != 2) {
    ctx.fail("a NON-CONVERGENT certificate needs exactly two classes");
    return;
  }
  Arb limits[2];
  Fmpz residues[2];
  for (int k = 0; k < 2; ++k) {
    const auto& cj = classes[k];
    std::string name = "class " + std::to_string(k + 1);
    residues[k] = Fmpz::from_str(str_field(cj, "residue"));
    if (fmpz_sgn(residues[k]) < 0 || fmpz_cmp(residues[k], M) >= 0)
      ctx.fail(name + ": residue " + residues[k].str() + " is not in [0, modulus)");
    const auto& lf = cj.at("local_factors");
    if (!lf.is_array() || lf.size() != factors.size()) {
      ctx.fail(name + ": local_factors must list every prime of the modulus");
      continue;
    }
    Fmpq product(1);
    for (size_t i = 0; i < lf.size(); ++i) {
      const auto& fj = lf[i];
      ulong p = static_cast<ulong>(int_field(fj, "p")), e = static_cast<ulong>(int_field(fj, "e"));
      std::string fname = name + ", p = " + std::to_string(p);
      if (p != factors[i].first || e > factors[i].second) {
        ctx.fail(fname + ": factor does not match the modulus (p, e)");
        continue;
      }
      Fmpz pe, rp;
      fmpz_ui_pow_ui(pe, p, e);
      fmpz_mod(rp, residues[k], pe);
      Fmpz stored_rp = Fmpz::from_str(str_field(fj, "residue"));
      if (stored_rp != rp) {
        ctx.fail(fname + ": residue mod " + std::to_string(p) + "^" + std::to_string(e) + " is " + rp.str() +
                 ", the certificate says " + stored_rp.str());
        continue;
      }
      if (!is_pinned(pair.F, pair.xF, p, e, rp) || !is_pinned(pair.G, pair.xG, p, e, rp)) {
        ctx.fail(fname + ": beta_p is not constant on n = " + rp.str() + " mod " + pe.str() + " (valuation not pinned)");
        continue;
      }
      Fmpq bF = Fmpq::from_str(str_field(fj, "beta_F")), bG = Fmpq::from_str(str_field(fj, "beta_G"));
      // Two representatives of the class, counted independently of the closed forms.
      check_counted_factors(ctx, pair, p, pe, rp, bF, bG, fname);
      ctx.ok(fname + ": beta_F = " + bF.str() + ", beta_G = " + bG.str() + " on n = " + rp.str() + " mod " + pe.str() +
             " (pinned; counted mod p^j at two representatives)");
      if (bG.is_zero()) {
        ctx.fail(fname + ": beta_G = 0 on the class (no main term to compare with)");
        continue;
      }
      Fmpq rho;
      fmpq_div(rho, bF, bG);
      if (Fmpq::from_str(str_field(fj, "rho")) != rho) ctx.fail(fname + ": rho is not beta_F/beta_G = " + rho.str());
      fmpq_mul(product, product, rho);
    }
    Fmpq stored_product = Fmpq::from_str(str_field(cj, "pinned_product"));
    if (stored_product != product)
      ctx.fail(name + ": pinned_product " + stored_product.str() + " differs from the product of the factors " + product.str());
    Arb lim, from;
    class_intervals(lim, from, re.sigma, re.power_limit, re.power_from_n0, product, T, prec);
    check_ball(ctx, cj.at("limit_interval"), lim, name + " limit_interval");
    check_ball(ctx, cj.at("interval_n_ge_n0"), from, name + " interval_n_ge_n0");
    ball_from_json(limits[k], cj.at("limit_interval"), name + " limit_interval");
  }
  if (residues[0] == residues[1]) ctx.fail("the two classes are the same residue");
  if (arb_overlaps(limits[0], limits[1]))
    ctx.fail("the limit intervals of the two classes overlap: NON-CONVERGENT is not established");
  else
    ctx.ok("limit intervals disjoint");
  if (!j.contains("disjoint") || j["disjoint"] != true) ctx.fail("field 'disjoint' must be true");
}

void verify_constant_proportional(Ctx& ctx, const nlohmann::json& j, const ProgressionPair& pair, slong prec) {
  if (!tail_converges(pair.rank())) ctx.fail("CONSTANT for counts needs weight > 2 (the cusp part), weight is " + pair.weight_str());
  Fmpq lambda;
  if (!x_proportional(pair, &lambda)) {
    ctx.fail("verdict CONSTANT: X_G is not a constant multiple of X_F on these progressions");
    return;
  }
  if (Fmpq::from_str(str_field(j, "lambda")) != lambda) ctx.fail("lambda is not " + lambda.str());
  Fmpq D = discriminant_product(pair, lambda);
  if (!fmpq_is_square(D)) {
    ctx.fail("verdict CONSTANT: the discriminant product " + D.str() + " is not a square, so the characters differ");
    return;
  }
  ctx.ok("X_G = " + lambda.str() + " X_F and " + D.str() + " is a square: rho_p = 1 outside the finite primes");
  std::vector<ulong> primes = constant_route_primes(pair, lambda);
  const auto& fin = j.at("finite_primes");
  if (!fin.is_array() || fin.size() != primes.size()) {
    ctx.fail("finite_primes must list exactly the primes 2, 3 and those dividing t_F, t_G and lambda");
    return;
  }
  Fmpq product(1);
  for (size_t i = 0; i < primes.size(); ++i) {
    const ulong p = primes[i];
    const auto& fp = fin[i];
    std::string name = "finite prime p = " + std::to_string(p);
    if (static_cast<ulong>(int_field(fp, "p")) != p) {
      ctx.fail(name + ": expected at this position");
      continue;
    }
    Fmpq rho = Fmpq::from_str(str_field(fp, "rho"));
    // The classes must partition Z: Σ p^{−e} = 1 and no two overlap.
    Fmpq measure(0);
    std::vector<std::pair<ulong, Fmpz>> seen;
    for (const auto& cj : fp.at("classes")) {
      ulong e = static_cast<ulong>(int_field(cj, "e"));
      if (e > 64) { ctx.fail(name + ": class exponent too large"); continue; }
      Fmpz r = Fmpz::from_str(str_field(cj, "residue")), pe;
      fmpz_ui_pow_ui(pe, p, e);
      if (fmpz_sgn(r) < 0 || fmpz_cmp(r, pe) >= 0) { ctx.fail(name + ": residue " + r.str() + " not in [0, p^e)"); continue; }
      for (const auto& [e2, r2] : seen) {
        Fmpz pm, a, b;
        fmpz_ui_pow_ui(pm, p, std::min(e, e2));
        fmpz_mod(a, r, pm);
        fmpz_mod(b, r2, pm);
        if (a == b) ctx.fail(name + ": classes " + r.str() + " mod p^" + std::to_string(e) + " and " + r2.str() + " mod p^" + std::to_string(e2) + " overlap");
      }
      seen.emplace_back(e, r);
      Fmpq part;
      fmpq_set_fmpz_frac(part, Fmpz(1), pe);
      fmpq_add(measure, measure, part);
      if (!is_pinned(pair.F, pair.xF, p, e, r) || !is_pinned(pair.G, pair.xG, p, e, r)) {
        ctx.fail(name + ": beta_p is not constant on n = " + r.str() + " mod " + pe.str());
        continue;
      }
      Fmpq bF = Fmpq::from_str(str_field(cj, "beta_F")), bG = Fmpq::from_str(str_field(cj, "beta_G"));
      check_counted_factors(ctx, pair, p, pe, r, bF, bG, name);
      Fmpq q;
      if (bG.is_zero()) { ctx.fail(name + ": beta_G = 0"); continue; }
      fmpq_div(q, bF, bG);
      if (q != rho) ctx.fail(name + ": rho on n = " + r.str() + " mod " + pe.str() + " is " + q.str() + ", not the common value " + rho.str());
    }
    if (measure != Fmpq(1)) ctx.fail(name + ": the classes do not cover every n (measure " + measure.str() + ")");
    else ctx.ok(name + ": rho_p = " + rho.str() + " on a partition of Z into pinned classes (counted)");
    fmpq_mul(product, product, rho);
  }
  Fmpq sq, base;
  fmpq_div(sq, pair.G.det_gram, pair.F.det_gram);
  fmpq_set_si(base, pair.apF.A, static_cast<ulong>(pair.apG.A));
  fmpq_pow_si(base, base, pair.rank() - 2);
  fmpq_mul(sq, sq, base);
  fmpq_mul(sq, sq, product);
  fmpq_mul(sq, sq, product);
  const auto& cj = j.at("constant");
  if (Fmpq::from_str(str_field(cj, "square")) != sq) ctx.fail("constant.square is not the recomputed " + sq.str());
  Fmpq value = Fmpq::from_str(str_field(cj, "value")), v2;
  fmpq_mul(v2, value, value);
  if (v2 != sq || fmpq_sgn(value.get()) <= 0) ctx.fail("constant.value squared is not constant.square");
  Arb ball;
  arb_set_fmpq(ball, sq, prec);
  arb_sqrt(ball, ball, prec);
  check_ball(ctx, cj.at("interval"), ball, "constant.interval");
  bool integer = fmpz_is_one(fmpq_denref(sq.get())) && fmpz_is_square(fmpq_numref(sq.get()));
  if (!cj.contains("contains_integer") || cj["contains_integer"] != integer)
    ctx.fail(std::string("constant.contains_integer must be ") + (integer ? "true" : "false"));
  if (integer && (!cj.contains("integer") || cj["integer"] != value.str()))
    ctx.fail("constant.integer must be " + value.str());
}

void verify_constant(Ctx& ctx, const nlohmann::json& j, const ProgressionPair& pair, slong prec) {
  if (j.value("constant_route", std::string()) == "proportional") {
    verify_constant_proportional(ctx, j, pair, prec);
    return;
  }
  if (!pair.identical()) {
    ctx.fail("verdict CONSTANT: the sequences are not identical and the certificate gives no other route");
    return;
  }
  const auto& cj = j.at("constant");
  if (Fmpq::from_str(str_field(cj, "square")) != Fmpq(1)) ctx.fail("constant.square must be 1 for identical sequences");
  Arb one;
  arb_one(one);
  (void)prec;
  check_ball(ctx, cj.at("interval"), one, "constant.interval");
  if (!cj.contains("contains_integer") || cj["contains_integer"] != true || !cj.contains("integer") ||
      cj["integer"] != "1")
    ctx.fail("constant: the interval contains the integer 1; contains_integer/integer say otherwise");
}

}  // namespace

VerifyReport verify_certificate(const nlohmann::json& j) {
  Ctx ctx;
  try {
    if (!j.is_object()) throw UserError("not a JSON object");
    if (!j.contains("format") || j["format"] != kCertificateFormat)
      ctx.fail(std::string("format is not '") + kCertificateFormat + "'");
    std::string version = str_field(j.at("provenance"), "version");
    if (version != kVersion)
      ctx.fail("certificate written by circlet version " + version + ", this is version " + kVersion);
    Family f = Family::parse(str_field(j, "F")), g = Family::parse(str_field(j, "G"));
    Progression ap{int_field(j.at("ap"), "A"), int_field(j.at("ap"), "B")};
    Progression ap2{int_field(j.at("ap2"), "A"), int_field(j.at("ap2"), "B")};
    if (ap.A < 1 || ap.B < 0 || ap2.A < 1 || ap2.B < 0) throw UserError("progressions need A >= 1, B >= 0");
    ProgressionPair pair(f, ap, g, ap2);
    if (str_field(j, "weight") != pair.weight_str()) ctx.fail("weight field is not " + pair.weight_str());
    long stored_prec = int_field(j, "precision_bits");
    if (stored_prec < 32 || stored_prec > 100000) throw UserError("precision_bits out of range");
    // A different precision from the certificate's.
    const slong prec = stored_prec + 64;
    if (!j.contains("theorems") || !j["theorems"].is_array() || j["theorems"].size() < 2)
      ctx.fail("the certificate must name the theorems it relies on");
    Verdict v = verdict_from_name(str_field(j, "verdict"));
    if (v == Verdict::NonConvergent) {
      verify_nonconvergent(ctx, j, pair, prec);
    } else if (v == Verdict::Constant) {
      verify_constant(ctx, j, pair, prec);
    } else {
      // UNDECIDED claims nothing; check that the decision really is UNDECIDED.
      CertifyOptions opt;
      opt.prec = prec;
      if (j.contains("Q_max") && j["Q_max"].is_number_integer()) opt.Q_max = j["Q_max"].get<ulong>();
      if (opt.Q_max < 3 || opt.Q_max > 1000) throw UserError("Q_max out of range");
      Certificate c = certify_pair(pair, opt);
      if (c.verdict != Verdict::Undecided)
        ctx.fail("verdict UNDECIDED disagrees with the recomputed verdict " + verdict_name(c.verdict));
    }
  } catch (const UserError& e) {
    ctx.fail(std::string("malformed certificate: ") + e.what());
  } catch (const nlohmann::json::exception& e) {
    ctx.fail(std::string("malformed certificate: ") + e.what());
  }
  return ctx.report;
}

}  // namespace circlet
