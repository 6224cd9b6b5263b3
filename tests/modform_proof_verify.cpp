// Tests of the strict reading of proof certificates by verify_proof_certificate
// (src/modform/proof.hpp; docs/proof-certificate-format.md): every field of the
// committed certificate results/proofs/gks_c5.json either re-derived or checked, an
// unknown or missing field named, the provenance command checked against the relation.
// Every edit below re-seals the digest, so only the content checks can catch it.
#include <catch2/catch.hpp>

#include <fstream>
#include <sstream>

#include "modform/proof.hpp"

using namespace circlet;

namespace {

nlohmann::json committed(const std::string& name) {
  std::ifstream in(std::string(CIRCLET_SOURCE_DIR) + "/results/proofs/" + name);
  REQUIRE(in);
  std::stringstream ss;
  ss << in.rdbuf();
  return nlohmann::json::parse(ss.str());
}

nlohmann::json resealed(nlohmann::json c) {
  c["digest"] = proof_certificate_digest(c);
  return c;
}

// The failures of an edited certificate, one line; empty when it was accepted.
std::string failures(const nlohmann::json& c) {
  ProofVerifyReport r = verify_proof_certificate(c);
  std::string s;
  for (const auto& f : r.failures) s += f + "; ";
  return s;
}

}  // namespace

TEST_CASE("a committed proof certificate is accepted as written", "[modform]") {
  for (const char* name : {"gks_c5.json", "c4_sc7_restricted.json"}) {
    INFO(name);
    CHECK(failures(committed(name)).empty());
  }
}

TEST_CASE("an unknown or a missing top-level field of a proof certificate is named", "[modform]") {
  const nlohmann::json c = committed("gks_c5.json");
  nlohmann::json a = c;
  a["note"] = "proved by hand";
  CHECK_THAT(failures(resealed(a)), Catch::Contains("/note: unknown field"));
  for (const char* key : {"theorems", "reason", "provenance", "checked", "sturm_bound"}) {
    nlohmann::json b = c;
    b.erase(key);
    INFO(key);
    CHECK_THAT(failures(resealed(b)), Catch::Contains(std::string("/") + key + ": missing field"));
  }
  // A counterexample on a PROVED certificate is a recomputation mismatch.
  nlohmann::json d = c;
  d["counterexample"] = {{"n", 0}, {"values", {"1"}}, {"left_side", "1"}};
  CHECK_THAT(failures(resealed(d)), Catch::Contains("/counterexample"));
}

TEST_CASE("every text of a proof certificate is compared with the one the checks generate", "[modform]") {
  const nlohmann::json c = committed("gks_c5.json");
  nlohmann::json a = c;
  a["reason"] = a["reason"].get<std::string>() + " (and by hand)";
  CHECK_THAT(failures(resealed(a)), Catch::Contains("/reason"));
  nlohmann::json b = c;
  b["theorems"].erase(b["theorems"].begin());
  CHECK_THAT(failures(resealed(b)), Catch::Contains("/theorems"));
  nlohmann::json d = c;
  d["bound_rule"] = "Hecke (1940)";
  CHECK_THAT(failures(resealed(d)), Catch::Contains("/bound_rule"));
  nlohmann::json e = c;
  e["space"]["space"] = "M_2(Gamma0(5), trivial)";
  CHECK_THAT(failures(resealed(e)), Catch::Contains("/space"));
  // The relation must be written as verify writes it back (one spelling per relation).
  nlohmann::json f = c;
  f["relation"] = " " + f["relation"].get<std::string>();
  CHECK_THAT(failures(resealed(f)), Catch::Contains("/relation: not in the canonical spelling"));
}

TEST_CASE("the provenance of a proof certificate names a command that writes this proof", "[modform]") {
  const nlohmann::json c = committed("gks_c5.json");
  auto with_command = [&](const std::string& cmd) {
    nlohmann::json a = c;
    a["provenance"]["command"] = cmd;
    return failures(resealed(a));
  };
  const std::string rel = c["relation"].get<std::string>();
  CHECK(with_command("circlet prove '" + rel + "'").empty());
  CHECK(with_command("circlet prove '" + rel + "' -o x.json").empty());
  CHECK_THAT(with_command("circlet prove 'c5(5n+4) == 0 mod 25'"), Catch::Contains("/provenance/command: the command proves"));
  CHECK_THAT(with_command("circlet certify c5 sc9 --ap 1,0 --ap2 1,0"), Catch::Contains("does not write proof certificates"));
  CHECK_THAT(with_command("pari 'c5(5n+4) == 0 mod 5'"), Catch::Contains("does not start with 'circlet'"));
  CHECK_THAT(with_command("circlet prove 'unterminated"), Catch::Contains("not a command line"));

  // A congruence-search certificate: its t, A and prime within the command's ranges.
  nlohmann::json k = committed("gks_c5.json");
  const std::string cong = "circlet congruences --t 2..12 --amax 50 --lmax 13 -o out";
  auto congruence = [&](const std::string& relation, const std::string& cmd) {
    nlohmann::json a = k;
    a["relation"] = relation;
    a["provenance"]["command"] = cmd;
    std::string f = failures(resealed(a));
    return f.substr(0, f.find("/modulus"));  // the recomputation differs for another relation
  };
  CHECK_THAT(congruence(rel, cong), !Catch::Contains("/provenance"));
  CHECK_THAT(congruence(rel, "circlet congruences --t 6..12 -o out"), Catch::Contains("outside the command's --t"));
  CHECK_THAT(congruence(rel, "circlet congruences --amax 4 -o out"), Catch::Contains("exceeds the command's --amax"));
  CHECK_THAT(congruence(rel, "circlet congruences --lmax 3 -o out"), Catch::Contains("exceeds the command's --lmax"));
  CHECK_THAT(congruence(rel, cong + " -o other"), Catch::Contains("-o given twice"));
  CHECK_THAT(congruence(rel, "circlet congruences --t 2..12"), Catch::Contains("takes one -o DIR"));
  CHECK_THAT(congruence(rel, "circlet congruences --quick -o out"), Catch::Contains("unknown argument --quick"));
  CHECK_THAT(with_command("circlet prove '" + rel + "' -o a.json -o b.json"), Catch::Contains("takes one -o FILE"));

  for (const auto& [field, value, msg] : std::vector<std::tuple<std::string, std::string, std::string>>{
           {"program", "kernel", "/provenance/program"},
           {"version", "0.1", "/provenance/version"},
           {"version", "0.1.1", "/provenance/version"},
           {"date", "2026-02-30T10:00:00Z", "/provenance/date"},
           {"date", "2026-12-02 14:27:11", "/provenance/date"}}) {
    nlohmann::json a = c;
    a["provenance"][field] = value;
    INFO(field << " = " << value);
    CHECK_THAT(failures(resealed(a)), Catch::Contains(msg));
  }
  nlohmann::json extra = c;
  extra["provenance"]["host"] = "node7";
  CHECK_THAT(failures(resealed(extra)), Catch::Contains("/provenance: must hold exactly"));
}
