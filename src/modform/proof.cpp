#include "modform/proof.hpp"

#include <flint/fmpq.h>
#include <openssl/evp.h>

#include <algorithm>
#include <map>
#include <numeric>

#include "circlet/version.hpp"
#include "core/error.hpp"
#include "core/provenance.hpp"
#include "modform/eta_product.hpp"
#include "progression/certificate_reader.hpp"
#include "series/eta_series.hpp"

namespace circlet {

namespace {

std::string sha256_hex(const std::string& data) {
  unsigned char md[EVP_MAX_MD_SIZE];
  unsigned int len = 0;
  EVP_MD_CTX* ctx = EVP_MD_CTX_new();
  CIRCLET_ASSERT(ctx != nullptr, "EVP_MD_CTX_new failed");
  EVP_DigestInit_ex(ctx, EVP_sha256(), nullptr);
  EVP_DigestUpdate(ctx, data.data(), data.size());
  EVP_DigestFinal_ex(ctx, md, &len);
  EVP_MD_CTX_free(ctx);
  static const char* hex = "0123456789abcdef";
  std::string s;
  for (unsigned int i = 0; i < len; ++i) {
    s += hex[md[i] >> 4];
    s += hex[md[i] & 15];
  }
  return s;
}

long pmod(long a, long m) { return ((a % m) + m) % m; }


const char* kTheorems[] = {
    "Gordon-Hughes-Newman: level and character of an eta quotient (Ono, The web of modularity, 2004, Thm 1.64; quoted from memory)",
    "Ligozat: order of an eta quotient at the cusp c/d (Ono, The web of modularity, 2004, Thm 1.65; quoted from memory)",
    "Shimura (1973): half-integral weight on Gamma0(4N) with the multiplier of theta (quoted from memory)",
    "Ono, The web of modularity (2004), Props 2.22 and 3.7: U(d), V(d) (quoted from memory)",
    "Koblitz, Introduction to elliptic curves and modular forms, GTM 97, Prop III.3.17: twists",
    "Sturm, On the congruence of modular forms, LNM 1240 (1987): the bound (k/12)[SL2(Z):Gamma]",
};

}  // namespace

std::string proof_verdict_name(ProofVerdict v) {
  switch (v) {
    case ProofVerdict::Proved: return "PROVED";
    case ProofVerdict::Refuted: return "REFUTED";
    case ProofVerdict::Unknown: return "UNKNOWN";
  }
  return "UNKNOWN";
}

std::string proof_certificate_digest(const nlohmann::json& cert) {
  nlohmann::json c = cert;
  if (c.is_object()) c.erase("digest");
  return "sha256:" + sha256_hex(c.dump());
}

ProofResult prove_relation(const LinearRelation& rel, const ProofOptions& opt) {
  ProofResult res;
  res.relation = rel;
  nlohmann::json cert;
  cert["format"] = kProofCertificateFormat;
  cert["relation"] = rel.str();
  cert["modulus"] = rel.modulus.str();

  // 1. Each family as an eta quotient, with its level, weight, character, cusp orders.
  struct TermData {
    FamilyForm ff;
    EtaModularity em;
    FormSpace space;
    std::vector<ChainStep> chain;
    Fmpq beta;       // the relation's β this term needs (aligned: the same for every term)
    Fmpq own_beta;   // R/M of the progression A k + B itself (= beta unless dilated)
    long M = 0, R = 0, a = 1, b = 1;
  };
  std::vector<TermData> td;
  bool all_ok = true;
  std::string why;
  nlohmann::json jterms = nlohmann::json::array();
  for (const auto& t : rel.terms) {
    TermData d;
    d.ff = family_form(t.family);
    d.em = eta_modularity(d.ff.eta);
    nlohmann::json jt;
    jt["family"] = t.family.name();
    jt["coefficient"] = t.coeff.str();
    jt["A"] = t.A;
    jt["B"] = t.B;
    jt["eta_quotient"] = d.ff.eta.str();
    jt["eta_quotient_meaning"] = "sum_n " + t.family.name() + "(n) q^(" + std::to_string(d.ff.D) + "n+" +
                                 std::to_string(d.ff.shift) + ")";
    CIRCLET_ASSERT(d.ff.eta.twice_weight() == t.family.twice_weight(), "weight of the eta quotient");
    if (!d.em.ok) {
      all_ok = false;
      why = t.family.name() + ": no level found by Gordon-Hughes-Newman";
    } else {
      jt["level"] = d.em.level;
      jt["twice_weight"] = d.em.twice_weight;
      jt["character"] = std::to_string(d.em.character);
      jt["level_rule"] = d.em.rule;
      nlohmann::json orders = nlohmann::json::array();
      bool holo = true;
      for (const auto& [dd, o] : ligozat_orders(d.ff.eta, d.em.level)) {
        orders.push_back({{"cusp_denominator", dd}, {"order", o.str()}});
        if (fmpq_sgn(o.get()) < 0) holo = false;
      }
      jt["cusp_orders"] = orders;
      jt["holomorphic"] = holo ? "yes" : "no";
      if (!holo) {
        all_ok = false;
        why = t.family.name() + ": not holomorphic at every cusp";
      }
      d.space.twice_weight = d.em.twice_weight;
      d.space.level = d.em.level;
      d.space.character = d.em.character;
      d.space.support_mod = d.ff.D;
      d.space.support_res = pmod(d.ff.shift, d.ff.D);
    }
    // β = (B + s)/A with s = shift/D: F(An+B) sits at exponent D(An+B)+shift = M n + R.
    d.M = d.ff.D * t.A;
    d.R = d.ff.D * t.B + d.ff.shift;
    fmpq_set_si(d.own_beta, d.R, static_cast<ulong>(d.M));
    d.beta = d.own_beta;
    if (t.dilated()) {
      // F(A k + B) at n = d k + j: L(n + β) = L d (k + β') needs β = d β' − j (docs/MATH.md §8 (b)).
      Fmpq dj;
      fmpq_mul_si(d.beta, d.own_beta, t.d);
      fmpq_set_si(dj, t.j, 1);
      fmpq_sub(d.beta, d.beta, dj);
      jt["dilation"] = {{"d", t.d},
                        {"j", t.j},
                        {"meaning", "F(A(n-j)/d + B) for n = j mod d, else 0"},
                        {"beta_of_progression", d.own_beta.str()}};
    }
    jt["beta"] = d.beta.str();
    jterms.push_back(jt);
    td.push_back(std::move(d));
  }

  // 2. Alignment and weights.
  bool aligned = true, same_weight = true;
  for (const auto& d : td) {
    if (d.beta != td.front().beta) aligned = false;
    if (d.ff.eta.twice_weight() != td.front().ff.eta.twice_weight()) same_weight = false;
  }
  if (!aligned) {
    all_ok = false;
    why = "not aligned: the exponents L(n + beta_i) differ (beta = " + td.front().beta.str() +
          " for the first term); no single modular form carries the relation";
  } else if (!same_weight) {
    all_ok = false;
    why = "the terms have different weights";
  }

  long L = 1, c = 0;
  FormSpace W;
  std::vector<ChainStep> chain;
  if (all_ok) {
    L = fmpz_get_si(fmpq_denref(td.front().beta.get()));
    c = fmpz_get_si(fmpq_numref(td.front().beta.get()));  // c = L·β
    cert["alignment"] = {{"beta", td.front().beta.str()}, {"L", L}, {"m_of_n", "m = " + std::to_string(L) + "n + " + std::to_string(c)}};
    std::vector<FormSpace> spaces;
    for (size_t i = 0; i < td.size(); ++i) {
      auto& d = td[i];
      const auto& t = rel.terms[i];
      // The progression's own series Σ_k F(A k + B) q^{Lt (k + β')}; a dilated term
      // then takes V_e, e = L d / Lt, to Σ_k F(A k + B) q^{L (d k + j + β)}.
      const long Lt = t.dilated() ? fmpz_get_si(fmpq_denref(d.own_beta.get())) : L;
      CIRCLET_ASSERT((L * t.d) % Lt == 0, "alignment: the progression's denominator must divide L d");
      long g = std::gcd(d.M, Lt);
      d.a = d.M / g;
      d.b = Lt / g;
      CIRCLET_ASSERT(d.R % d.a == 0, "alignment: a must divide R");
      d.chain.push_back({"start: " + rel.terms[i].family.name(), d.em.rule, d.space});
      FormSpace V = op_U(d.space, d.a, &d.chain);
      V = op_sieve(V, d.R / d.a, d.M / d.a, &d.chain);
      V = op_V(V, d.b, &d.chain);
      jterms[i]["operators"] = "U_" + std::to_string(d.a) + ", sieve m = " + std::to_string(pmod(d.R / d.a, d.M / d.a)) +
                               " mod " + std::to_string(d.M / d.a) + ", V_" + std::to_string(d.b);
      if (t.dilated()) {
        const long e = L * t.d / Lt;
        V = op_V(V, e, &d.chain);
        jterms[i]["operators"] = jterms[i]["operators"].get<std::string>() + ", V_" + std::to_string(e) +
                                 " (dilation: n = " + std::to_string(t.d) + "k + " + std::to_string(t.j) + ")";
      }
      jterms[i]["chain"] = chain_to_json(d.chain);
      spaces.push_back(V);
    }
    W = op_combine(spaces, &chain);
    if (rel.restricted) {
      long LQ = L * rel.Q;
      long rm = pmod(L * rel.r + c, LQ);
      W = rel.complement ? op_complement(W, rm, LQ, &chain) : op_sieve(W, rm, LQ, &chain);
    }
    cert["combination_chain"] = chain_to_json(chain);
    cert["space"] = space_to_json(W);
    res.space = W;
    res.index = space_index(W);
    res.bound = sturm_bound(W, rel.modulus);
    cert["index"] = res.index.str();
    cert["sturm_bound"] = res.bound.str();
    cert["bound_rule"] = sturm_rule(W, rel.modulus);
  }
  cert["terms"] = jterms;

  // 3. Which n to compare: up to the Sturm bound (m = L n + c ≤ bound), at least min_n.
  long n_max = -1;
  bool bound_ok = false;
  if (all_ok) {
    if (fmpz_cmp_si(res.bound, opt.max_m) <= 0) {
      long B = fmpz_get_si(res.bound);
      n_max = B >= c ? (B - c) / L : -1;
      bound_ok = true;
    } else {
      why = "the Sturm bound " + res.bound.str() + " exceeds the coefficient limit " + std::to_string(opt.max_m);
    }
  }
  long n_check = std::max(n_max, opt.min_n);
  // Keep the comparison within the series engine's reach.
  for (const auto& t : rel.terms) {
    long lim = t.d * ((opt.max_m - t.B) / t.A) + t.j;  // argument(n) <= max_m for n <= lim
    if (lim < n_check) {
      n_check = std::max(0L, lim);
      if (bound_ok && n_check < n_max) {
        bound_ok = false;
        why = "the coefficients up to the bound are beyond the limit " + std::to_string(opt.max_m);
      }
    }
  }

  // 4. Exact coefficients, one series per family.
  std::map<std::string, IntegerSeries> series;
  std::map<std::string, long> need;
  for (const auto& t : rel.terms) {
    long n = t.A * (n_check / t.d) + t.B;  // at least argument(n) for every n <= n_check
    auto& v = need[t.family.name()];
    v = std::max(v, n);
  }
  for (const auto& [name, n] : need) series.emplace(name, family_series(Family::parse(name), n));
  // Integer coefficients: λ_i · den (den = lcm of the denominators).
  Fmpz den(1);
  for (const auto& t : rel.terms) fmpz_lcm(den, den, fmpq_denref(t.coeff.get()));
  std::vector<Fmpz> lam;
  for (const auto& t : rel.terms) {
    Fmpz x;
    fmpz_divexact(x, den, fmpq_denref(t.coeff.get()));
    fmpz_mul(x, x, fmpq_numref(t.coeff.get()));
    lam.push_back(x);
  }
  bool any_dilated = false;
  for (const auto& t : rel.terms) any_dilated = any_dilated || t.dilated();
  std::string digest_text;
  Fmpz total, rem;
  bool refuted = false;
  for (long n = 0; n <= n_check && !refuted; ++n) {
    if (rel.restricted && ((n % rel.Q == rel.r) == rel.complement)) continue;
    fmpz_zero(total);
    std::string line = std::to_string(n);
    std::vector<std::string> vals;
    for (size_t i = 0; i < rel.terms.size(); ++i) {
      const auto& t = rel.terms[i];
      const long arg = t.argument(n);
      Fmpz vv;  // 0: a dilated term off its class
      if (arg >= 0) {
        const fmpz* v = series.at(t.family.name()).at(arg);
        fmpz_addmul(total, lam[i], v);
        fmpz_set(vv, v);
      }
      vals.push_back(vv.str());
      line += " " + vals.back();
    }
    digest_text += line + "\n";
    bool zero = fmpz_is_zero(rel.modulus) ? fmpz_is_zero(total) : (fmpz_mod(rem, total, rel.modulus), fmpz_is_zero(rem));
    if (!zero) {
      refuted = true;
      res.counterexample_n = n;
      res.counterexample_values = vals;
      res.counterexample_total = total.str();
      if (!fmpz_is_one(den)) res.counterexample_total += "/" + den.str();
    }
  }
  res.n_checked = refuted ? res.counterexample_n : n_check;
  res.coefficient_digest = "sha256:" + sha256_hex(digest_text);
  if (refuted) {
    res.verdict = ProofVerdict::Refuted;
    std::string vs;
    for (size_t i = 0; i < rel.terms.size(); ++i) {
      const auto& t = rel.terms[i];
      const long arg = t.argument(res.counterexample_n);
      vs += (i ? ", " : "");
      if (arg >= 0)
        vs += t.family.name() + "(" + std::to_string(arg) + ") = " + res.counterexample_values[i];
      else
        vs += t.str() + " = 0 (n mod " + std::to_string(t.d) + " != " + std::to_string(t.j) + ")";
    }
    res.reason = "fails at n = " + std::to_string(res.counterexample_n) + ": " + vs + "; left side = " + res.counterexample_total;
  } else if (all_ok && bound_ok) {
    res.verdict = ProofVerdict::Proved;
    res.reason = "coefficients m <= " + res.bound.str() + " of a form in " + W.str() + " vanish" +
                 (fmpz_is_zero(rel.modulus) ? "" : " mod " + rel.modulus.str());
  } else {
    res.verdict = ProofVerdict::Unknown;
    res.reason = why + "; no counterexample for n <= " + std::to_string(n_check);
  }
  cert["checked"] = {{"n_from", 0},
                     {"n_to", res.n_checked},
                     {"lines", any_dilated ? "one per n in the class: n, then the value of each term (F_i(A_i(n-j_i)/d_i + B_i), 0 off n = j_i mod d_i)"
                                           : "one per n in the class: n, then F_i(A_i n + B_i) for each term"},
                     {"coefficient_digest", res.coefficient_digest}};
  cert["verdict"] = proof_verdict_name(res.verdict);
  cert["reason"] = res.reason;
  if (refuted)
    cert["counterexample"] = {{"n", res.counterexample_n}, {"values", res.counterexample_values}, {"left_side", res.counterexample_total}};
  nlohmann::json th = nlohmann::json::array();
  for (const char* s : kTheorems) th.push_back(s);
  cert["theorems"] = th;
  {
    // Exactly the four fields verify checks (as in a progression certificate): the
    // build's commit and library versions describe the program, not the proof.
    const nlohmann::json pv = Provenance::now(command_line()).to_json();
    cert["provenance"] = {{"program", pv["program"]}, {"version", pv["version"]}, {"command", pv["command"]}, {"date", pv["date"]}};
  }
  cert["digest"] = proof_certificate_digest(cert);
  res.certificate = cert;
  return res;
}

namespace {

// POSIX shell words of a recorded command line, as set_command_line() quotes them
// ('…' with '\'' for a quote; unquoted words have no special characters).
// Returns false on an unterminated quote or a character an unquoted word cannot hold.
bool shell_words(const std::string& s, std::vector<std::string>& out) {
  out.clear();
  size_t i = 0;
  while (i < s.size()) {
    if (s[i] == ' ') {
      ++i;
      continue;
    }
    std::string w;
    while (i < s.size() && s[i] != ' ') {
      if (s[i] == '\'') {
        size_t j = s.find('\'', i + 1);
        if (j == std::string::npos) return false;
        w += s.substr(i + 1, j - i - 1);
        i = j + 1;
      } else if (s[i] == '\\' && i + 1 < s.size() && s[i + 1] == '\'') {
        w += '\'';
        i += 2;
      } else {
        if (std::string("\t\n\"$\\*?;&|<>()").find(s[i]) != std::string::npos) return false;
        w += s[i++];
      }
    }
    out.push_back(w);
  }
  return true;
}

bool is_digits(const std::string& s) { return !s.empty() && s.find_first_not_of("0123456789") == std::string::npos; }

// The value of option `name` in words[2..] ("--t 2..12" or "--t=2..12"), or "" if absent.
std::string option_value(const std::vector<std::string>& w, const std::string& name) {
  for (size_t i = 2; i < w.size(); ++i) {
    if (w[i] == name && i + 1 < w.size()) return w[i + 1];
    if (w[i].rfind(name + "=", 0) == 0) return w[i].substr(name.size() + 1);
  }
  return "";
}

// provenance.command must be a circlet command that writes this relation's proof:
// `circlet prove RELATION …` with RELATION parsing to the same relation, or
// `circlet congruences …` for a one-term congruence (or vanishing) whose t, A and ℓ
// lie in the command's --t, --amax, --lmax (defaults 2..12, 50, 13).
std::string check_provenance_command(const std::string& cmd, const LinearRelation& rel) {
  std::vector<std::string> w;
  if (!shell_words(cmd, w)) return "not a command line as circlet records it";
  if (w.size() < 2 || w[0] != "circlet") return "does not start with 'circlet'";
  if (w[1] == "prove") {
    std::vector<std::string> pos;
    int outputs = 0;
    for (size_t i = 2; i < w.size(); ++i) {
      if (w[i] == "-o" || w[i] == "--output") {
        if (++outputs > 1 || i + 1 == w.size()) return "circlet prove takes one -o FILE";
        ++i;
        continue;
      }
      if (w[i].rfind("-", 0) == 0) return "unknown option " + w[i] + " of circlet prove";
      pos.push_back(w[i]);
    }
    if (pos.size() != 1) return "circlet prove takes one relation";
    LinearRelation r2;
    try {
      r2 = parse_relation(pos[0]);
    } catch (const std::exception&) {
      return "the relation of the command does not parse";
    }
    if (r2.str() != rel.str()) return "the command proves '" + r2.str() + "', not this relation";
    return "";
  }
  if (w[1] == "congruences") {
    if (rel.terms.size() != 1 || rel.restricted) return "circlet congruences writes one-term relations only";
    // Only its own options, each at most once, and one output directory.
    std::map<std::string, int> seen;
    for (size_t i = 2; i < w.size(); ++i) {
      std::string name = w[i].substr(0, w[i].find('='));
      if (name == "--output") name = "-o";
      if (name != "--t" && name != "--amax" && name != "--lmax" && name != "--kmax" && name != "--test-n" && name != "-o")
        return "unknown argument " + w[i] + " of circlet congruences";
      if (++seen[name] > 1) return name + " given twice";
      if (w[i].find('=') == std::string::npos) ++i;  // its value
      if (i >= w.size()) return name + " without a value";
    }
    if (seen["-o"] != 1) return "circlet congruences takes one -o DIR";
    const RelationTerm& t = rel.terms[0];
    long tlo = 2, thi = 12, amax = 50, lmax = 13;
    const std::string tv = option_value(w, "--t"), av = option_value(w, "--amax"), lv = option_value(w, "--lmax");
    try {
      if (!tv.empty()) {
        const size_t dots = tv.find("..");
        if (dots == std::string::npos) {
          if (!is_digits(tv)) return "--t is not a range";
          tlo = thi = std::stol(tv);
        } else {
          if (!is_digits(tv.substr(0, dots)) || !is_digits(tv.substr(dots + 2))) return "--t is not a range";
          tlo = std::stol(tv.substr(0, dots));
          thi = std::stol(tv.substr(dots + 2));
        }
      }
      if (!av.empty()) {
        if (!is_digits(av)) return "--amax is not a number";
        amax = std::stol(av);
      }
      if (!lv.empty()) {
        if (!is_digits(lv)) return "--lmax is not a number";
        lmax = std::stol(lv);
      }
    } catch (const std::exception&) {
      return "an option value is out of range";
    }
    const std::string fam = t.family.name();
    const long tt = std::stol(fam.substr(fam[0] == 's' ? 2 : 1));
    if (tt < tlo || tt > thi) return "t = " + std::to_string(tt) + " is outside the command's --t";
    if (t.A > amax) return "A = " + std::to_string(t.A) + " exceeds the command's --amax";
    if (!fmpz_is_zero(rel.modulus)) {
      // the modulus is ℓ^k: some prime ℓ <= --lmax divides it
      bool small_prime = false;
      for (long p = 2; p <= lmax && !small_prime; ++p) small_prime = fmpz_divisible_si(rel.modulus, p);
      if (!small_prime) return "the prime of the modulus exceeds the command's --lmax";
    }
    return "";
  }
  return "'" + w[1] + "' does not write proof certificates (prove, congruences do)";
}

}  // namespace

ProofVerifyReport verify_proof_certificate(const nlohmann::json& cert) {
  ProofVerifyReport r;
  try {
    if (!cert.is_object() || !cert.contains("format") || cert["format"] != kProofCertificateFormat) {
      r.failures.push_back("/format: not a proof certificate");
      return r;
    }
    // Exactly the keys the prover writes (docs/proof-certificate-format.md): an unknown
    // or a missing field is rejected by name before anything else.
    static const std::vector<std::string> always = {"alignment", "bound_rule", "checked", "combination_chain", "digest",
                                                    "format", "index", "modulus", "provenance", "reason",
                                                    "relation", "space", "sturm_bound", "terms", "theorems", "verdict"};
    for (auto it = cert.begin(); it != cert.end(); ++it)
      if (std::find(always.begin(), always.end(), it.key()) == always.end() && it.key() != "counterexample")
        r.failures.push_back("/" + it.key() + ": unknown field");
    for (const auto& k : always)
      if (!cert.contains(k)) r.failures.push_back("/" + k + ": missing field");
    if (!r.failures.empty()) return r;
    if (!cert["digest"].is_string()) {
      r.failures.push_back("/digest: not a string");
    } else if (cert["digest"].get<std::string>() != proof_certificate_digest(cert)) {
      r.failures.push_back("/digest: the certificate content was changed after it was written");
    } else {
      r.checked.push_back("digest of the certificate content");
    }
    if (!cert["relation"].is_string()) {
      r.failures.push_back("/relation: not a string");
      return r;
    }
    LinearRelation rel;
    try {
      rel = parse_relation(cert["relation"].get<std::string>());
    } catch (const std::exception& e) {
      r.failures.push_back(std::string("/relation: ") + e.what());
      return r;
    }
    if (rel.str() != cert["relation"].get<std::string>())
      r.failures.push_back("/relation: not in the canonical spelling '" + rel.str() + "'");
    else
      r.checked.push_back("relation parses: " + rel.str());
    // Provenance: exactly program, version, date, command; the command is one that
    // writes this relation's proof. (Who ran it, and when, cannot be re-derived.)
    const nlohmann::json& pv = cert["provenance"];
    bool pv_ok = pv.is_object() && pv.size() == 4;
    for (const char* k : {"program", "version", "date", "command"}) pv_ok = pv_ok && pv.contains(k) && pv[k].is_string();
    if (!pv_ok) {
      r.failures.push_back("/provenance: must hold exactly the strings program, version, date, command");
    } else {
      if (pv["program"] != "circlet") r.failures.push_back("/provenance/program: not 'circlet'");
      if (pv["version"] != kVersion)
        r.failures.push_back(std::string("/provenance/version: not the version of this verifier (") + kVersion +
                             "); re-run the proof with this version");
      if (!is_utc_date_time(pv["date"].get<std::string>())) r.failures.push_back("/provenance/date: not a UTC date YYYY-MM-DDTHH:MM:SSZ");
      const std::string why = check_provenance_command(pv["command"].get<std::string>(), rel);
      if (!why.empty())
        r.failures.push_back("/provenance/command: " + why);
      else
        r.checked.push_back("provenance.command writes this relation");
    }
    ProofResult fresh = prove_relation(rel);
    const nlohmann::json& f = fresh.certificate;
    for (const char* key : {"modulus", "alignment", "terms", "combination_chain", "space", "index", "sturm_bound",
                            "bound_rule", "checked", "verdict", "reason", "counterexample", "theorems"}) {
      bool in_cert = cert.contains(key), in_fresh = f.contains(key);
      if (in_cert != in_fresh || (in_cert && cert[key] != f[key]))
        r.failures.push_back(std::string("/") + key + ": recorded value differs from the recomputation");
      else if (in_cert)
        r.checked.push_back(std::string(key) + " recomputed");
    }
  } catch (const std::exception& e) {
    r.failures.push_back(std::string("malformed certificate: ") + e.what());
  }
  return r;
}

}  // namespace circlet
