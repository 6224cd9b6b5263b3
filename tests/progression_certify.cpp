#include "progression/certify.hpp"

#include <catch2/catch.hpp>
#include <cmath>

#include "core/error.hpp"
#include "progression/ball_io.hpp"
#include "progression/verify.hpp"
#include "series/eta_series.hpp"

using namespace circlet;

namespace {
Certificate certify(const char* f, Progression ap, const char* g, Progression ap2) {
  ProgressionPair pair(Family::parse(f), ap, Family::parse(g), ap2);
  return certify_pair(pair, CertifyOptions{});
}
}  // namespace

TEST_CASE("certificates of several (t, pair) cases verify", "[progression][certify]") {
  struct Case { const char* f; Progression ap; const char* g; Progression ap2; };
  const Case cases[] = {{"c6", {1, 0}, "sc11", {1, 0}},  {"c7", {2, 1}, "sc13", {3, 2}},
                        {"c8", {5, 3}, "sc15", {1, 0}},  {"c9", {4, 0}, "sc17", {6, 5}},
                        {"c12", {12, 5}, "sc23", {11, 10}}};
  for (const auto& c : cases) {
    Certificate cert = certify(c.f, c.ap, c.g, c.ap2);
    INFO(c.f << " " << c.ap.str() << " " << c.g << " " << c.ap2.str() << ": " << cert.reason);
    CHECK(cert.verdict == Verdict::NonConvergent);
    VerifyReport r = verify_certificate(certificate_to_json(cert));
    for (const auto& f : r.failures) UNSCOPED_INFO(f);
    CHECK(r.ok());
    CHECK(r.checked.size() >= 10);
  }
}

TEST_CASE("identical sequences are CONSTANT 1, an integer; weight <= 2 is UNDECIDED", "[progression][certify]") {
  Certificate c = certify("c6", {3, 1}, "c6", {3, 1});
  CHECK(c.verdict == Verdict::Constant);
  CHECK(c.contains_integer);
  CHECK(c.integer == Fmpz(1));
  CHECK(verify_certificate(certificate_to_json(c)).ok());
  Certificate u = certify("c5", {1, 0}, "sc9", {1, 0});
  CHECK(u.verdict == Verdict::Undecided);
  CHECK_THAT(u.reason, Catch::Contains("weight 2 <= 2"));
  CHECK(verify_certificate(certificate_to_json(u)).ok());
  Certificate h = certify("c4", {1, 0}, "sc7", {1, 0});
  CHECK(h.verdict == Verdict::Undecided);
  CHECK_THAT(h.reason, Catch::Contains("weight 3/2"));
}

TEST_CASE("families of different weight are refused with the reason", "[progression][certify][errors]") {
  CHECK_THROWS_WITH(certify("c6", {1, 0}, "sc13", {1, 0}),
                    Catch::Contains("c6 has weight 5/2 but sc13 has weight 3") &&
                        Catch::Contains("only for families of the same weight"));
}

// Sanity (not proof): for n ≥ n0 in each certified class, the exact ratio
// c_t(An+B)/sc_{2t−1}(A'n+B') lies in the certified interval for R(n) = M_F/M_G,
// widened by the cusp-size slack: |count/M − 1| ≤ C·X^{1−w/2} (Hecke: cusp part
// O(X^{w/2}) against a main term of size X^{w−1}); we take C = 4 on both counts.
TEST_CASE("certified intervals contain exact count ratios at large n, within the cusp slack", "[progression][certify]") {
  struct Case { const char* f; Progression ap; const char* g; Progression ap2; };
  const Case cases[] = {{"c6", {1, 0}, "sc11", {1, 0}}, {"c8", {1, 0}, "sc15", {1, 0}}, {"c7", {1, 1}, "sc13", {1, 0}}};
  for (const auto& cs : cases) {
    Certificate cert = certify(cs.f, cs.ap, cs.g, cs.ap2);
    REQUIRE(cert.verdict == Verdict::NonConvergent);
    REQUIRE(fmpz_cmp_si(cert.modulus, 200) <= 0);
    const long N = 6000;
    Family F = Family::parse(cs.f), G = Family::parse(cs.g);
    IntegerSeries f = family_series(F, cs.ap.A * N + cs.ap.B), g = family_series(G, cs.ap2.A * N + cs.ap2.B);
    const double w = cert.rank / 2.0;
    long tested = 0, discriminating = 0;
    for (int k = 0; k < 2; ++k) {
      const long M = fmpz_get_si(cert.modulus), r = fmpz_get_si(cert.classes[k].residue);
      for (long n = r; n <= N; n += M) {
        if (n < 2000) continue;
        double ratio = fmpz_get_d(f.at(cs.ap.A * n + cs.ap.B)) / fmpz_get_d(g.at(cs.ap2.A * n + cs.ap2.B));
        double slack = 4.0 * std::pow(static_cast<double>(n), 1.0 - w / 2.0);
        arf_t lo, hi;
        arf_init(lo);
        arf_init(hi);
        arb_get_lbound_arf(lo, cert.classes[k].from_n0, 53);
        arb_get_ubound_arf(hi, cert.classes[k].from_n0, 53);
        INFO(cs.f << " class " << k << " n = " << n << " ratio " << ratio << " interval " << interval_display(cert.classes[k].from_n0));
        CHECK(ratio >= arf_get_d(lo, ARF_RND_FLOOR) * (1 - slack) / (1 + slack));
        CHECK(ratio <= arf_get_d(hi, ARF_RND_CEIL) * (1 + slack) / (1 - slack));
        // The check discriminates: where the widened intervals of the two classes are
        // disjoint, the ratio is outside the other class's widened interval.
        arf_t lo2, hi2;
        arf_init(lo2);
        arf_init(hi2);
        arb_get_lbound_arf(lo2, cert.classes[1 - k].from_n0, 53);
        arb_get_ubound_arf(hi2, cert.classes[1 - k].from_n0, 53);
        double l2 = arf_get_d(lo2, ARF_RND_FLOOR) * (1 - slack) / (1 + slack);
        double h2 = arf_get_d(hi2, ARF_RND_CEIL) * (1 + slack) / (1 - slack);
        if (h2 < arf_get_d(lo, ARF_RND_FLOOR) * (1 - slack) / (1 + slack) ||
            l2 > arf_get_d(hi, ARF_RND_CEIL) * (1 + slack) / (1 - slack)) {
          CHECK((ratio < l2 || ratio > h2));
          ++discriminating;
        }
        arf_clear(lo2);
        arf_clear(hi2);
        arf_clear(lo);
        arf_clear(hi);
        ++tested;
      }
    }
    CHECK(tested >= 20);
    if (cert.rank >= 7) CHECK(discriminating == tested);
  }
}
