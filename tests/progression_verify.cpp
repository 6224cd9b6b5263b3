#include "progression/verify.hpp"

#include <catch2/catch.hpp>
#include <sys/wait.h>
#include <unistd.h>

#include <cstdio>
#include <fstream>
#include <functional>
#include <string>

#include "core/error.hpp"
#include "progression/certify.hpp"

using namespace circlet;

namespace {
nlohmann::json good_certificate() {
  ProgressionPair pair(Family::parse("c7"), Progression{2, 1}, Family::parse("sc13"), Progression{3, 2});
  return certificate_to_json(certify_pair(pair, CertifyOptions{}));
}

std::string all_failures(const VerifyReport& r) {
  std::string s;
  for (const auto& f : r.failures) s += f + "\n";
  return s;
}
}  // namespace

TEST_CASE("an untouched certificate verifies", "[progression][verify]") {
  VerifyReport r = verify_certificate(good_certificate());
  INFO(all_failures(r));
  CHECK(r.ok());
}

TEST_CASE("each kind of tampering is rejected, naming what failed", "[progression][verify]") {
  const nlohmann::json good = good_certificate();
  struct Tamper {
    const char* what;
    std::function<void(nlohmann::json&)> edit;
    const char* message;
  };
  const std::vector<Tamper> tampers = {
      {"a residue", [](nlohmann::json& j) {
         Fmpz r = Fmpz::from_str(j["classes"][0]["residue"].get<std::string>());
         fmpz_add_ui(r, r, 1);
         j["classes"][0]["residue"] = r.str();
       }, "/classes/0/local_factors/0/residue:"},
      {"a residue beyond the modulus", [](nlohmann::json& j) { j["classes"][1]["residue"] = j["modulus"]; },
       "is not in [0, modulus)"},
      {"a local factor", [](nlohmann::json& j) { j["classes"][0]["local_factors"][0]["beta_G"] = "7/8"; },
       "local factor beta_G is 7/8 in the certificate, counting mod p^j"},
      {"a factor rho", [](nlohmann::json& j) { j["classes"][1]["local_factors"][1]["rho"] = "1/3"; }, "/classes/1/local_factors/1/rho: is not beta_F/beta_G"},
      {"the pinned product", [](nlohmann::json& j) { j["classes"][1]["pinned_product"] = "2"; }, "/classes/1/pinned_product: 2 differs"},
      {"an interval", [](nlohmann::json& j) {
         j["classes"][0]["limit_interval"]["mid"] = "3*2^0";
       }, "/classes/0/limit_interval: stored"},
      {"a widened interval", [](nlohmann::json& j) {
         j["classes"][1]["limit_interval"]["rad"] = "1*2^10";
       }, "/classes/1/limit_interval: stored"},
      {"the tail bound", [](nlohmann::json& j) { j["tail"]["log_bound"]["mid"] = "1*2^-20"; }, "/tail/log_bound: stored"},
      {"the verdict to UNDECIDED", [](nlohmann::json& j) {
         for (const char* k : {"Q", "distinguishing_prime", "modulus", "modulus_factors", "sigma_constant",
                               "power_factor", "tail", "classes", "disjoint"})
           j.erase(k);
         j["verdict"] = "UNDECIDED";
         j["theorems"] = nlohmann::json::array();
         j["digest"] = certificate_digest(j);
       }, "/verdict: UNDECIDED disagrees with the recomputed verdict NON-CONVERGENT"},
      {"the digest", [](nlohmann::json& j) { j["digest"] = "sha256:" + std::string(64, '0'); }, "/digest: sha256:0000"},
      {"the command", [](nlohmann::json& j) { j["provenance"]["command"] = "circlet certify c7 sc13"; },
       "/provenance/command: is not the certify command"},
      {"the distinguishing prime", [](nlohmann::json& j) { j["distinguishing_prime"] = 3; },
       "differs from the other class's factor at a prime other than distinguishing_prime"},
      {"the modulus", [](nlohmann::json& j) { j["modulus"] = "7"; }, "is not the product of modulus_factors"},
      {"the primes pinned", [](nlohmann::json& j) { j["Q"] = 5; }, "/modulus_factors: must list every prime q <= Q = 5"},
      {"a progression", [](nlohmann::json& j) { j["ap"]["B"] = 0; }, "counting mod p^j"},
      {"a theorem left out", [](nlohmann::json& j) { j["theorems"].erase(2); }, "/theorems: must be exactly"},
  };
  for (const auto& t : tampers) {
    nlohmann::json j = good;
    t.edit(j);
    VerifyReport r = verify_certificate(j);
    INFO("tampered: " << t.what << "\n" << all_failures(r));
    CHECK_FALSE(r.ok());
    CHECK_THAT(all_failures(r), Catch::Contains(t.message));
  }
}

TEST_CASE("malformed certificates are refused before any claim, naming the field", "[progression][verify]") {
  const nlohmann::json good = good_certificate();
  const std::string text = good.dump();
  struct Bad {
    std::string text;
    const char* message;
  };
  auto edited = [&](const std::function<void(nlohmann::json&)>& f) {
    nlohmann::json j = good;
    f(j);
    j["digest"] = certificate_digest(j);  // a consistent digest: the reader must still refuse
    return j.dump();
  };
  const std::vector<Bad> bad = {
      {"{\"format\":\"circlet-certificate/2\",\"format\":\"x\"}", "/format: duplicate key 'format'"},
      {text.substr(0, text.size() - 1) + ",\"Q\":3}", "/Q: duplicate key 'Q'"},
      {edited([](nlohmann::json& j) { j["modulus_factors"][0]["e"] = -1; }), "/modulus_factors/0/e: -1 is negative"},
      {edited([](nlohmann::json& j) { j["modulus_factors"][0]["e"] = 1000000000; }),
       "/modulus_factors/0/e: 1000000000 is out of range 0..64"},
      {edited([](nlohmann::json& j) { j["Q"] = 1ULL << 62; }), "/Q: 4611686018427387904 is out of range 2..47"},
      {edited([](nlohmann::json& j) { j["Q_max"] = 1ULL << 62; }), "/Q_max: 4611686018427387904 is out of range 3..1000"},
      {edited([](nlohmann::json& j) { j["classes"][0]["limit_interval"]["rad"] = "1*2^1000000000"; }),
       "/classes/0/limit_interval/rad: exponent 1000000000"},
      {edited([](nlohmann::json& j) { j["tail"]["interval"]["mid"] = "1.5"; }), "/tail/interval/mid: '1.5' is not of the form m*2^e"},
      {edited([](nlohmann::json& j) { j["tail"]["interval"]["mid"] = "2*2^0"; }), "/tail/interval/mid: the mantissa of m*2^e must be odd"},
      {edited([](nlohmann::json& j) { j["reason"] = "anything"; }), "/reason: unknown field"},
      {edited([](nlohmann::json& j) { j["classes"][0].erase("pinned_product"); }), "/classes/0: missing field 'pinned_product'"},
      {edited([](nlohmann::json& j) { j["classes"][1]["pinned_product"] = "2/4"; }), "/classes/1/pinned_product: '2/4' is not"},
      {edited([](nlohmann::json& j) { j["precision_bits"] = 128.0; }), "/precision_bits: the number 128.0 is not an integer"},
      {edited([](nlohmann::json& j) { j["theorems"][0] = "fermat"; }), "/theorems/0: 'fermat' is not a theorem of the catalogue"},
      {edited([](nlohmann::json& j) { j["verdict"] = "CONSTANT"; }), "missing field 'constant_route'"},
      {edited([](nlohmann::json& j) { j["provenance"]["version"] = "0.0.1"; }), "certificate written by circlet version 0.0.1"},
      {edited([](nlohmann::json& j) { j["provenance"]["date"] = "2026-02-30T00:00:00Z"; }), "/provenance/date:"},
      {std::string(200, '[') + std::string(200, ']'), "nested deeper than 16 levels"},
  };
  for (const auto& b : bad) {
    INFO(b.text.substr(0, 300));
    bool threw = false;
    try {
      (void)verify_certificate_text(b.text);
    } catch (const UserError& e) {
      threw = true;
      CHECK_THAT(std::string(e.what()), Catch::Contains(b.message));
    }
    CHECK(threw);
  }
}

TEST_CASE("circlet verify exits 0 on a good certificate and 1 on a tampered one", "[progression][verify][cli]") {
  const std::string dir = "/tmp/circlet_verify_test_" + std::to_string(::getpid());
  std::system(("mkdir -p " + dir).c_str());
  const std::string cert = dir + "/cert.json";
  std::string cmd = std::string(CIRCLET_BINARY) + " certify c8 sc15 --ap 4,1 --ap2 2,0 -o " + cert + " 2>/dev/null";
  REQUIRE(std::system(cmd.c_str()) == 0);
  CHECK(WEXITSTATUS(std::system((std::string(CIRCLET_BINARY) + " verify " + cert + " >/dev/null").c_str())) == 0);
  nlohmann::json j = nlohmann::json::parse(std::ifstream(cert));
  j["classes"][0]["local_factors"][0]["beta_F"] = "3/4";
  std::ofstream(dir + "/bad.json") << j.dump(2);
  std::string out = dir + "/out.txt";
  int rc = std::system((std::string(CIRCLET_BINARY) + " verify " + dir + "/bad.json >" + out).c_str());
  CHECK(WEXITSTATUS(rc) == 1);
  std::ifstream in(out);
  std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  CHECK_THAT(text, Catch::Contains("local factor beta_F is 3/4") && Catch::Contains("REJECTED"));
  // Different weights on the command line: a clear error, status 2.
  rc = std::system((std::string(CIRCLET_BINARY) + " certify c6 sc13 2>" + out).c_str());
  CHECK(WEXITSTATUS(rc) == 2);
  std::ifstream in2(out);
  std::string err((std::istreambuf_iterator<char>(in2)), std::istreambuf_iterator<char>());
  CHECK_THAT(err, Catch::Contains("c6 has weight 5/2 but sc13 has weight 3"));
  std::system(("rm -rf " + dir).c_str());
}
