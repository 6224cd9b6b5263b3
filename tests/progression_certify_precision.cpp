// The adaptive precision of certify_pair (certify.hpp, step 5): overlaps caused
// by the working precision are retried at higher precision, and an UNDECIDED
// says whether precision or the mathematics (the exact intervals) stood in the way.
#include <catch2/catch.hpp>

#include "progression/certify.hpp"
#include "progression/verify.hpp"

using namespace circlet;

namespace {
Certificate certify_with(const char* f, Progression ap, const char* g, Progression ap2, CertifyOptions o) {
  return certify_pair(ProgressionPair(Family::parse(f), ap, Family::parse(g), ap2), o);
}
}  // namespace

TEST_CASE("an overlap caused by precision is retried at higher precision", "[progression][certify][precision]") {
  // c_30(n) vs sc_59(24n+5): at 128 bits the balls (about 2^-62 in size) do not
  // separate; at 256 bits they do, and the certificate passes the independent re-check.
  CertifyOptions o;
  o.prec_max = 128;
  Certificate low = certify_with("c30", {1, 0}, "sc59", {24, 5}, o);
  CHECK(low.verdict == Verdict::Undecided);
  CHECK_THAT(low.reason, Catch::Contains("cause: precision"));
  o.prec_max = 512;
  Certificate c = certify_with("c30", {1, 0}, "sc59", {24, 5}, o);
  INFO(c.reason);
  CHECK(c.verdict == Verdict::NonConvergent);
  CHECK(c.prec == 256);
  CHECK_THAT(c.reason, Catch::Contains("decided at 256 bits"));
  VerifyReport r = verify_certificate(certificate_to_json(c));
  for (const auto& f : r.failures) UNSCOPED_INFO(f);
  CHECK(r.ok());
}

TEST_CASE("an overlap of the exact intervals is UNDECIDED by mathematics, without retries",
          "[progression][certify][precision]") {
  // Pinning only q <= 3 leaves the tail bound e^{±S(3)} wider than the gap between
  // the classes: |log(P1/P2)| <= 2 S(3), whatever the precision.
  CertifyOptions o;
  o.Q_max = 3;
  Certificate c = certify_with("c6", {1, 0}, "sc11", {4, 0}, o);
  CHECK(c.verdict == Verdict::Undecided);
  CHECK(c.prec == 128);
  CHECK_THAT(c.reason, Catch::Contains("cause: mathematics"));
  // The same at 512 bits from the start (the claim does not depend on the precision).
  o.prec = o.prec_max = 512;
  Certificate h = certify_with("c6", {1, 0}, "sc11", {4, 0}, o);
  CHECK(h.verdict == Verdict::Undecided);
  CHECK_THAT(h.reason, Catch::Contains("cause: mathematics"));
}
