// `circlet certify F G --ap A,B --ap2 A2,B2 [-o cert.json]`: decide whether
// F(A n + B) / G(A' n + B') converges and write a certificate that `circlet
// verify` re-checks (MATH.md §7; src/progression/certify.hpp).
#include <iostream>
#include <memory>

#include "cli/command.hpp"
#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "family/progression.hpp"
#include "progression/certificate.hpp"
#include "progression/certify.hpp"

namespace circlet::cli {

namespace {

struct CertifyCliOptions {
  std::string F, G, ap, ap2, output, qmax = "47", prec = "128";
};

void run_certify(const CertifyCliOptions& o) {
  Family f = Family::parse(o.F), g = Family::parse(o.G);
  Progression ap = o.ap.empty() ? Progression{} : Progression::parse(o.ap);
  Progression ap2 = o.ap2.empty() ? Progression{} : Progression::parse(o.ap2);
  if (ap.A > kCertMaxStep || ap.B > kCertMaxStep || ap2.A > kCertMaxStep || ap2.B > kCertMaxStep)
    throw UserError("a certificate's progressions need A, B <= 10^12 (docs/certificate-format.md)");
  ProgressionPair pair(f, ap, g, ap2);
  CertifyOptions opt;
  opt.Q_max = static_cast<ulong>(parse_nonnegative("--qmax", o.qmax, 1000));
  if (opt.Q_max < 3) throw UserError("--qmax must be at least 3");
  opt.prec = parse_nonnegative("--prec", o.prec, kCertMaxPrecision);  // the certificate format's limit
  if (opt.prec < 64) throw UserError("--prec must be at least 64 bits");
  Certificate c = certify_pair(pair, opt);
  std::string text = certificate_to_json(c).dump(2) + "\n";
  OutputSink sink(o.output);
  sink.stream() << text;
  sink.finish();
  if (sink.to_file()) {
    std::cerr << f.name() << "(" << ap.A << "n+" << ap.B << ") vs " << g.name() << "(" << ap2.A << "n+" << ap2.B
              << "): " << verdict_name(c.verdict) << " -- " << c.reason << "\n";
  }
}

const Registration registration{CommandSpec{
    "certify", 60, [](CLI::App& app) {
      auto o = std::make_shared<CertifyCliOptions>();
      auto* cmd = app.add_subcommand(
          "certify", "certify NON-CONVERGENT / CONSTANT / UNDECIDED for F(A n+B) / G(A' n+B') and write a certificate");
      cmd->add_option("F", o->F, "first family, e.g. c6")->required();
      cmd->add_option("G", o->G, "second family of the same weight, e.g. sc11")->required();
      cmd->add_option("--ap", o->ap, "progression A,B of F (default 1,0)");
      cmd->add_option("--ap2", o->ap2, "progression A2,B2 of G (default 1,0)");
      cmd->add_option("--qmax", o->qmax, "largest prime pinned exactly (default 47)");
      cmd->add_option("--prec", o->prec, "working precision in bits (default 128)");
      cmd->add_option("-o,--output", o->output, "write the certificate to FILE (atomically) instead of standard output");
      cmd->callback([o]() { run_certify(*o); });
    }}};

}  // namespace

}  // namespace circlet::cli
