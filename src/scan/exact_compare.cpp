#include "scan/exact_compare.hpp"

#include <algorithm>
#include <map>

#include "core/error.hpp"
#include "modform/proof.hpp"
#include "modform/relation.hpp"

namespace circlet {

std::string relation_name(Relation r) {
  switch (r) {
    case Relation::BothVanish: return "both-vanish";
    case Relation::Proportional: return "proportional";
    case Relation::NotProportional: return "not-proportional";
  }
  return "not-proportional";
}

ProportionalityResult compare_exact(const IntegerSeries& f, const Progression& ap, const IntegerSeries& g,
                                    const Progression& ap2, long K, long mod, long res) {
  CIRCLET_ASSERT(ap.A * K + ap.B < f.length() && ap2.A * K + ap2.B < g.length(), "series too short for compare_exact");
  ProportionalityResult r;
  bool have_k = false, any_nonzero = false;
  Fmpz num, den;  // k = num/den: F·den = G·num
  Fmpz lhs, rhs;
  for (long n = res; n <= K; n += mod) {
    const fmpz* a = f.at(ap.A * n + ap.B);
    const fmpz* b = g.at(ap2.A * n + ap2.B);
    ++r.tested;
    if (!fmpz_is_zero(a) || !fmpz_is_zero(b)) any_nonzero = true;
    if (!have_k) {
      if (fmpz_is_zero(b)) {
        if (!fmpz_is_zero(a)) {
          r.relation = Relation::NotProportional;
          r.witness = n;
          return r;
        }
        continue;
      }
      fmpz_set(num, a);
      fmpz_set(den, b);
      have_k = true;
      continue;
    }
    fmpz_mul(lhs, a, den);
    fmpz_mul(rhs, b, num);
    if (!fmpz_equal(lhs, rhs)) {
      r.relation = Relation::NotProportional;
      r.witness = n;
      return r;
    }
  }
  if (!any_nonzero) {
    r.relation = Relation::BothVanish;
    return r;
  }
  r.relation = Relation::Proportional;
  fmpq_set_fmpz_frac(r.k, num, den);
  return r;
}

ExactComparison compare_pair_exact(const IntegerSeries& f, const Progression& ap, const IntegerSeries& g,
                                   const Progression& ap2, long K, const std::vector<long>& primes) {
  ExactComparison c;
  c.whole = compare_exact(f, ap, g, ap2, K);
  if (c.whole.relation != Relation::NotProportional) return c;  // every sub-progression inherits it
  for (long p : primes)
    for (long j = 0; j < p; ++j) {
      ProportionalityResult s = compare_exact(f, ap, g, ap2, K, p, j);
      if (s.relation == Relation::Proportional) c.sub.push_back({p, j, s.k});
      if (s.relation == Relation::BothVanish) c.vanishing.emplace_back(p, j);
    }
  return c;
}

std::string ExactComparison::describe() const {
  std::string s = relation_name(whole.relation);
  if (whole.relation == Relation::Proportional) s += " k=" + whole.k.str();
  if (whole.relation == Relation::NotProportional && whole.witness >= 0) s += " (fails at n=" + std::to_string(whole.witness) + ")";
  // Group by p: "k=2 on n mod 7 except n = 4" when most classes share one k.
  std::map<long, std::vector<const SubProportionality*>> by_p;
  for (const auto& x : sub) by_p[x.p].push_back(&x);
  for (const auto& [p, xs] : by_p) {
    std::map<std::string, std::vector<long>> by_k;
    for (const auto* x : xs) by_k[x->k.str()].push_back(x->j);
    for (const auto& [k, js] : by_k) {
      if (2 * static_cast<long>(js.size()) > p) {
        s += "; proportional k=" + k + " on n mod " + std::to_string(p) + " except n =";
        for (long j = 0; j < p; ++j)
          if (std::find(js.begin(), js.end(), j) == js.end()) s += " " + std::to_string(j);
      } else {
        for (long j : js) s += "; n=" + std::to_string(j) + " mod " + std::to_string(p) + ": proportional k=" + k;
      }
    }
  }
  for (const auto& v : vanishing)
    s += "; n=" + std::to_string(v.second) + " mod " + std::to_string(v.first) + ": both vanish";
  return s;
}

namespace {

std::string term_text(const Family& f, const Progression& ap) {
  return f.name() + "(" + (ap.A == 1 ? std::string() : std::to_string(ap.A)) + "n" +
         (ap.B ? "+" + std::to_string(ap.B) : std::string()) + ")";
}

ProvedRelation prove_text(const std::string& text) {
  ProofResult r = prove_relation(parse_relation(text));
  return {r.relation.str(), proof_verdict_name(r.verdict), r.reason};
}

}  // namespace

std::vector<ProvedRelation> prove_exact_comparison(const ExactComparison& e, const Family& F, const Progression& ap,
                                                   const Family& G, const Progression& ap2) {
  std::vector<ProvedRelation> out;
  const std::string f = term_text(F, ap), g = term_text(G, ap2);
  if (e.whole.relation == Relation::Proportional) {
    out.push_back(prove_text(f + " = " + e.whole.k.str() + "*" + g));
    return out;
  }
  if (e.whole.relation == Relation::BothVanish) {
    out.push_back(prove_text(f + " = 0"));
    out.push_back(prove_text(g + " = 0"));
    return out;
  }
  std::map<long, std::vector<const SubProportionality*>> by_p;
  for (const auto& x : e.sub) by_p[x.p].push_back(&x);
  for (const auto& [p, xs] : by_p) {
    std::map<std::string, std::vector<long>> by_k;
    for (const auto* x : xs) by_k[x->k.str()].push_back(x->j);
    for (const auto& [k, js] : by_k) {
      if (static_cast<long>(js.size()) == p - 1) {
        long missing = 0;
        while (std::find(js.begin(), js.end(), missing) != js.end()) ++missing;
        out.push_back(prove_text(f + " = " + k + "*" + g + " for n mod " + std::to_string(p) + " != " + std::to_string(missing)));
      } else {
        for (long j : js)
          out.push_back(prove_text(f + " = " + k + "*" + g + " for n mod " + std::to_string(p) + " = " + std::to_string(j)));
      }
    }
  }
  for (const auto& v : e.vanishing) {
    const std::string cls = " for n mod " + std::to_string(v.first) + " = " + std::to_string(v.second);
    out.push_back(prove_text(f + " = 0" + cls));
    out.push_back(prove_text(g + " = 0" + cls));
  }
  return out;
}

std::string describe_proved(const std::vector<ProvedRelation>& rs) {
  std::string s;
  for (const auto& r : rs) {
    if (!s.empty()) s += "; ";
    s += r.verdict + ": " + r.relation;
    if (r.verdict != "PROVED") s += " (" + r.reason + ")";
  }
  return s.empty() ? "no relation found" : s;
}

}  // namespace circlet
