// `circlet main FAMILY (--at N | --to N | --ap A,B --to K) [--digits D] [--explain]
//                      [--json] [-o FILE]`:
// the circle-method main term M(n) (src/mainterm/main_term.hpp), exact or as a
// certified ball, next to the exact count (series engine) and the remainder.
#include <dirent.h>
#include <poll.h>
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <chrono>
#include <cstdlib>
#include <functional>
#include <optional>
#include <vector>
#include <climits>
#include <iostream>
#include <memory>
#include <sstream>
#include <string>

#include <nlohmann/json.hpp>

#include "cli/command.hpp"
#include "cli/private_factoring.hpp"
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

#include <flint/fmpz_factor.h>

namespace circlet::cli {

namespace {

// A single count is computed from the series when n is at most this (cheap: well under a second).
constexpr long kCheapCountN = 200000;
// Largest prime of the batched Euler product in tables (odd rank ≥ 5).
constexpr ulong kTableMaxPrime = 500000;

struct MainOptions;
long digits_of(const MainOptions& o);

struct MainOptions {
  std::string family;
  std::string to, at, ap;
  std::string digits = "15";
  bool explain = false;
  bool json = false;
  bool no_count = false;
  double class_number_steps = 3e8;
  double l_value_terms = 4e7;
  double factor_timeout = 60;
  std::string output;
};

long digits_of(const MainOptions& o) { return parse_int_in_range("--digits", o.digits, 1, 1000); }

slong bits_for_digits(long digits) { return (slong)(digits * 3.3219280948873623) + 20; }

// The main term as text: the exact rational, or the ball (which reads back to a ball containing M(n)).
std::string main_text(const MainTerm& m, long digits) {
  if (m.exact) return m.exact->str();
  // Out of reach: an infinite ball, never "nan" (it reads back as a ball containing M(n)).
  if (!arb_is_finite(m.ball.get())) return "[+/- inf]";
  return m.ball.str(digits + 2);
}

// count − M(n) as text: exact rational, or a ball.
std::string remainder_text(const Fmpz& count, const MainTerm& m, long digits, slong prec) {
  if (m.exact) {
    Fmpq r(count);
    fmpq_sub(r.get(), r.get(), m.exact->get());
    return r.str();
  }
  Arb r;
  arb_set_fmpz(r, count.get());
  arb_sub(r, r, m.ball, prec);
  if (!arb_is_finite(r.get())) return "[+/- inf]";
  return r.str(digits + 2);
}

nlohmann::json parts_json(const MainTerm& m, long digits) {
  const MainTermParts& p = m.parts;
  nlohmann::json j;
  j["X"] = p.X.str();
  j["rank"] = p.rank;
  j["weight"] = Fmpq(p.rank, 2).str();
  j["det_S"] = p.det_gram.str();
  j["sigma_inf"] = p.sigma_inf.str(digits + 2);
  j["character_discriminant"] = p.discriminant.str();
  j["cofactor_g"] = p.cofactor.str();
  j["L_argument"] = p.L_argument;
  j["L_value"] = p.L_value.str(digits + 2);
  if (p.L_rational) j["L_rational_R"] = p.L_rational->str();
  j["L_route"] = p.L_route;
  j["correction_C"] = p.correction.str();
  nlohmann::json sp = nlohmann::json::array();
  for (const auto& s : p.special)
    sp.push_back({{"p", fmpz_fits_si(s.p.get()) ? nlohmann::json(fmpz_get_si(s.p.get())) : nlohmann::json(s.p.str())},
                  {"v_p(X)", s.valuation}, {"beta_p", s.beta.str()}, {"chi(p)", s.chi},
                  {"correction", s.correction.str()}});
  j["special_primes"] = sp;
  return j;
}

void print_explain(std::ostream& out, const MainTerm& m, long digits) {
  const MainTermParts& p = m.parts;
  const bool even = p.rank % 2 == 0;
  out << "parts:\n";
  out << "  X = n + Delta         " << p.X.str() << "\n";
  out << "  rank r, weight r/2    " << p.rank << ", " << Fmpq(p.rank, 2).str() << "\n";
  out << "  det S                 " << p.det_gram.str() << "\n";
  out << "  sigma_inf(X)          " << p.sigma_inf.str(digits + 2) << "\n";
  out << "  character             Kronecker symbol (" << p.discriminant.str() << "/.)"
      << (even ? " (fixed by the family)" : " (from D = (-1)^k det S X)") << "\n";
  out << "  L-value               L(" << p.L_argument << ", chi) = " << p.L_value.str(digits + 2) << "\n";
  if (p.L_rational)
    out << "                        = R pi^" << p.L_argument << "/sqrt(f), f = |" << p.discriminant.str()
        << "|, R = " << p.L_rational->str() << "\n";
  out << "  L route               " << p.L_route << "\n";
  out << "  product formula       "
      << (even ? "prod_p beta_p = C / L(w, chi)" : "prod_p beta_p = C L(k, chi) / zeta(2k)") << "\n";
  out << "  special primes        p, v_p(X), beta_p, chi(p), factor of C\n";
  for (const auto& s : p.special)
    out << "                        " << s.p.str() << ", " << s.valuation << ", " << s.beta.str() << ", " << s.chi << ", "
        << s.correction.str() << "\n";
  out << "  C                     " << p.correction.str() << "\n";
}

void run_single_direct(const MainOptions& opt, const Family& family, const QuadraticModel& model, std::ostream& out);

void run_single(const MainOptions& opt, const Family& family, const QuadraticModel& model, std::ostream& out) {
  const Fmpz n = parse_nonnegative_fmpz("--at", opt.at);
  check_main_term_input(model, n);
  require_resources(factoring_estimate(model, n, "the main term"));  // a refusal naming --allow-large
  if (!needs_private_factoring(model, n)) return run_single_direct(opt, family, model, out);
  if (stderr_is_terminal())
    std::cerr << "circlet main: factoring X (" << model.X(n).str().size() << " digits) in a private temporary "
              << "directory; giving up after " << opt.factor_timeout << " s (--factor-timeout)\n";
  auto r = run_in_private_child(
      [&] {
        std::ostringstream o;
        run_single_direct(opt, family, model, o);
        return o.str();
      },
      opt.factor_timeout);
  if (r && r->user_error) throw UserError(r->text);
  if (r) {
    out << r->text;
    return;
  }
  const std::string why = "unknown (X could not be factored in the time allowed: --factor-timeout " +
                          std::to_string((long)opt.factor_timeout) + " s)";
  if (opt.json) {
    nlohmann::json j;
    j["provenance"] = Provenance::now(command_line()).to_json();
    j["family"] = family.name();
    j["n"] = n.str();
    j["main"] = "unknown";
    j["main_status"] = why;
    j["certified"] = false;
    out << j.dump(2) << "\n";
    return;
  }
  out << "family      " << family.name() << " (" << family.description() << ")\n";
  out << "n           " << n.str() << "\n";
  out << "main term   " << why << "\n";
}

void run_single_direct(const MainOptions& opt, const Family& family, const QuadraticModel& model, std::ostream& out) {
  const Fmpz n = parse_nonnegative_fmpz("--at", opt.at);
  check_main_term_input(model, n);
  const bool cheap = !opt.no_count && fmpz_cmp_si(n.get(), kCheapCountN) <= 0;
  Fmpz count;
  if (cheap) count = family_series(family, fmpz_get_si(n.get())).value(fmpz_get_si(n.get()));

  MainTermOptions mo;
  mo.max_class_number_steps = opt.class_number_steps;
  mo.max_theta_terms = opt.l_value_terms;
  ProgressLine line("main");
  mo.theta_progress = [&line](double f) { line.update("L-value by the theta series", f); };
  CertifiedMainTerm c = main_term_certified(model, n, digits_of(opt), 4096, mo);
  line.finish();
  const MainTerm& m = c.term;
  std::string status = m.exact ? "exact rational"
                               : (c.certified ? "ball, " + std::to_string(digits_of(opt)) + " digits certified"
                                              : "ball: could not certify " + std::to_string(digits_of(opt)) +
                                                    " digits (stopped at " + std::to_string(c.prec) +
                                                    " bits; " + m.parts.L_route + ")");
  if (opt.json) {
    nlohmann::json j;
    j["provenance"] = Provenance::now(command_line(), c.prec).to_json();
    j["family"] = family.name();
    j["n"] = n.str();
    j["main"] = main_text(m, digits_of(opt));
    j["main_status"] = status;
    j["certified"] = c.certified;
    if (cheap) {
      j["count"] = count.str();
      j["remainder"] = remainder_text(count, m, digits_of(opt), c.prec);
    }
    if (opt.explain) j["parts"] = parts_json(m, digits_of(opt));
    out << j.dump(2) << "\n";
    return;
  }
  out << "family      " << family.name() << " (" << family.description() << ")\n";
  out << "n           " << n.str() << "\n";
  out << "main term   " << main_text(m, digits_of(opt)) << "   (" << status << ")\n";
  if (m.exact) {
    Arb b;
    arb_set_fmpq(b, m.exact->get(), bits_for_digits(digits_of(opt)));
    out << "            ~ " << b.str(digits_of(opt)) << "\n";
  }
  if (cheap) {
    out << "count       " << count.str() << "   (exact, series engine)\n";
    out << "remainder   " << remainder_text(count, m, digits_of(opt), c.prec) << "   (count - main term)\n";
  } else {
    out << "count       not computed (n > " << kCheapCountN << " or --no-count)\n";
  }
  if (opt.explain) print_explain(out, m, digits_of(opt));
}

void run_table(const MainOptions& opt, const Family& family, const QuadraticModel& model, std::ostream& out,
               bool /*to_file: the provenance line goes to files and standard output alike*/) {
  // --at (any size) is handled by run_single; tables are limited to 64-bit n.
  const RowSelection sel = RowSelection::parse(opt.to, "", opt.ap, /*allow_at=*/false);
  const bool has_ap = sel.progression;
  const long n_max = sel.n_max, rows = sel.count;
  auto n_of = [&sel](long i) { return sel.n_of(i); };
  IntegerSeries series;
  const bool with_count = !opt.no_count;
  if (with_count) {
    SeriesPlan plan = plan_family_series(family, n_max);
    check_resources(plan);
    series = compute_series(plan);
  }
  const slong prec = bits_for_digits(digits_of(opt));
  MainTermOptions mo;
  mo.with_parts = false;
  mo.max_class_number_steps = opt.class_number_steps;
  // Exact rows (even rank, weights 3/2 and 5/2) on two threads; odd rank ≥ 7 as balls
  // from one pass over the primes p ≤ kTableMaxPrime (main_term_batch.hpp).
  const slong bits = (slong)(digits_of(opt) * 3.3219280948873623) + 2;
  const std::vector<TableMainTerm> table =
      main_term_table(model, has_ap ? sel.prog.B : 0, has_ap ? sel.prog.A : 1, rows, bits, kTableMaxPrime, prec, mo);
  const Provenance prov = Provenance::now(command_line(), prec);
  const std::string main_col = "main";
  const std::string rem_col = "remainder";
  std::string buf;
  long short_rows = 0;
  nlohmann::json jrows = nlohmann::json::array();
  if (!opt.json) {
    buf += prov.csv_comment();  // on standard output too: a redirected table keeps its provenance
    buf += has_ap ? "k,n" : "n";
    if (with_count) buf += ",count";
    buf += "," + main_col;
    if (with_count) buf += "," + rem_col;
    buf += "\n";
  }
  for (long i = 0; i < rows; ++i) {
    const long n = n_of(i);
    Fmpz fn(n);
    std::string main_s, rem_s, count_s;
    Fmpq X = model.X(fn);
    if (fmpq_sgn(X.get()) <= 0) {
      main_s = "";
      rem_s = "";
    } else {
      const TableMainTerm& t = table[i];
      MainTerm m;
      m.exact = t.exact;
      m.ball = t.ball;
      if (!m.exact && arb_rel_accuracy_bits(m.ball) < (slong)(digits_of(opt) * 3.32)) ++short_rows;
      main_s = main_text(m, digits_of(opt));
      if (with_count) {
        Fmpz cnt;
        fmpz_set(cnt.get(), series.at(n));
        rem_s = remainder_text(cnt, m, digits_of(opt), prec);
      }
    }
    if (with_count) {
      count_s.clear();
      append_decimal(count_s, series.at(n));
    }
    if (opt.json) {
      nlohmann::json r;
      if (has_ap) r["k"] = i;
      r["n"] = n;
      if (with_count) r["count"] = count_s;
      r[main_col] = main_s;
      if (with_count) r[rem_col] = rem_s;
      jrows.push_back(std::move(r));
    } else {
      if (has_ap) buf += std::to_string(i) + ",";
      buf += std::to_string(n);
      if (with_count) buf += "," + count_s;
      buf += "," + main_s;
      if (with_count) buf += "," + rem_s;
      buf += "\n";
      if (buf.size() > (1u << 20)) {
        out << buf;
        buf.clear();
      }
    }
  }
  if (short_rows > 0)
    std::cerr << "circlet main: note: " << short_rows << " rows have fewer than " << digits_of(opt)
              << " certified digits (their balls are still rigorous; for odd rank >= 7 the Euler product of large tables "
                 "stops at p <= "
              << kTableMaxPrime << "; main --at N certifies more)\n";
  if (opt.json) {
    nlohmann::json j;
    j["provenance"] = prov.to_json();
    j["rows_below_requested_digits"] = short_rows;
    j["family"] = family.name();
    j["certified"] = true;
    j["rows"] = std::move(jrows);
    out << j.dump(2) << "\n";
  } else {
    out << buf;
  }
}

void run_main(const MainOptions& opt) {
  const Family family = Family::parse(opt.family);
  const bool has_to = !opt.to.empty(), has_at = !opt.at.empty(), has_ap = !opt.ap.empty();
  if (has_to && has_at) throw UserError("give either --to N or --at N, not both");
  if (has_ap && !has_to) throw UserError("--ap A,B needs --to K (the progression is A*k+B for k = 0..K)");
  if (!has_to && !has_at) throw UserError("give --at N, --to N or --ap A,B --to K");
  digits_of(opt);  // --digits 1..1000, by the one integer parser
  if (!(opt.factor_timeout > 0)) throw UserError("--factor-timeout must be a positive number of seconds");
  if (opt.explain && !has_at) throw UserError("--explain is for a single value (--at N)");
  const QuadraticModel model = quadratic_model(family);
  if (model.rank < 2)
    throw UserError("the main term needs rank ≥ 2, but " + family.name() + " has rank " + std::to_string(model.rank));
  OutputSink sink(opt.output);
  if (has_at)
    run_single(opt, family, model, sink.stream());
  else
    run_table(opt, family, model, sink.stream(), sink.to_file());
  sink.finish();
}

const Registration registration{CommandSpec{
    "main", 20, [](CLI::App& app) {
      auto opt = std::make_shared<MainOptions>();
      auto* cmd = app.add_subcommand("main", "circle-method main term M(n): exact rational or certified ball, with count and remainder");
      cmd->add_option("family", opt->family,
                      "family: c<T> (t-cores), sc<T> (self-conjugate t-cores), sq<S> (sums of S squares)")
          ->required();
      cmd->add_option("--at", opt->at, "a single n (any size)");
      cmd->add_option("--to", opt->to, "table of n = 0..N (with --ap: k = 0..K)");
      cmd->add_option("--ap", opt->ap, "progression A,B: rows n = A*k+B, k = 0..K (needs --to K)");
      cmd->add_option("--digits", opt->digits, "significant digits to certify for balls, 1..1000 (default 15)");
      cmd->add_flag("--explain", opt->explain, "print the parts: X, sigma_inf, character, L-value, special primes");
      cmd->add_flag("--no-count", opt->no_count, "do not compute exact counts");
      cmd->add_option("--factor-timeout", opt->factor_timeout,
                      "seconds allowed for factoring a large X (default 60); then the main term is unknown");
      cmd->add_option("--class-number-steps", opt->class_number_steps,
                      "weight 3/2: largest class-number sieve (about sqrt(|D|/3) steps; default 3e8, a few seconds)");
      cmd->add_option("--l-value-terms", opt->l_value_terms,
                      "weight >= 7/2: largest theta series for an exact L(k, chi) above conductor 2e6 "
                      "(default 4e7 terms, about 15 s on two cores); above it the L-value is an Euler-product ball");
      cmd->add_flag("--json", opt->json, "JSON output with provenance instead of text/CSV");
      cmd->add_option("-o,--output", opt->output, "write to FILE (atomically) instead of standard output");
      cmd->callback([opt]() { run_main(*opt); });
    }}};

}  // namespace

}  // namespace circlet::cli
