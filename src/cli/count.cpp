// `circlet count FAMILY (--to N | --at N | --ap A,B --to K) [--json] [-o FILE]`:
// exact counts from the series engine (src/series/), as CSV or JSON.
#include <chrono>
#include <climits>
#include <cstdio>
#include <iostream>
#include <memory>
#include <string>

#include <nlohmann/json.hpp>

#include "cli/command.hpp"
#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "core/progress_line.hpp"
#include "core/provenance.hpp"
#include "family/family.hpp"
#include "family/progression.hpp"
#include "series/eta_series.hpp"

namespace circlet::cli {

namespace {

struct CountOptions {
  std::string family;
  std::string to, at, ap;
  bool json = false;
  std::string output;
};

std::string eta_quotient_text(const EtaQuotient& q) {
  std::string s;
  for (const auto& f : q) {
    if (!s.empty()) s += " ";
    s += "E(q^" + std::to_string(f.d) + ")^" + std::to_string(f.e);
  }
  return s.empty() ? "1" : s;
}

void run_count(const CountOptions& opt) {
  const Family family = Family::parse(opt.family);
  const RowSelection sel = RowSelection::parse(opt.to, opt.at, opt.ap);
  const bool has_ap = sel.progression;
  const long n_max = sel.n_max, rows = sel.count;
  const std::string form = has_ap ? "ap" : (opt.at.empty() ? "to" : "at");

  SeriesPlan plan = plan_family_series(family, n_max);
  check_resources(plan);

  // Open the output before the long computation so that an unwritable path fails fast.
  OutputSink sink(opt.output);

  IntegerSeries series;
  {
    ProgressLine line("count");  // rate in coefficients 0..N per second
    series = compute_series(plan, [&line, n_max](const std::string& stage, double f) {
      line.update(stage, f, (long)(f * (double)(n_max + 1)));
    });
  }

  std::ostream& out = sink.stream();
  const Provenance prov = Provenance::now(command_line());
  std::string buf;
  buf.reserve(1 << 20);
  auto flush_if_big = [&]() {
    if (buf.size() >= (1u << 20)) {
      out.write(buf.data(), static_cast<std::streamsize>(buf.size()));
      buf.clear();
    }
  };
  auto n_of = [&sel](long i) { return sel.n_of(i); };

  if (opt.json) {
    nlohmann::json head;
    head["provenance"] = prov.to_json();
    head["family"] = family.name();
    head["description"] = family.description();
    head["generating_function"] = eta_quotient_text(plan.quotient) + "  (E(x) = prod_{k>=1} (1 - x^k))";
    head["form"] = form;
    if (has_ap) {
      head["A"] = sel.prog.A;
      head["B"] = sel.prog.B;
      head["K"] = rows - 1;
    } else {
      head["N"] = n_max;
    }
    head["method"] = {{"bound", plan.bound.method},
                      {"bound_bits", static_cast<long>(fmpz_bits(plan.bound.bound.get()))},
                      {"fft_primes", plan.primes},
                      {"reconstruction", plan.bound.nonnegative ? "CRT in [0, M)" : "CRT in (-M/2, M/2]"}};
    head["columns"] = has_ap ? nlohmann::json{"k", "n", "count"} : nlohmann::json{"n", "count"};
    std::string h = head.dump(2);
    // Append the rows by hand: counts are exact integers of any size, written as
    // JSON strings like every exact value of every command (docs/data-files.md).
    h.erase(h.find_last_of('}'));
    while (!h.empty() && (h.back() == '\n' || h.back() == ' ')) h.pop_back();
    buf += h;
    buf += ",\n  \"rows\": [";
    for (long i = 0; i < rows; ++i) {
      buf += i ? ",\n    [" : "\n    [";
      if (has_ap) {
        buf += std::to_string(i);
        buf += ',';
      }
      buf += std::to_string(n_of(i));
      buf += ',';
      buf += '"';
      append_decimal(buf, series.at(n_of(i)));
      buf += "\"]";
      flush_if_big();
    }
    buf += "\n  ]\n}\n";
  } else {
    buf += prov.csv_comment();  // on standard output too: a redirected table keeps its provenance
    buf += has_ap ? "k,n,count\n" : "n,count\n";
    for (long i = 0; i < rows; ++i) {
      if (has_ap) {
        buf += std::to_string(i);
        buf += ',';
      }
      buf += std::to_string(n_of(i));
      buf += ',';
      append_decimal(buf, series.at(n_of(i)));
      buf += '\n';
      flush_if_big();
    }
  }
  out.write(buf.data(), static_cast<std::streamsize>(buf.size()));
  sink.finish();
}

const Registration registration{CommandSpec{
    "count", 10, [](CLI::App& app) {
      auto opt = std::make_shared<CountOptions>();
      auto* cmd = app.add_subcommand("count", "exact counts c_t(n), sc_t(n), r_S(n) from the generating function");
      cmd->add_option("family", opt->family, "family: c<T> (t-cores), sc<T> (self-conjugate t-cores), sq<S> (sums of S squares)")
          ->required();
      cmd->add_option("--to", opt->to, "all n = 0..N (with --ap: k = 0..K)");
      cmd->add_option("--at", opt->at, "the single value n = N");
      cmd->add_option("--ap", opt->ap, "progression A,B: rows n = A*k+B for k = 0..K (needs --to K)");
      cmd->add_flag("--json", opt->json, "JSON output with provenance instead of CSV");
      cmd->add_option("-o,--output", opt->output, "write to FILE (atomically) instead of standard output");
      cmd->callback([opt]() { run_count(*opt); });
    }}};

}  // namespace

}  // namespace circlet::cli
