// `circlet prove` and `circlet verify` on proof certificates, through the real binary.
#include <catch2/catch.hpp>

#include <cstdio>
#include <fstream>
#include <unistd.h>

#include <nlohmann/json.hpp>

#include "cli_run.hpp"

using circlet::testing::run_circlet;
using circlet::testing::slurp_file;

TEST_CASE("prove: a published congruence is PROVED and its certificate verifies", "[cli][modform]") {
  // Garvan–Kim–Stanton, "Cranks and t-cores" (1990): c_7(7n+5) ≡ 0 (mod 7).
  const std::string cert = "/tmp/circlet_prove_" + std::to_string(::getpid()) + ".json";
  auto r = run_circlet("prove 'c7(7n+5) == 0 mod 7' -o " + cert);
  CHECK(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("PROVED"));
  CHECK_THAT(r.out, Catch::Contains("M_3(Gamma0(7), (-7/.))"));
  auto v = run_circlet("verify " + cert);
  CHECK(v.status == 0);
  CHECK_THAT(v.out, Catch::Contains("proof certificate verified"));

  // Edit the recorded level of the first term: REJECTED (status 1).
  nlohmann::json j = nlohmann::json::parse(slurp_file(cert));
  j["terms"][0]["level"] = 14;
  { std::ofstream(cert) << j.dump(2); }
  auto t = run_circlet("verify " + cert);
  CHECK(t.status == 1);
  CHECK_THAT(t.out, Catch::Contains("REJECTED"));
  CHECK_THAT(t.out, Catch::Contains("digest"));
  std::remove(cert.c_str());
}

TEST_CASE("prove: a false relation is REFUTED with the first n and both exact values", "[cli][modform]") {
  // Hirschhorn–Sellers (1996) give c4(27n+5) = 3 c4(3n); with 4 it fails at n = 0: c4(5) = 3, c4(0) = 1.
  auto r = run_circlet("prove 'c4(27n+5) = 4*c4(3n)'");
  CHECK(r.status == 1);
  CHECK_THAT(r.out, Catch::Contains("REFUTED: fails at n = 0: c4(5) = 3, c4(0) = 1"));
}

TEST_CASE("prove: a malformed relation is bad input (status 2, one line)", "[cli][modform]") {
  auto r = run_circlet("prove 'c4(7n+2) = 2*sc7(8n+1) for n mod 7 != 9'");
  CHECK(r.status == 2);
  CHECK(r.out.empty());
  CHECK_THAT(r.err, Catch::StartsWith("circlet: error: relation: r in 'for n mod Q != r' must be below Q"));
  auto e = run_circlet("prove 'c4(7n-2) = 0'");
  CHECK(e.status == 2);
  CHECK_THAT(e.err, Catch::Contains("must be non-negative"));
}

TEST_CASE("prove: a relation with a dilated term is PROVED, verified, and refuted when perturbed", "[cli][modform]") {
  // c4(7n+2) = 2 sc7(8n+1) + c4((n-4)/7) for every n (tests/modform_proof.cpp; PARI/GP confirms
  // the values c4(49k+30) - 2 sc7(56k+33) = c4(k) there).
  const std::string cert = "/tmp/circlet_prove_dil_" + std::to_string(::getpid()) + ".json";
  auto r = run_circlet("prove 'c4(7n+2) = 2*sc7(8n+1) + c4((n-4)/7)' -o " + cert);
  CHECK(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("relation: c4(7n+2) - 2*sc7(8n+1) - c4((n-4)/7) = 0"));
  CHECK_THAT(r.out, Catch::Contains("PROVED"));
  auto v = run_circlet("verify " + cert);
  CHECK(v.status == 0);
  CHECK_THAT(v.out, Catch::Contains("proof certificate verified"));
  nlohmann::json j = nlohmann::json::parse(slurp_file(cert));
  j["terms"][2]["dilation"]["j"] = 3;
  { std::ofstream(cert) << j.dump(2); }
  auto t = run_circlet("verify " + cert);
  CHECK(t.status == 1);
  CHECK_THAT(t.out, Catch::Contains("REJECTED"));
  std::remove(cert.c_str());

  // By construction sq1(2n) = sq1(n/2) (x^2 = 2n forces x = 2y, n = 2y^2); on the odd class it
  // fails at n = 0, where the dilated term is 0.
  auto ok = run_circlet("prove 'sq1(2n) = sq1(n/2)'");
  CHECK(ok.status == 0);
  auto bad = run_circlet("prove 'sq1(2n) = sq1((n-1)/2)'");
  CHECK(bad.status == 1);
  CHECK_THAT(bad.out, Catch::Contains("REFUTED: fails at n = 0: sq1(0) = 1, sq1((n-1)/2) = 0 (n mod 2 != 1); left side = 1"));
  auto err = run_circlet("prove 'c4((n-7)/7) = 0'");
  CHECK(err.status == 2);
  CHECK_THAT(err.err, Catch::Contains("must be below d"));
}
