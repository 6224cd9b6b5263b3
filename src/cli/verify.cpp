// `circlet verify cert.json`: re-check a certificate independently
// (src/progression/verify.hpp). Exit status 0 only when every claim holds, 1 otherwise.
#include <cstdlib>
#include <iostream>
#include <memory>

#include "cli/command.hpp"
#include "core/atomic_file.hpp"
#include "core/error.hpp"
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
