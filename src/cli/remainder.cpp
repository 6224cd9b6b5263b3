// `circlet remainder FAMILY --to N` and `circlet remainder FAMILY --ap A,B --to K`:
// E(n) = count(n) − M(n) (exact counts from src/series/, main terms from
// src/mainterm/), normalised by X^{(w−1)/2} and X^{w/2}, with summary
// statistics, an empirical growth fit and, where known, a certified bound.
#include <climits>
#include <cmath>
#include <iostream>
#include <memory>
#include <sstream>
#include <string>

#include <nlohmann/json.hpp>

#include "arcs/certified_bound.hpp"
#include "arcs/remainder.hpp"
#include "cli/command.hpp"
#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "core/progress_line.hpp"
#include "core/provenance.hpp"
#include "core/resource_guard.hpp"
#include "family/family.hpp"
#include "family/progression.hpp"
#include "mainterm/main_term.hpp"
#include "mainterm/main_term_batch.hpp"
#include "quadratic/model.hpp"
#include "series/eta_series.hpp"

namespace circlet::cli {

namespace {

// Largest prime of the batched Euler product for odd rank ≥ 7 (as `main --to`).
constexpr ulong kTableMaxPrime = 500000;

struct RemainderOptions {
  std::string family;
  std::string to, ap;
  std::string prec = "128", digits = "12";
  bool json = false;
  bool quiet = false;
  std::string output;
};

// Largest K (rows k = 0..K, i.e. K + 1 rows), the same bound as `main --to`.
constexpr long kMaxK = 1000000;

// A ball as "[mid +/- rad]" with `digits` digits of the midpoint even where the
// radius is large (ARB_STR_MORE); reading it back gives a ball containing x.
std::string ball_text(const Arb& x, slong digits) { return x.str(digits, ARB_STR_MORE); }

std::string fixed(double x, int decimals) {
  std::ostringstream o;
  o.setf(std::ios::fixed);
  o.precision(decimals);
  o << x;
  return o.str();
}

void run_remainder(const RemainderOptions& opt) {
  const Family family = Family::parse(opt.family);
  const slong prec = parse_int_in_range("--prec", opt.prec, 32, 100000);
  const slong dg = parse_int_in_range("--digits", opt.digits, 1, 1000);
  const QuadraticModel model = quadratic_model(family);
  if (model.rank < 2)
    throw UserError("family " + family.name() + " has rank " + std::to_string(model.rank) + ": no main term");

  // The rows: n = 0..N, or n = A·k + B for k = 0..K; n with X = n + Δ ≤ 0 are skipped.
  const RowSelection sel = RowSelection::parse(opt.to, "", opt.ap, /*allow_at=*/false);
  const bool has_ap = sel.progression;
  const long K = sel.count - 1, n_max = sel.n_max;
  // Every row is kept in memory (about 0.7 KB each) for the summary: cap the table.
  if (K > kMaxK)
    throw UserError("--to: at most " + std::to_string(kMaxK + 1) + " rows (--to " + std::to_string(kMaxK) +
                    "); thin the range out with --ap A,B");
  std::vector<long> ks;
  std::vector<Fmpz> ns;
  for (long k = 0; k <= K; ++k) {
    const long n = sel.n_of(k);
    if (fmpq_sgn(model.X(Fmpz(n)).get()) <= 0) continue;
    ks.push_back(k);
    ns.emplace_back(n);
  }
  if (ns.empty()) throw UserError("no n in the range has X = n + Delta > 0");

  {
    // Cost model (measured, 2 cores): the remainder table's per-run cost grows like r^4
    // in the rank (0.2 s at c200, 2.3 s at c400; r^4 errs on the safe side) and like prec^1.6
    // per row; with the shared main-term table a row costs about 1e-5 s (c9, 10^5 rows: 1.2 s CPU).
    ResourceEstimate e;
    e.what = "remainder for " + family.name() + " (rank " + std::to_string(model.rank) + ") with " +
             std::to_string(ns.size()) + " rows";
    const double scale = std::max(1.0, double(prec) / 128.0);
    e.seconds = 2.3 * std::pow(double(model.rank) / 400.0, 4.0) * scale +
                double(ns.size()) * 2e-5 * std::pow(scale, 1.6);
    e.bytes = double(ns.size()) * 700.0;
    e.reason = "time grows like rank^4 and rows x prec^1.6";
    require_resources(e);
  }
  SeriesPlan plan = plan_family_series(family, n_max);
  check_resources(plan);
  OutputSink sink(opt.output);
  IntegerSeries series;
  {
    ProgressLine line("remainder");
    series = compute_series(plan, [&line, n_max](const std::string& stage, double f) {
      line.update(stage, f, (long)(f * (double)(n_max + 1)));
    });
  }
  std::vector<Fmpz> counts;
  counts.reserve(ns.size());
  for (const auto& n : ns) counts.push_back(series.value(fmpz_get_si(n.get())));

  // All main terms at once (main_term_batch.hpp: exact rows on two threads, one
  // pass over the primes for odd rank ≥ 7, truncated for the printed --digits):
  // linear in the number of rows.
  const long first = has_ap ? sel.prog.B : 0, step = has_ap ? sel.prog.A : 1;
  std::vector<TableMainTerm> mt;
  {
    ProgressLine line("remainder");
    mt = main_term_table(model, first, step, K + 1, (slong)(dg * 3.3219280948873623) + 10, kTableMaxPrime,
                         prec, {}, [&line, K](double f) { line.update("main terms", f, (long)(f * (double)(K + 1))); });
  }
  auto M = [&](const Fmpz& n) {
    const TableMainTerm& t = mt[(fmpz_get_si(n.get()) - first) / step];
    CIRCLET_ASSERT(t.valid, "remainder: no main term for a row with X > 0");
    MainTermValue v;
    v.ball = t.ball;
    v.exact = t.exact;
    return v;
  };
  const RemainderTable table = remainder_table(model, ns, counts, M, prec);
  const RemainderSummary& s = table.summary;
  auto cert = certified_remainder_bound(family);

  nlohmann::json summary;
  summary["rows"] = s.rows;
  summary["identically_zero"] = s.identically_zero;
  summary["deligne_exponent"] = s.deligne_exponent;
  summary["hecke_exponent"] = s.hecke_exponent;
  summary["scales"] = "E/X^((w-1)/2) (Deligne scale, integral weight) and E/X^(w/2) (Hecke scale), X = n + Delta";
  summary["max_abs_deligne"] = ball_text(s.max_abs_deligne, dg);
  summary["argmax_deligne"] = s.argmax_deligne.str();
  summary["max_abs_hecke"] = ball_text(s.max_abs_hecke, dg);
  summary["argmax_hecke"] = s.argmax_hecke.str();
  summary["mean_square_deligne"] = ball_text(s.mean_square_deligne, dg);
  nlohmann::json fit;
  fit["label"] = "empirical (not a bound)";
  fit["ok"] = s.fit.ok;
  fit["exponent"] = s.fit.exponent;
  fit["std_error"] = s.fit.std_error;
  fit["blocks"] = s.fit.points.size();
  fit["note"] = s.fit.note;
  summary["fit"] = fit;
  if (cert)
    summary["certified_bound"] = {{"statement", cert->statement()},
                                  {"source", cert->source()},
                                  {"rows_not_proved", s.certified_violations}};

  std::ostream& out = sink.stream();
  const Provenance prov = Provenance::now(command_line(), prec);
  if (opt.json) {
    nlohmann::json j;
    j["provenance"] = prov.to_json();
    j["family"] = family.name();
    j["rank"] = model.rank;
    j["delta"] = model.delta.str();
    if (has_ap) j["ap"] = sel.prog.str();
    j["summary"] = summary;
    nlohmann::json rows = nlohmann::json::array();
    for (size_t i = 0; i < table.rows.size(); ++i) {
      const auto& r = table.rows[i];
      nlohmann::json row;
      if (has_ap) row["k"] = ks[i];
      row["n"] = r.n.str();
      row["X"] = r.X.str();
      row["count"] = r.count.str();
      row["main_term"] = ball_text(r.main.ball, dg);
      row["main_term_exact"] = r.main.exact ? r.main.exact->str() : std::string();
      row["remainder"] = ball_text(r.remainder, dg);
      row["remainder_exact"] = r.remainder_exact ? r.remainder_exact->str() : std::string();
      row["E_deligne"] = ball_text(r.deligne, dg);
      row["E_hecke"] = ball_text(r.hecke, dg);
      if (r.certified_bound) {
        row["certified_bound"] = r.certified_bound->str();
        row["within_bound"] = r.within_certified_bound;
      }
      rows.push_back(std::move(row));
    }
    j["rows"] = rows;
    out << j.dump(2) << "\n";
  } else {
    out << prov.csv_comment();  // on standard output too: a redirected table keeps its provenance
    out << (has_ap ? "k," : "") << "n,X,count,main_term,main_term_exact,remainder,remainder_exact,E_deligne,E_hecke"
        << (cert ? ",certified_bound,within_bound" : "") << "\n";
    for (size_t i = 0; i < table.rows.size(); ++i) {
      const auto& r = table.rows[i];
      if (has_ap) out << ks[i] << ",";
      out << r.n.str() << "," << r.X.str() << "," << r.count.str() << "," << ball_text(r.main.ball, dg) << ","
          << (r.main.exact ? r.main.exact->str() : "") << "," << ball_text(r.remainder, dg) << ","
          << (r.remainder_exact ? r.remainder_exact->str() : "") << "," << ball_text(r.deligne, dg) << ","
          << ball_text(r.hecke, dg);
      if (r.certified_bound) out << "," << r.certified_bound->str() << "," << (r.within_certified_bound ? "yes" : "no");
      out << "\n";
    }
  }
  sink.finish();
  // The summary goes to stderr for CSV output (the CSV itself stays a plain table).
  if (!opt.json && !opt.quiet) {
    std::cerr << "summary: " << s.rows << " rows, remainder " << (s.identically_zero ? "identically 0" : "not identically 0")
              << "\n  max |E/X^((w-1)/2)| = " << ball_text(s.max_abs_deligne, 6) << " at n = " << s.argmax_deligne.str()
              << "\n  max |E/X^(w/2)|     = " << ball_text(s.max_abs_hecke, 6) << " at n = " << s.argmax_hecke.str()
              << "\n  mean square of E/X^((w-1)/2) = " << ball_text(s.mean_square_deligne, 6) << "\n";
    if (s.fit.ok)
      std::cerr << "  growth exponent (empirical, " << s.fit.points.size() << " dyadic blocks): |E| ~ X^"
                << fixed(s.fit.exponent, 3) << " +/- " << fixed(s.fit.std_error, 3) << "; Deligne (w-1)/2 = "
                << fixed(s.deligne_exponent, 2) << ", Hecke w/2 = " << fixed(s.hecke_exponent, 2) << "\n";
    else
      std::cerr << "  growth exponent: no fit (" << s.fit.note << ")\n";
    if (cert)
      std::cerr << "  certified: " << cert->statement() << " -- "
                << (s.certified_violations == 0 ? "proved for every row" : "NOT proved for some rows") << "\n";
  }
}

const Registration registration{CommandSpec{
    "remainder", 45, [](CLI::App& app) {
      auto opt = std::make_shared<RemainderOptions>();
      auto* cmd = app.add_subcommand("remainder",
                                     "remainder E(n) = count - main term, normalised, with summary and growth fit");
      cmd->add_option("family", opt->family, "family: c<T> (t-cores), sc<T> (self-conjugate t-cores), sq<S> (sums of S squares)")->required();
      cmd->add_option("--to", opt->to, "all n = 0..N (with --ap: k = 0..K)");
      cmd->add_option("--ap", opt->ap, "progression A,B: rows n = A*k+B for k = 0..K (needs --to K)");
      cmd->add_option("--prec", opt->prec, "working precision in bits (default 128)");
      cmd->add_option("--digits", opt->digits, "decimal digits of printed balls (default 12)");
      cmd->add_flag("--json", opt->json, "JSON output (rows, summary, fit) with provenance instead of CSV");
      cmd->add_flag("-q,--quiet", opt->quiet, "CSV: do not print the summary on standard error");
      cmd->add_option("-o,--output", opt->output, "write to FILE (atomically) instead of standard output");
      cmd->callback([opt]() { run_remainder(*opt); });
    }}};

}  // namespace

}  // namespace circlet::cli
