// `circlet scan --t 6..T --modulus M [--pair F:G] [--shard i/k] [--threads N] [--resume] -o DIR` and
// `circlet scan-merge DIR... -o OUT` (src/scan/).
#include <sys/stat.h>

#include <cstdio>
#include <iostream>
#include <memory>

#include "cli/command.hpp"
#include "core/error.hpp"
#include "scan/scan_job.hpp"
#include "scan/scan_output.hpp"
#include "scan/scan_plan.hpp"
#include "scan/scan_runner.hpp"

namespace circlet::cli {

namespace {

struct ScanCliOptions {
  std::string t = "6..12", modulus, shard = "0/1", output, compare_to = "1000", qmax = "47", prec = "128",
              prec_max = "512", pair = "ct:sc2t-1", threads = "0";
  bool resume = false, verify = false, progress = false, no_csv = false;
};

std::string hms(double s) {
  long t = static_cast<long>(s + 0.5);
  char buf[32];
  std::snprintf(buf, sizeof buf, "%ld:%02ld:%02ld", t / 3600, (t / 60) % 60, t % 60);
  return buf;
}

void run_scan_command(const ScanCliOptions& o) {
  ScanSettings s;
  ScanSpec::parse_t_range(o.t, &s.spec.t_lo, &s.spec.t_hi);
  if (o.modulus.empty()) throw UserError("--modulus M is required (progressions with A, A2 <= M)");
  s.spec.M = parse_nonnegative("--modulus", o.modulus, 64);
  if (s.spec.M < 1) throw UserError("--modulus must be at least 1");
  s.spec.pair = FamilyPair::parse(o.pair);
  s.spec.validate();
  s.compare_K = parse_nonnegative("--compare-to", o.compare_to, 1000000);
  bool any_exact = false;
  for (int t = s.spec.t_lo; t <= s.spec.t_hi; ++t) any_exact |= !scan_uses_certificates(s.spec.pair.F.at(t).rank());
  if (any_exact && s.compare_K < 2)
    throw UserError("--compare-to must be at least 2 when the scan has pairs of weight <= 2 (one n fixes the constant, "
                    "the others test it; with fewer nothing is compared)");
  s.certify.Q_max = static_cast<ulong>(parse_nonnegative("--qmax", o.qmax, 1000));
  if (s.certify.Q_max < 3) throw UserError("--qmax must be at least 3");
  s.certify.prec = parse_nonnegative("--prec", o.prec, 100000);
  if (s.certify.prec < 64) throw UserError("--prec must be at least 64 bits");
  s.certify.prec_max = parse_nonnegative("--prec-max", o.prec_max, 100000);
  if (s.certify.prec_max < s.certify.prec) throw UserError("--prec-max must be at least --prec");
  s.verify = o.verify;
  ShardSpec shard = ShardSpec::parse(o.shard);
  ScanRunOptions ro;
  ro.threads = static_cast<int>(parse_nonnegative("--threads", o.threads, 256));
  ro.resume = o.resume;
  ro.csv = !o.no_csv;
  if (o.output.empty()) throw UserError("-o DIR is required (the results database and summaries go there)");
  struct stat st;
  if (::stat(o.output.c_str(), &st) != 0) {
    if (::mkdir(o.output.c_str(), 0755) != 0) throw UserError("cannot create directory " + o.output);
  } else if (!S_ISDIR(st.st_mode)) {
    throw UserError(o.output + " exists and is not a directory");
  }
  const bool tty = stderr_is_terminal();
  if (tty || o.progress) {
    auto last_line = std::make_shared<double>(-1e9);
    ro.progress = [tty, last_line](const ScanProgress& p) {
      // On a terminal one line rewritten in place; otherwise (--progress into a
      // log) a line every 10 s.
      if (!tty && p.seconds - *last_line < 10 && p.done < p.total) return;
      *last_line = p.seconds;
      const double rate = p.seconds > 0 ? p.computed / p.seconds : 0.0;
      const long left = p.total - p.done;
      std::fprintf(stderr, "%scirclet scan: %ld/%ld jobs (%.1f%%)  %.1f jobs/s  ETA %s%s", tty ? "\r\033[K" : "",
                   p.done, p.total, p.total ? 100.0 * p.done / p.total : 100.0, rate,
                   rate > 0 ? hms(left / rate).c_str() : "?", tty ? "" : "\n");
      std::fflush(stderr);
    };
  }
  ScanRunReport r = run_scan(s, shard, o.output, ro);
  if (tty) std::fprintf(stderr, "\r\033[K");
  for (const auto& n : r.notes) std::cerr << "circlet scan: resume: " << n << "\n";
  if (r.dropped + r.corrected > 0)
    std::cerr << "circlet scan: resume: " << r.dropped << " stored rows dropped and recomputed, " << r.corrected
              << " corrected after recomputation\n";
  std::cerr << "circlet scan: " << r.owned << " jobs (" << r.computed << " computed now on " << r.threads
            << " threads, " << r.from_db << " from the database) in " << r.seconds << " s; results in " << o.output
            << "/scan.db\n";
}

struct MergeCliOptions {
  std::vector<std::string> dirs;
  std::string output;
  bool no_csv = false;
};

const Registration scan_registration{CommandSpec{
    "scan", 62, [](CLI::App& app) {
      auto o = std::make_shared<ScanCliOptions>();
      auto* cmd = app.add_subcommand("scan", "verdicts for two families (default c_t vs sc_{2t-1}) on all progression pairs with A, A2 <= M");
      cmd->add_option("--t", o->t, "range of t, e.g. 6..9 (default 6..12; weight <= 2: exact comparisons instead of certificates)");
      cmd->add_option("--modulus", o->modulus, "largest A and A2")->required();
      cmd->add_option("--pair", o->pair, "the families F:G as functions of t, e.g. ct:sc2t-1 (default), ct:sqt-1, c6:sq5 (equal weight)");
      cmd->add_option("--shard", o->shard, "i/k: only jobs with index = i mod k (default 0/1)");
      cmd->add_option("--threads", o->threads, "worker threads (default 0: one per core)");
      cmd->add_flag("--verify", o->verify, "re-check every certificate independently (counting mod p^j, other precision)");
      cmd->add_flag("--resume", o->resume, "continue the scan recorded in DIR/scan.db");
      cmd->add_flag("--progress", o->progress, "report progress on stderr even when it is not a terminal");
      cmd->add_flag("--no-csv", o->no_csv, "do not export scan.csv (the database holds every row)");
      cmd->add_option("--compare-to", o->compare_to, "weight <= 2: compare exact counts for n = 0..K (default 1000)");
      cmd->add_option("--qmax", o->qmax, "largest prime pinned by certificates (default 47)");
      cmd->add_option("--prec", o->prec, "first working precision in bits (default 128)");
      cmd->add_option("--prec-max", o->prec_max, "overlaps caused by precision are retried at 2x, 4x ... up to this (default 512)");
      cmd->add_option("-o,--output", o->output, "output directory (scan.db, summary.txt, summary.json, scan.csv)")->required();
      cmd->callback([o]() { run_scan_command(*o); });
    }}};

const Registration merge_registration{CommandSpec{
    "scan-merge", 63, [](CLI::App& app) {
      auto o = std::make_shared<MergeCliOptions>();
      auto* cmd = app.add_subcommand("scan-merge", "join the databases of the k shards of a scan, checking every job appears once");
      cmd->add_option("dirs", o->dirs, "shard output directories (or their scan.db files)")->required();
      cmd->add_option("-o,--output", o->output, "output directory (must not be one of the inputs)")->required();
      cmd->add_flag("--no-csv", o->no_csv, "do not export scan.csv");
      cmd->callback([o]() {
        merge_scan_databases(o->dirs, o->output, !o->no_csv);
        std::cerr << "circlet scan-merge: " << o->dirs.size() << " shards joined into " << o->output << "/scan.db\n";
      });
    }}};

}  // namespace

}  // namespace circlet::cli
