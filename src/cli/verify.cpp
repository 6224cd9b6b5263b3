// `circlet verify cert.json`: re-check a certificate independently
// (src/progression/verify.hpp). Exit status 0 only when every claim holds, 1 otherwise.
#include <cstdlib>
#include <iostream>
#include <memory>

#include "cli/command.hpp"
#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "circlet/version.hpp"
#include "modform/proof.hpp"
#include "progression/certificate.hpp"
#include "progression/verify.hpp"

namespace circlet::cli {

namespace {

struct VerifyCliOptions {
  std::string path;
  bool verbose = false;
};

void run_verify(const VerifyCliOptions& o) {
  std::string text = read_file(o.path);
  nlohmann::json j;
  try {
    j = nlohmann::json::parse(text);
  } catch (const nlohmann::json::exception& e) {
    throw UserError(o.path + " is not JSON: " + e.what());
  }
  if (j.is_object() && j.contains("format") && j["format"] == kProofCertificateFormat) {  // src/modform/proof.hpp
    ProofVerifyReport pr = verify_proof_certificate(j);
    for (const auto& s : pr.failures) std::cout << "FAILED: " << s << "\n";
    std::cout << o.path << (pr.ok() ? ": proof certificate verified (" + std::to_string(pr.checked.size()) + " checks)\n"
                                    : ": proof certificate REJECTED\n") << std::flush;
    if (!pr.ok()) std::exit(1);
    return;
  }
  // Not a certificate at all, or one from another program version: bad input (status 2),
  // before any claim is checked. Edited claims are a failed verification (status 1).
  if (!j.is_object() || !j.contains("format") || j["format"] != kCertificateFormat)
    throw UserError(o.path + " is not a certificate (no \"format\": \"" + std::string(kCertificateFormat) + "\")");
  if (!j.contains("provenance") || !j["provenance"].is_object() || !j["provenance"].contains("version") ||
      j["provenance"]["version"] != kVersion)
    throw UserError(o.path + ": certificate written by circlet version " +
                    (j.contains("provenance") && j["provenance"].is_object() && j["provenance"].contains("version")
                         ? (j["provenance"]["version"].is_string() ? j["provenance"]["version"].get<std::string>()
                                                                   : j["provenance"]["version"].dump())
                         : std::string("(none)")) +
                    ", this is version " + kVersion + "; re-run certify with this version");
  VerifyReport r = verify_certificate(j);
  if (o.verbose)
    for (const auto& s : r.checked) std::cout << "ok: " << s << "\n";
  for (const auto& s : r.failures) std::cout << "FAILED: " << s << "\n";
  if (r.ok()) {
    std::cout << o.path << ": certificate verified (" << r.checked.size() << " checks, verdict "
              << j.value("verdict", std::string("?")) << ")\n";
  } else {
    std::cout << o.path << ": certificate REJECTED (" << r.failures.size() << " failed checks)\n";
    std::cout.flush();
    std::exit(1);
  }
}

const Registration registration{CommandSpec{
    "verify", 61, [](CLI::App& app) {
      auto o = std::make_shared<VerifyCliOptions>();
      auto* cmd = app.add_subcommand("verify", "re-check a certificate written by `circlet certify`; exit 0 only if every claim holds");
      cmd->add_option("certificate", o->path, "certificate JSON file")->required();
      cmd->add_flag("-v,--verbose", o->verbose, "list every check that passed");
      cmd->callback([o]() { run_verify(*o); });
    }}};

}  // namespace

}  // namespace circlet::cli
