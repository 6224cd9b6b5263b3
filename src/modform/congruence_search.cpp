#include "modform/congruence_search.hpp"

#include <flint/fmpz.h>

#include <map>
#include <tuple>

#include "series/eta_series.hpp"

namespace circlet {

namespace {

bool is_prime_small(long p) {
  if (p < 2) return false;
  for (long d = 2; d * d <= p; ++d)
    if (p % d == 0) return false;
  return true;
}

}  // namespace

std::vector<CongruenceHit> search_congruences(const CongruenceSearchSpec& spec, const SearchProgress& progress) {
  std::vector<long> primes;
  for (long p = 2; p <= spec.ell_max; ++p)
    if (is_prime_small(p)) primes.push_back(p);
  std::vector<Family> fams;
  for (int t = spec.t_lo; t <= spec.t_hi; ++t) {
    fams.push_back(Family{FamilyKind::Core, t});
    fams.push_back(Family{FamilyKind::SelfConjugateCore, t});
  }
  std::vector<CongruenceHit> hits;
  const double total = static_cast<double>(fams.size());
  for (size_t fi = 0; fi < fams.size(); ++fi) {
    const Family& f = fams[fi];
    const long N = spec.A_max * spec.test_n + spec.A_max;
    IntegerSeries s = family_series(f, N);
    // best[(A, B)] = (vanishes, k per prime)
    std::map<std::pair<long, long>, std::pair<bool, std::vector<int>>> seen;
    std::vector<CongruenceHit> cands;
    Fmpz q;
    for (long A = 1; A <= spec.A_max; ++A) {
      for (long B = 0; B < A; ++B) {
        bool vanish = true;
        std::vector<int> kk(primes.size(), spec.k_max);
        for (long n = 0; n <= spec.test_n; ++n) {
          const fmpz* v = s.at(A * n + B);
          if (fmpz_is_zero(v)) continue;
          vanish = false;
          for (size_t i = 0; i < primes.size(); ++i) {
            if (kk[i] == 0) continue;
            int e = 0;
            fmpz_set(q, v);
            while (e < kk[i] && fmpz_divisible_si(q, primes[i])) {
              fmpz_divexact_si(q, q, primes[i]);
              ++e;
            }
            kk[i] = e;
          }
        }
        seen[{A, B}] = {vanish, kk};
        // implied by a proper divisor's class?
        bool implied_vanish = false;
        std::vector<int> implied(primes.size(), 0);
        for (long A0 = 1; A0 < A; ++A0) {
          if (A % A0) continue;
          const auto& o = seen[{A0, B % A0}];
          if (o.first) implied_vanish = true;
          for (size_t i = 0; i < primes.size(); ++i) implied[i] = std::max(implied[i], o.first ? spec.k_max : o.second[i]);
        }
        if (vanish) {
          if (!implied_vanish) {
            CongruenceHit h{f, A, B, 0, 0, f.name() + "(" + std::to_string(A) + "n+" + std::to_string(B) + ") = 0", {}};
            cands.push_back(h);
          }
          continue;
        }
        if (implied_vanish) continue;
        for (size_t i = 0; i < primes.size(); ++i) {
          if (kk[i] == 0 || kk[i] <= implied[i]) continue;
          std::string mod = std::to_string(primes[i]) + (kk[i] > 1 ? "^" + std::to_string(kk[i]) : "");
          CongruenceHit h{f, A, B, primes[i], kk[i],
                          f.name() + "(" + std::to_string(A) + "n+" + std::to_string(B) + ") == 0 mod " + mod, {}};
          cands.push_back(h);
        }
      }
    }
    for (size_t ci = 0; ci < cands.size(); ++ci) {
      auto& h = cands[ci];
      if (progress)
        progress(f.name() + ": proving " + std::to_string(ci + 1) + "/" + std::to_string(cands.size()) + " " + h.relation,
                 (static_cast<double>(fi) + static_cast<double>(ci) / std::max<size_t>(1, cands.size())) / total);
      h.proof = prove_relation(parse_relation(h.relation), spec.proof);
      hits.push_back(std::move(h));
    }
    if (progress) progress(f.name() + ": " + std::to_string(cands.size()) + " candidates", (fi + 1) / total);
  }
  return hits;
}

}  // namespace circlet
