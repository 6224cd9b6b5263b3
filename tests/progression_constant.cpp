// The proportional CONSTANT route of certify.hpp (route 1').
#include <catch2/catch.hpp>
#include <cmath>

#include "mainterm/main_term.hpp"
#include "progression/certify.hpp"
#include "progression/verify.hpp"
#include "series/eta_series.hpp"

using namespace circlet;

namespace {
// c_9(34n+1) vs sc_17(102n+1): X_F = 34n + 13/3, X_G = 102n + 13 = 3·X_F; for t = 9,
// det S_F·det S_G = (9/2)^8·9·17^8 is a square; 17 ∤ X_F on this progression.
ProgressionPair c9_sc17() {
  return ProgressionPair(Family::parse("c9"), Progression{34, 1}, Family::parse("sc17"), Progression{102, 1});
}
}  // namespace

TEST_CASE("c9(34n+1) vs sc17(102n+1) is CONSTANT 580/243, not an integer, and verifies", "[progression][constant]") {
  ProgressionPair pair = c9_sc17();
  Fmpq lambda;
  REQUIRE(x_proportional(pair, &lambda));
  CHECK(lambda == Fmpq(3));
  CHECK(fmpq_is_square(discriminant_product(pair, lambda)));
  Certificate c = certify_pair(pair, CertifyOptions{});
  REQUIRE(c.verdict == Verdict::Constant);
  CHECK(c.constant_route == "proportional");
  CHECK(c.constant_value == Fmpq(580, 243));
  CHECK_FALSE(c.contains_integer);
  VerifyReport r = verify_certificate(certificate_to_json(c));
  for (const auto& f : r.failures) UNSCOPED_INFO(f);
  CHECK(r.ok());
}

// Independent route: the main-term module (L-values and exact rationals, src/mainterm/)
// gives M_F(34n+1)/M_G(102n+1) = 580/243 exactly at every n.
TEST_CASE("the main-term module agrees: M_F/M_G = 580/243 at every n", "[progression][constant]") {
  ProgressionPair pair = c9_sc17();
  for (long n : {0L, 1L, 7L, 16L, 50L}) {
    MainTerm mf = main_term(pair.F, Fmpz(34 * n + 1), 128), mg = main_term(pair.G, Fmpz(102 * n + 1), 128);
    REQUIRE(mf.exact);
    REQUIRE(mg.exact);
    Fmpq q;
    fmpq_div(q, *mf.exact, *mg.exact);
    INFO("n = " << n);
    CHECK(q == Fmpq(580, 243));
  }
}

// Sanity: exact counts approach 580/243 within the cusp slack 4·X^{1−w/2} (w = 4).
TEST_CASE("exact count ratios approach the certified constant", "[progression][constant]") {
  const long K = 250;
  IntegerSeries f = family_series(Family::parse("c9"), 34 * K + 1), g = family_series(Family::parse("sc17"), 102 * K + 1);
  for (long n = 100; n <= K; n += 10) {
    double ratio = fmpz_get_d(f.at(34 * n + 1)) / fmpz_get_d(g.at(102 * n + 1));
    double slack = 4.0 / (34.0 * n);
    INFO("n = " << n << " ratio " << ratio);
    CHECK(std::fabs(ratio / (580.0 / 243.0) - 1) < 2 * slack);
  }
}

TEST_CASE("tampered CONSTANT certificates are rejected", "[progression][constant][verify]") {
  const nlohmann::json good = certificate_to_json(certify_pair(c9_sc17(), CertifyOptions{}));
  struct T { std::function<void(nlohmann::json&)> edit; const char* msg; };
  const std::vector<T> tampers = {
      {[](nlohmann::json& j) { j["constant"]["value"] = "3"; }, "/constant/value: its square is not constant.square"},
      {[](nlohmann::json& j) {
         j["constant"]["contains_integer"] = true;
         j["constant"]["integer"] = "2";
       }, "/constant/contains_integer: must be false"},
      {[](nlohmann::json& j) { j["finite_primes"][0]["classes"][0]["beta_G"] = "7/3"; }, "local factor beta_G is 7/3"},
      {[](nlohmann::json& j) { j["finite_primes"][0]["classes"].erase(0); }, "do not cover every n"},
      {[](nlohmann::json& j) { j["finite_primes"][2]["rho"] = "1"; }, "not the common value 1"},
      {[](nlohmann::json& j) { j["ap2"]["B"] = 4; }, "X_G is not a constant multiple of X_F"},
      {[](nlohmann::json& j) { j["constant"]["square"] = "4"; }, "/constant/square: is not the recomputed"},
  };
  for (const auto& t : tampers) {
    nlohmann::json j = good;
    t.edit(j);
    VerifyReport r = verify_certificate(j);
    std::string all;
    for (const auto& f : r.failures) all += f + "\n";
    INFO(all);
    CHECK_FALSE(r.ok());
    CHECK_THAT(all, Catch::Contains(t.msg));
  }
}

TEST_CASE("proportional X with a p-adic zero of X at a finite prime is not CONSTANT", "[progression][constant]") {
  // c9(2n+1) vs sc17(6n+1): X_G = 3·X_F but v_17(X) is unbounded on the progression.
  ProgressionPair pair(Family::parse("c9"), Progression{2, 1}, Family::parse("sc17"), Progression{6, 1});
  Certificate c = certify_pair(pair, CertifyOptions{});
  CHECK(c.verdict == Verdict::NonConvergent);
  CHECK(c.distinguishing_prime == 17);
}

// With X_G = λ·X_F and a square discriminant product, ρ_q = 1 for every q outside
// the finite primes: the tail is exactly 1, and ρ_17 alone separates the classes.
TEST_CASE("proportional pairs get an exact tail", "[progression][constant]") {
  ProgressionPair pair(Family::parse("c9"), Progression{34, 25}, Family::parse("sc17"), Progression{102, 73});
  Certificate c = certify_pair(pair, CertifyOptions{});
  REQUIRE(c.verdict == Verdict::NonConvergent);
  CHECK(c.tail_exact);
  CHECK(c.Q == 17);
  // Its local factor at 17 is counted modulo 17^5 (v_17(X) = 4 on the class): about 35 s,
  // beyond verify's default limit, which refuses it before counting.
  CHECK_THROWS_WITH(verify_certificate(certificate_to_json(c)), Catch::Contains("--no-time-limit lifts it"));
}

TEST_CASE("an exact tail verifies; removing the argument is rejected", "[progression][constant][verify][slow]") {
  ProgressionPair pair(Family::parse("c9"), Progression{34, 25}, Family::parse("sc17"), Progression{102, 73});
  Certificate c = certify_pair(pair, CertifyOptions{});
  REQUIRE(c.verdict == Verdict::NonConvergent);
  nlohmann::json j = certificate_to_json(c);
  VerifyLimits unlimited;
  unlimited.max_count_seconds = 0;
  VerifyReport r = verify_certificate(j, unlimited);
  for (const auto& f : r.failures) UNSCOPED_INFO(f);
  CHECK(r.ok());
  REQUIRE(j["tail"]["route"] == "proportional");
  j["tail"]["route"] = "bound";
  j["tail"].erase("lambda");
  j["tail"].erase("discriminant_product");
  VerifyReport bad = verify_certificate(j, unlimited);
  std::string all;
  for (const auto& f : bad.failures) all += f + "\n";
  CHECK_FALSE(bad.ok());
  CHECK_THAT(all, Catch::Contains("/tail/log_bound: stored"));
}
