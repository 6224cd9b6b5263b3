// `circlet verify cert.json`: re-check a certificate independently
// (src/progression/verify.hpp). Exit status 0 only when every claim holds, 1 otherwise.
#include <cstdlib>
#include <filesystem>
#include <iostream>
#include <memory>

#include "cli/command.hpp"
#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "progression/certificate.hpp"
#include "progression/certificate_reader.hpp"
#include "progression/verify.hpp"

namespace circlet::cli {

namespace {

struct VerifyCliOptions {
  std::string path;
  bool verbose = false;
  bool no_time_limit = false;
};

void run_verify(const VerifyCliOptions& o) {
  {
    std::error_code ec;
    if (std::filesystem::is_regular_file(o.path, ec) && std::filesystem::file_size(o.path, ec) > kCertMaxBytes)
      throw UserError(o.path + " is larger than " + std::to_string(kCertMaxBytes) + " bytes, the limit for a certificate");
  }
  const std::string text = read_file(o.path);
  // Malformed input (docs/certificate-format.md §1): UserError naming the field, status 2.
  // A well-formed certificate whose digest or claims fail: status 1.
  VerifyReport r;
  try {
    VerifyLimits limits;
    if (o.no_time_limit) limits.max_count_seconds = 0;
    r = verify_certificate_text(text, limits);
  } catch (const UserError& e) {
    throw UserError(o.path + ": " + e.what());
  }
  if (o.verbose)
    for (const auto& s : r.checked) std::cout << "ok: " << s << "\n";
  for (const auto& s : r.failures) std::cout << "FAILED: " << s << "\n";
  if (r.ok()) {
    for (const auto& s : r.summary) std::cout << s << "\n";
    std::cout << o.path << ": certificate verified (" << r.checked.size() << " checks)\n";
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
      cmd->add_flag("-v,--verbose", o->verbose, "list every check that passed, with the theorems relied on");
      cmd->add_flag("--no-time-limit", o->no_time_limit,
                    "count local factors even when the estimated counting time exceeds 6 s");
      cmd->callback([o]() { run_verify(*o); });
    }}};

}  // namespace

}  // namespace circlet::cli
