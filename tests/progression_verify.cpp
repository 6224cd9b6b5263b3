#include "progression/verify.hpp"

#include <catch2/catch.hpp>
#include <sys/wait.h>
#include <unistd.h>

#include <cstdio>
#include <fstream>
#include <functional>
#include <string>

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
       }, "class 1, p = 2: residue mod 2^"},
      {"a residue beyond the modulus", [](nlohmann::json& j) { j["classes"][1]["residue"] = j["modulus"]; },
       "is not in [0, modulus)"},
      {"a local factor", [](nlohmann::json& j) { j["classes"][0]["local_factors"][0]["beta_G"] = "7/8"; },
       "local factor beta_G is 7/8 in the certificate, counting mod p^j"},
      {"a factor rho", [](nlohmann::json& j) { j["classes"][1]["local_factors"][1]["rho"] = "1/3"; }, "rho is not beta_F/beta_G"},
      {"the pinned product", [](nlohmann::json& j) { j["classes"][1]["pinned_product"] = "2"; }, "pinned_product 2 differs"},
      {"an interval", [](nlohmann::json& j) {
         j["classes"][0]["limit_interval"]["mid"] = "3*2^0";
       }, "class 1 limit_interval: stored"},
      {"a widened interval", [](nlohmann::json& j) {
         j["classes"][1]["limit_interval"]["rad"] = "1*2^10";
       }, "class 2 limit_interval: stored"},
      {"the tail bound", [](nlohmann::json& j) { j["tail"]["log_bound"]["mid"] = "1*2^-20"; }, "tail.log_bound: stored"},
      {"the verdict", [](nlohmann::json& j) { j["verdict"] = "CONSTANT"; }, "verdict CONSTANT: the sequences are not identical"},
      {"the verdict to UNDECIDED", [](nlohmann::json& j) { j["verdict"] = "UNDECIDED"; },
       "verdict UNDECIDED disagrees with the recomputed verdict NON-CONVERGENT"},
      {"the version", [](nlohmann::json& j) { j["provenance"]["version"] = "0.0.1"; },
       "certificate written by circlet version 0.0.1"},
      {"the modulus", [](nlohmann::json& j) { j["modulus"] = "7"; }, "is not the product of modulus_factors"},
      {"the primes pinned", [](nlohmann::json& j) { j["Q"] = 5; }, "modulus_factors must list every prime q <= Q = 5"},
      {"a progression", [](nlohmann::json& j) { j["ap"]["B"] = 0; }, "counting mod p^j"},
      {"the theorems", [](nlohmann::json& j) { j.erase("theorems"); }, "must name the theorems"},
      {"a ball's syntax", [](nlohmann::json& j) { j["tail"]["interval"]["mid"] = "1.5"; }, "is not of the form m*2^e"},
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
