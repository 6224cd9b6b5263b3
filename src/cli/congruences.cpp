// `circlet congruences --t 2..12 --amax 50 --lmax 13 -o DIR`: search F(An+B) ≡ 0
// (mod ℓ^k) for c_t and sc_t, then prove each minimal hit (src/modform/congruence_search.hpp).
// Writes DIR/congruences.csv (every candidate and its verdict), DIR/THEOREMS.md (the
// proved ones, stated as theorems) and DIR/certificates/<name>.json (one per PROVED hit,
// re-checked by `circlet verify`). Progress lines go to standard error.
#include <sys/stat.h>

#include <chrono>
#include <cstdio>
#include <iostream>
#include <memory>
#include <sstream>

#include "circlet/version.hpp"
#include "cli/command.hpp"
#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "core/provenance.hpp"
#include "family/progression.hpp"
#include "modform/congruence_search.hpp"
#include "scan/scan_plan.hpp"

namespace circlet::cli {

namespace {

struct CongruenceOptions {
  std::string t = "2..12";
  std::string amax = "50", lmax = "13", kmax = "6", test_n = "200";
  std::string output;
};

std::string file_name(const CongruenceHit& h) {
  std::string s = h.family.name() + "_" + std::to_string(h.A) + "n+" + std::to_string(h.B);
  s += h.ell ? "_mod" + std::to_string(h.ell) + "^" + std::to_string(h.k) : std::string("_zero");
  return s + ".json";
}

void run_congruences(const CongruenceOptions& o) {
  CongruenceSearchSpec spec;
  ScanSpec::parse_t_range(o.t, &spec.t_lo, &spec.t_hi);
  if (spec.t_hi > 24) throw UserError("--t: the congruence search takes t <= 24");
  spec.A_max = parse_nonnegative("--amax", o.amax, 200);
  if (spec.A_max < 1) throw UserError("--amax must be at least 1");
  spec.ell_max = parse_nonnegative("--lmax", o.lmax, 100);
  if (spec.ell_max < 2) throw UserError("--lmax must be at least 2");
  spec.k_max = static_cast<int>(parse_nonnegative("--kmax", o.kmax, 20));
  if (spec.k_max < 1) throw UserError("--kmax must be at least 1");
  spec.test_n = parse_nonnegative("--test-n", o.test_n, 100000);
  if (spec.test_n < 10) throw UserError("--test-n must be at least 10");
  spec.proof.max_m = 400000;
  if (o.output.empty()) throw UserError("-o DIR is required");
  ::mkdir(o.output.c_str(), 0777);
  const std::string certdir = o.output + "/certificates";
  ::mkdir(certdir.c_str(), 0777);
  struct stat st;
  if (::stat(certdir.c_str(), &st) != 0 || !S_ISDIR(st.st_mode)) throw UserError("cannot write " + certdir);

  auto last = std::chrono::steady_clock::now() - std::chrono::seconds(10);
  auto hits = search_congruences(spec, [&last](const std::string& what, double f) {
    auto now = std::chrono::steady_clock::now();
    if (now - last < std::chrono::seconds(1) && f < 1.0) return;
    last = now;
    std::fprintf(stderr, "circlet congruences: %5.1f%% %s\n", 100.0 * f, what.c_str());
  });

  const Provenance prov = Provenance::now(command_line());
  std::ostringstream csv, md;
  csv << prov.csv_comment() << "family,A,B,ell,k,relation,verdict,space,sturm_bound,n_checked,certificate,reason\n";
  md << "# Congruences F(An+B) == 0 (mod l^k) and vanishing progressions, proved\n\n"
     << "Found by `" << prov.command_line << "` (circlet " << kVersion << ", " << prov.date_utc << ").\n"
     << "Each theorem below holds for every n >= 0. Its proof is the certificate named beside it: the "
        "generating function as an eta quotient, the operators taking it to one modular form with its level and "
        "character, the Sturm bound, and the exact coefficients checked up to it (`circlet verify FILE` re-checks "
        "all of it). See docs/MATH.md §8.\n\n";
  long proved = 0, refuted = 0, unknown = 0;
  for (const auto& h : hits) {
    std::string cert;
    if (h.proof.verdict == ProofVerdict::Proved) {
      ++proved;
      cert = "certificates/" + file_name(h);
      write_file_atomically(o.output + "/" + cert, h.proof.certificate.dump() + "\n");  // compact: many files
      std::string stmt = h.ell ? h.family.name() + "(" + std::to_string(h.A) + "n+" + std::to_string(h.B) +
                                     ") ≡ 0 (mod " + std::to_string(h.ell) + (h.k > 1 ? "^" + std::to_string(h.k) : "") + ")"
                               : h.family.name() + "(" + std::to_string(h.A) + "n+" + std::to_string(h.B) + ") = 0";
      md << "- **Theorem.** " << stmt << " for all n >= 0. Form in " << h.proof.space.str() << ", Sturm bound "
         << h.proof.bound.str() << "; certificate `" << cert << "`.\n";
    } else if (h.proof.verdict == ProofVerdict::Refuted) {
      ++refuted;
    } else {
      ++unknown;
    }
    csv << h.family.name() << "," << h.A << "," << h.B << "," << h.ell << "," << h.k << ",\"" << h.relation << "\","
        << proof_verdict_name(h.proof.verdict) << ",\"" << h.proof.space.str() << "\"," << h.proof.bound.str() << ","
        << h.proof.n_checked << "," << cert << ",\"" << h.proof.reason << "\"\n";
  }
  md << "\n" << proved << " proved, " << refuted << " refuted beyond the search range, " << unknown
     << " unknown (see congruences.csv).\n";
  write_file_atomically(o.output + "/congruences.csv", csv.str());
  write_file_atomically(o.output + "/THEOREMS.md", md.str());
  std::cout << hits.size() << " candidates: " << proved << " PROVED, " << refuted << " REFUTED, " << unknown
            << " UNKNOWN; written to " << o.output << "\n";
}

const Registration registration{CommandSpec{
    "congruences", 63, [](CLI::App& app) {
      auto o = std::make_shared<CongruenceOptions>();
      auto* cmd = app.add_subcommand("congruences",
                                     "search F(An+B) == 0 mod l^k for c_t, sc_t and prove each minimal hit by Sturm's bound");
      cmd->add_option("--t", o->t, "range of t (default 2..12)");
      cmd->add_option("--amax", o->amax, "largest A (default 50)");
      cmd->add_option("--lmax", o->lmax, "largest prime l (default 13)");
      cmd->add_option("--kmax", o->kmax, "largest power k tried (default 6)");
      cmd->add_option("--test-n", o->test_n, "candidates must hold for n = 0..N (default 200)");
      cmd->add_option("-o,--output", o->output, "output directory")->required();
      cmd->callback([o]() { run_congruences(*o); });
    }}};

}  // namespace

}  // namespace circlet::cli
