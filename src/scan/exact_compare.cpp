#include "scan/exact_compare.hpp"

#include <algorithm>
#include <map>

#include "core/error.hpp"
#include "modform/eta_product.hpp"
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
  // A lone exception class (p − 1 classes share one k): keep the counts for find_dilated_term.
  std::map<long, std::map<std::string, long>> count_k;
  for (const auto& x : c.sub) ++count_k[x.p][x.k.str()];
  bool lone = false;
  for (const auto& [p, ks] : count_k)
    for (const auto& [k, n] : ks)
      if (n == p - 1) lone = true;
  if (lone) {
    auto cc = std::make_shared<ComparedCounts>();
    cc->K = K;
    cc->f.reserve(static_cast<size_t>(f.length()));
    for (long m = 0; m < f.length(); ++m) cc->f.push_back(f.value(m));
    cc->g.reserve(static_cast<size_t>(g.length()));
    for (long m = 0; m < g.length(); ++m) cc->g.push_back(g.value(m));
    c.counts = cc;
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

// β of F(A n + B): its coefficient sits at q^{D(A n + B) + u} = q^{DA(n + β)} (docs/MATH.md §8 (b)).
Fmpq progression_beta(const FamilyForm& ff, const Progression& ap) {
  Fmpq b;
  fmpq_set_si(b, ff.D * ap.B + ff.shift, static_cast<ulong>(ff.D * ap.A));
  return b;
}

// " + μ*TERM" or " - |μ|*TERM" (no "1*").
std::string signed_term(const Fmpq& mu, const std::string& term) {
  Fmpq a = mu;
  bool neg = fmpq_sgn(a.get()) < 0;
  if (neg) fmpq_neg(a, a);
  return std::string(neg ? " - " : " + ") + (fmpq_is_one(a.get()) ? std::string() : a.str() + "*") + term;
}

}  // namespace

std::optional<DilatedFit> find_dilated_term(const ExactComparison& e, const Family& F, const Progression& ap,
                                            const Family& G, const Progression& ap2, long p, long j, const Fmpq& lambda,
                                            long max_A) {
  if (!e.counts || p < 2 || j < 0 || j >= p) return std::nullopt;
  const ComparedCounts& C = *e.counts;
  // The class n = p k + j: β'' = (j + β)/p is the β a dilated term needs (proof.cpp's alignment).
  Fmpq beta2 = progression_beta(family_form(F), ap), tmp;
  fmpq_add_si(beta2, beta2, j);
  fmpq_div_fmpz(beta2, beta2, Fmpz(p));
  // The differences on the class, exactly: F(A n + B) − λ G(A' n + B').
  std::vector<Fmpq> diff;
  bool any_diff = false;
  for (long n = j; n <= C.K; n += p) {
    const long m1 = ap.A * n + ap.B, m2 = ap2.A * n + ap2.B;
    if (m1 >= static_cast<long>(C.f.size()) || m2 >= static_cast<long>(C.g.size())) break;
    Fmpq d(0), x;
    fmpq_set_fmpz_frac(d, C.f[static_cast<size_t>(m1)], Fmpz(1));
    fmpq_set_fmpz_frac(x, C.g[static_cast<size_t>(m2)], Fmpz(1));
    fmpq_mul(x, x, lambda);
    fmpq_sub(d, d, x);
    if (!fmpq_is_zero(d.get())) any_diff = true;
    diff.push_back(d);
  }
  if (!any_diff) return std::nullopt;  // the class is proportional itself: nothing to add
  std::vector<std::pair<const Family*, const std::vector<Fmpz>*>> fams{{&F, &C.f}};
  if (G.name() != F.name()) fams.push_back({&G, &C.g});
  for (const auto& [K, vals] : fams) {
    const FamilyForm fk = family_form(*K);
    for (long A2 = 1; A2 <= max_A; ++A2) {
      // (D B'' + u)/(D A'') = β''  ⇔  B'' = β'' A'' − u/D, a non-negative integer.
      Fmpq b;
      fmpq_mul_si(b, beta2, A2);
      fmpq_set_si(tmp, fk.shift, static_cast<ulong>(fk.D));
      fmpq_sub(b, b, tmp);
      if (!fmpz_is_one(fmpq_denref(b.get())) || fmpq_sgn(b.get()) < 0) continue;
      const long B2 = fmpz_get_si(fmpq_numref(b.get()));
      long tested = 0;
      bool have_mu = false, ok = true;
      Fmpq mu, y;
      for (size_t k = 0; k < diff.size(); ++k) {
        const long m = A2 * static_cast<long>(k) + B2;
        if (m >= static_cast<long>(vals->size())) break;
        const Fmpz& v = (*vals)[static_cast<size_t>(m)];
        ++tested;
        if (!have_mu) {
          if (fmpz_is_zero(v)) {
            if (!fmpq_is_zero(diff[k].get())) { ok = false; break; }
            continue;
          }
          fmpq_div_fmpz(mu, diff[k], v);
          have_mu = true;
          continue;
        }
        fmpq_mul_fmpz(y, mu, v);
        if (!fmpq_equal(y.get(), diff[k].get())) { ok = false; break; }
      }
      if (!ok || !have_mu || tested < kDilatedMinValues) continue;
      DilatedFit fit;
      fit.K = *K;
      fit.A2 = A2;
      fit.B2 = B2;
      fit.mu = mu;
      fit.tested = tested;
      RelationTerm t{mu, *K, A2, B2, p, j};
      fit.relation = term_text(F, ap) + " = " + lambda.str() + "*" + term_text(G, ap2) + signed_term(mu, t.str());
      return fit;
    }
  }
  return std::nullopt;
}

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
        // On the exception class: an extra dilated term that makes the relation hold for all n.
        const std::string& kk = k;  // a structured binding cannot be captured in C++17 (clang refuses)
        const SubProportionality* any = *std::find_if(xs.begin(), xs.end(), [&](const auto* x) { return x->k.str() == kk; });
        if (auto fit = find_dilated_term(e, F, ap, G, ap2, p, missing, any->k)) out.push_back(prove_text(fit->relation));
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
