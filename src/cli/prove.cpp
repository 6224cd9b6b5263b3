// `circlet prove "RELATION" [-o CERT.json]`: prove an identity or congruence between
// counts along progressions by Sturm's bound (src/modform/proof.hpp); the syntax is in
// src/modform/relation.hpp. Exit status 0: PROVED; 1: REFUTED or UNKNOWN; 2: bad input.
#include <cstdlib>
#include <iostream>
#include <memory>

#include "cli/command.hpp"
#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "modform/proof.hpp"
#include "modform/relation.hpp"

namespace circlet::cli {

namespace {

struct ProveOptions {
  std::string relation;
  std::string output;
};

void run_prove(const ProveOptions& o) {
  const LinearRelation rel = parse_relation(o.relation);
  std::unique_ptr<OutputSink> sink;
  if (!o.output.empty()) sink = std::make_unique<OutputSink>(o.output);  // an unwritable path fails first
  ProofResult r = prove_relation(rel);
  std::cout << "relation: " << rel.str() << "\n";
  if (r.certificate.contains("space")) {
    long L = r.certificate["alignment"]["L"].get<long>();
    std::cout << "form:     " << r.space.str() << ", index " << r.index.str() << "\n";
    std::cout << "bound:    " << r.certificate["bound_rule"].get<std::string>() << "\n";
    std::cout << "          m <= " << r.bound.str() << " with " << r.certificate["alignment"]["m_of_n"].get<std::string>()
              << " (L = " << L << ")\n";
  }
  std::cout << "checked:  n = 0.." << r.n_checked << ", coefficients " << r.coefficient_digest << "\n";
  std::cout << proof_verdict_name(r.verdict) << ": " << r.reason << "\n";
  if (sink) {
    sink->stream() << r.certificate.dump(2) << "\n";
    sink->finish();
    std::cout << "certificate: " << o.output << "\n";
  }
  std::cout.flush();
  if (r.verdict != ProofVerdict::Proved) std::exit(1);
}

const Registration registration{CommandSpec{
    "prove", 62, [](CLI::App& app) {
      auto o = std::make_shared<ProveOptions>();
      auto* cmd = app.add_subcommand(
          "prove",
          "prove a relation such as \"c4(7n+2) = 2*sc7(8n+1) for n mod 7 != 4\" or \"c5(5n+4) == 0 mod 5\" "
          "by Sturm's bound; exit 0 only when PROVED");
      cmd->add_option("relation", o->relation, "the relation (quote it)")->required();
      cmd->add_option("-o,--output", o->output, "write the proof certificate (JSON) to this file");
      cmd->callback([o]() { run_prove(*o); });
    }}};

}  // namespace

}  // namespace circlet::cli
