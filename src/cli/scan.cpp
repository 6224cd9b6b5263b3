// `circlet scan --t 6..T --modulus M [--shard i/k] [--resume] -o DIR` and
// `circlet scan-merge DIR... -o OUT` (src/scan/).
#include <sys/stat.h>

#include <chrono>
#include <cstdio>
#include <iostream>
#include <memory>

#include "cli/command.hpp"
#include "core/error.hpp"
#include "scan/checkpoint.hpp"
#include "scan/scan_job.hpp"
#include "scan/scan_output.hpp"
#include "scan/scan_plan.hpp"

namespace circlet::cli {

namespace {

struct ScanCliOptions {
  std::string t = "6..12", modulus, shard = "0/1", output, compare_to = "1000", qmax = "47", prec = "128";
  bool resume = false, verify = false;
};

void run_scan(const ScanCliOptions& o) {
  ScanSettings s;
  ScanSpec::parse_t_range(o.t, &s.spec.t_lo, &s.spec.t_hi);
  if (o.modulus.empty()) throw UserError("--modulus M is required (progressions with A, A2 <= M)");
  s.spec.M = parse_nonnegative("--modulus", o.modulus, 64);
  if (s.spec.M < 1) throw UserError("--modulus must be at least 1");
  s.compare_K = parse_nonnegative("--compare-to", o.compare_to, 1000000);
  s.certify.Q_max = static_cast<ulong>(parse_nonnegative("--qmax", o.qmax, 1000));
  if (s.certify.Q_max < 3) throw UserError("--qmax must be at least 3");
  s.certify.prec = parse_nonnegative("--prec", o.prec, 100000);
  if (s.certify.prec < 64) throw UserError("--prec must be at least 64 bits");
  s.verify = o.verify;
  ShardSpec shard = ShardSpec::parse(o.shard);
  if (o.output.empty()) throw UserError("-o DIR is required (the checkpoint and results go there)");
  struct stat st;
  if (::stat(o.output.c_str(), &st) != 0) {
    if (::mkdir(o.output.c_str(), 0755) != 0) throw UserError("cannot create directory " + o.output);
  } else if (!S_ISDIR(st.st_mode)) {
    throw UserError(o.output + " exists and is not a directory");
  }
  nlohmann::json header = s.header();
  header["shard"] = shard.str();
  Checkpoint cp(o.output + "/checkpoint.jsonl", header, o.resume);
  header.erase("shard");

  ScanContext ctx(s);
  const long total = s.spec.job_count();
  long owned = 0;
  for (long j = shard.i; j < total; j += shard.k) ++owned;
  const bool progress = stderr_is_terminal();
  using Clock = std::chrono::steady_clock;
  auto start = Clock::now(), last = start;
  long done_now = 0, already = static_cast<long>(cp.done().size());
  for (long j = shard.i; j < total; j += shard.k) {
    if (cp.done().count(j)) continue;
    cp.append(run_scan_job(ctx, scan_job(s.spec, j)));
    ++done_now;
    if (progress) {
      auto now = Clock::now();
      if (now - last > std::chrono::milliseconds(250)) {
        last = now;
        double secs = std::chrono::duration<double>(now - start).count();
        std::fprintf(stderr, "\rcirclet scan: %ld/%ld jobs  %.1f jobs/s ", already + done_now, owned,
                     secs > 0 ? done_now / secs : 0.0);
        std::fflush(stderr);
      }
    }
  }
  if (progress) std::fprintf(stderr, "\r\033[K");
  std::vector<nlohmann::json> rows;
  for (const auto& [job, r] : cp.done()) rows.push_back(r);
  write_scan_outputs(o.output, header, shard.str(), std::move(rows), &ctx);
  double secs = std::chrono::duration<double>(Clock::now() - start).count();
  std::cerr << "circlet scan: " << owned << " jobs (" << done_now << " computed now, " << already
            << " from the checkpoint) in " << secs << " s; results in " << o.output << "/\n";
}

struct MergeCliOptions {
  std::vector<std::string> dirs;
  std::string output;
};

const Registration scan_registration{CommandSpec{
    "scan", 62, [](CLI::App& app) {
      auto o = std::make_shared<ScanCliOptions>();
      auto* cmd = app.add_subcommand("scan", "verdicts for c_t vs sc_{2t-1} on all progression pairs with A, A2 <= M");
      cmd->add_option("--t", o->t, "range of t (default 6..12; t <= 5: exact comparisons instead of certificates)");
      cmd->add_option("--modulus", o->modulus, "largest A and A2")->required();
      cmd->add_option("--shard", o->shard, "i/k: only jobs with index = i mod k (default 0/1)");
      cmd->add_flag("--verify", o->verify, "re-check every certificate independently (counting mod p^j, other precision)");
      cmd->add_flag("--resume", o->resume, "continue the scan recorded in DIR/checkpoint.jsonl");
      cmd->add_option("--compare-to", o->compare_to, "t <= 5: compare exact counts for n = 0..K (default 1000)");
      cmd->add_option("--qmax", o->qmax, "largest prime pinned by certificates (default 47)");
      cmd->add_option("--prec", o->prec, "precision in bits (default 128)");
      cmd->add_option("-o,--output", o->output, "output directory (checkpoint, scan.csv, scan.json, summary.txt)")->required();
      cmd->callback([o]() { run_scan(*o); });
    }}};

const Registration merge_registration{CommandSpec{
    "scan-merge", 63, [](CLI::App& app) {
      auto o = std::make_shared<MergeCliOptions>();
      auto* cmd = app.add_subcommand("scan-merge", "join the outputs of the k shards of a scan, checking every job appears once");
      cmd->add_option("dirs", o->dirs, "shard output directories")->required();
      cmd->add_option("-o,--output", o->output, "output directory")->required();
      cmd->callback([o]() {
        merge_scan_outputs(o->dirs, o->output);
        std::cerr << "circlet scan-merge: " << o->dirs.size() << " shards joined into " << o->output << "/\n";
      });
    }}};

}  // namespace

}  // namespace circlet::cli
