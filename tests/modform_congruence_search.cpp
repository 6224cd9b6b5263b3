// Tests of src/modform/congruence_search.hpp: the search finds the published congruence
// and every PROVED hit holds well beyond the range the search looked at.
#include <catch2/catch.hpp>

#include "modform/congruence_search.hpp"
#include "series/eta_series.hpp"

using namespace circlet;

TEST_CASE("the search over c5, A <= 10 finds and proves c5(5n+4) == 0 mod 5; its hits hold to n = 3000",
          "[modform]") {
  CongruenceSearchSpec spec;
  spec.t_lo = spec.t_hi = 5;
  spec.A_max = 10;
  spec.ell_max = 7;
  spec.test_n = 60;
  auto hits = search_congruences(spec);
  bool gks = false;
  const long N = 3000;
  IntegerSeries c5 = family_series(Family::parse("c5"), 10 * N + 10);
  IntegerSeries sc5 = family_series(Family::parse("sc5"), 10 * N + 10);
  for (const auto& h : hits) {
    INFO(h.relation << ": " << proof_verdict_name(h.proof.verdict) << " " << h.proof.reason);
    // Garvan–Kim–Stanton, "Cranks and t-cores" (1990): c5(5n+4) ≡ 0 (mod 5).
    if (h.relation == "c5(5n+4) == 0 mod 5") {
      CHECK(h.proof.verdict == ProofVerdict::Proved);
      gks = true;
    }
    if (h.proof.verdict != ProofVerdict::Proved) continue;
    // independent of the search range (n ≤ 60): the theorem holds for n ≤ 3000
    const IntegerSeries& s = h.family.kind == FamilyKind::Core ? c5 : sc5;
    Fmpz m(1), r;
    for (int i = 0; i < h.k; ++i) fmpz_mul_si(m, m, h.ell);
    for (long n = 0; n <= N; ++n) {
      const fmpz* v = s.at(h.A * n + h.B);
      if (h.ell == 0) {
        REQUIRE(fmpz_is_zero(v));
      } else {
        fmpz_mod(r, v, m);
        REQUIRE(fmpz_is_zero(r));
      }
    }
  }
  CHECK(gks);
  CHECK(hits.size() >= 5);
}
