// `circlet ratio F G --ap A,B --ap2 A2,B2 --to K [--json] [-o FILE]`: for n = 0..K
// the exact counts F(A n+B) and G(A2 n+B2), their exact ratio, the ratio of
// main terms M_F/M_G as a ball, and the parts of the limiting constant
// (docs/MATH.md §7): the σ_∞ constant sqrt(det S_G/det S_F), the power factor
// (X_F/X_G)^{w−1} → (A/A2)^{w−1}, and the local ratio factors ρ_p(n) for p ≤ 7.
// A summary follows (on stderr for CSV): which ρ_p vary, the range of the
// ratio, and the verdict of `circlet certify`.
#include <algorithm>
#include <cmath>
#include <optional>
#include <cstdio>
#include <iostream>
#include <memory>
#include <set>

#include "cli/command.hpp"
#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "core/progress_line.hpp"
#include "core/provenance.hpp"
#include "core/resource_guard.hpp"
#include "mainterm/main_term.hpp"
#include "mainterm/main_term_batch.hpp"
#include "progression/ball_io.hpp"
#include "progression/certify.hpp"
#include "progression/interval.hpp"
#include "quadratic/local_density.hpp"
#include "series/eta_series.hpp"

namespace circlet::cli {

namespace {

struct RatioCliOptions {
  std::string F, G, ap, ap2, to, prec = "128", output;
  bool json = false;
};

constexpr ulong kShownPrimes[] = {2, 3, 5, 7};
// Largest prime of the batched Euler product (odd rank ≥ 5), as in `main --to` tables.
// The main-term ratio is a displayed column (about six certified digits at k = 2 with
// P = 10^5, more for k ≥ 3); the verdict does not use it.
constexpr ulong kRatioMaxPrime = 100000;
// Up to this many rows the main terms are computed one by one (full precision).
constexpr long kSingleRouteRows = 256;

/// Main terms of `model` at first + step·k for k = 0..count−1, in time linear in the
/// rows: odd rank ≥ 5 through one pass over the primes (main_term_batch.hpp), other
/// ranks row by row (exact rationals). Rows with X ≤ 0 have no main term (nullopt).
std::vector<std::optional<MainTerm>> main_terms_along(const QuadraticModel& model, long first, long step, long count,
                                                      slong prec, ProgressLine& line, const std::string& stage) {
  std::vector<std::optional<MainTerm>> out(static_cast<size_t>(count));
  // Short tables keep the full-precision single-value route (its cost grows with n,
  // harmless for a few hundred rows); long ones take the linear batched pass.
  if (model.rank % 2 == 1 && model.rank >= 5 && count > kSingleRouteRows) {
    const ulong P = std::min<ulong>(main_term_batch_prime_bound(model.rank, prec), kRatioMaxPrime);
    std::vector<Arb> b = main_term_batch(model, first, step, count, P, prec);
    for (long k = 0; k < count; ++k) {
      if (fmpq_sgn(model.X(Fmpz(first + step * k)).get()) <= 0) continue;
      MainTerm m;
      m.ball = std::move(b[static_cast<size_t>(k)]);
      if (arb_is_zero(m.ball)) m.exact = Fmpq(0);  // a local obstruction stays exact
      out[static_cast<size_t>(k)] = std::move(m);
    }
    return out;
  }
  MainTermOptions mo;
  mo.with_parts = false;
  for (long k = 0; k < count; ++k) {
    const Fmpz n(first + step * k);
    if (fmpq_sgn(model.X(n).get()) > 0) out[static_cast<size_t>(k)] = main_term(model, n, prec, mo);
    line.update(stage, double(k + 1) / double(count), k + 1);
  }
  return out;
}

/// The guard's cost model (measured on the development machine, 2 cores, at
/// --prec 128..16000): certify grows like prec^2 (2 s at 16000 bits), a row of
/// the table like prec^1.6 (1 ms at 128 bits, mostly the Euler product).
ResourceEstimate ratio_estimate(long rows, slong prec, long series_n) {
  const double scale = std::max(1.0, double(prec) / 128.0);
  ResourceEstimate e;
  e.what = "ratio with " + std::to_string(rows) + " rows at --prec " + std::to_string(prec);
  e.seconds = 8e-9 * double(prec) * double(prec) + double(rows) * 1e-3 * std::pow(scale, 1.6);
  e.bytes = double(rows) * (400.0 + double(prec) / 2) + 2.0 * 48.0 * double(series_n);
  e.reason = "time grows like rows x prec^1.6 plus prec^2 for the verdict";
  return e;
}

void run_ratio(const RatioCliOptions& o) {
  const Family f = Family::parse(o.F), g = Family::parse(o.G);
  const Progression ap = o.ap.empty() ? Progression{} : Progression::parse(o.ap);
  const Progression ap2 = o.ap2.empty() ? Progression{} : Progression::parse(o.ap2);
  if (o.to.empty()) throw UserError("--to K is required (rows n = 0..K)");
  const long K = parse_nonnegative("--to", o.to, 100000000);
  const slong prec = parse_nonnegative("--prec", o.prec, 100000);
  if (prec < 32) throw UserError("--prec must be at least 32 bits");
  ProgressionPair pair(f, ap, g, ap2);  // UserError when the weights differ
  const long NF = ap.at(K), NG = ap2.at(K);
  if (NF > (1L << 24) || NG > (1L << 24)) throw UserError("A*K+B must stay below 2^24 for the exact series");
  require_resources(ratio_estimate(K + 1, prec, std::max(NF, NG)));
  OutputSink sink(o.output);
  IntegerSeries sf = family_series(f, NF), sg = family_series(g, NG);

  // The limit parts need rank ≥ 2 (weight ≥ 1): below that there is no main term (docs/MATH.md §3).
  const bool has_main = pair.rank() >= 2;
  Certificate limit_parts;
  limit_parts.rank = pair.rank();
  if (has_main) sigma_and_power(limit_parts, pair, 0, prec);

  ProgressLine line("ratio");
  std::vector<std::optional<MainTerm>> mF, mG;
  if (has_main) {
    mF = main_terms_along(pair.F, ap.B, ap.A, K + 1, prec, line, "main terms F");
    mG = main_terms_along(pair.G, ap2.B, ap2.A, K + 1, prec, line, "main terms G");
  }

  std::vector<nlohmann::json> rows;
  std::string csv = "n,F_arg,G_arg,F_count,G_count,ratio,ratio_decimal,main_term_ratio,power_factor,rho_2,rho_3,rho_5,rho_7\n";
  std::map<ulong, std::set<std::string>> rho_values;
  double lo = INFINITY, hi = -INFINITY;
  long zero_g = 0;
  for (long n = 0; n <= K; ++n) {
    line.update("rows", double(n + 1) / double(K + 1), n + 1);
    const Fmpz nz(n), a = Fmpz(ap.at(n)), b = Fmpz(ap2.at(n));
    const fmpz* cf = sf.at(ap.at(n));
    const fmpz* cg = sg.at(ap2.at(n));
    std::string ratio = "undefined", ratio_dec = "";
    if (!fmpz_is_zero(cg)) {
      Fmpq q;
      fmpq_set_fmpz_frac(q, cf, cg);
      ratio = q.str();
      double d = fmpq_get_d(q);  // display only
      lo = std::min(lo, d);
      hi = std::max(hi, d);
      char buf[32];
      std::snprintf(buf, sizeof buf, "%.8g", d);
      ratio_dec = buf;
    } else {
      ++zero_g;
    }
    std::string main_ratio = "n/a";
    const auto& MF = has_main ? mF[static_cast<size_t>(n)] : std::optional<MainTerm>();
    const auto& MG = has_main ? mG[static_cast<size_t>(n)] : std::optional<MainTerm>();
    if (MF && MG) {
      if (MF->exact && MG->exact && !MG->exact->is_zero()) {
        Fmpq q;
        fmpq_div(q, *MF->exact, *MG->exact);
        main_ratio = q.str();
      } else {
        Arb r;
        arb_div(r, MF->ball, MG->ball, prec);
        main_ratio = r.str(15);
      }
    }
    // (X_F/X_G)^{w−1}: only where both X are positive (sq<S> has X(0) = 0).
    std::string power = "n/a";
    const Fmpq xf = pair.xF.at(nz), xg = pair.xG.at(nz);
    if (fmpq_sgn(xf.get()) > 0 && fmpq_sgn(xg.get()) > 0) {
      Fmpq y;
      fmpq_div(y, xf, xg);
      Arb pw;
      weight_power(pw, y, pair.rank(), prec);
      power = pw.str(10);
    }
    std::string rho[4] = {"n/a", "n/a", "n/a", "n/a"};
    // β_p needs rank ≥ 1 and X > 0 (at X = 0 the density of sq<S> diverges).
    const bool densities = pair.rank() >= 1 && power != "n/a";
    for (int i = 0; i < 4 && densities; ++i) {
      ulong p = kShownPrimes[i];
      Fmpq bf = local_density(pair.F, a, p), bg = local_density(pair.G, b, p);
      if (bg.is_zero()) {
        rho[i] = "undefined";
      } else {
        Fmpq q;
        fmpq_div(q, bf, bg);
        rho[i] = q.str();
      }
      rho_values[p].insert(rho[i]);
    }
    csv += std::to_string(n) + "," + a.str() + "," + b.str() + "," + Fmpz(sf.value(ap.at(n))).str() + "," +
           Fmpz(sg.value(ap2.at(n))).str() + "," + ratio + "," + ratio_dec + ",\"" + main_ratio + "\",\"" + power +
           "\"," + rho[0] + "," + rho[1] + "," + rho[2] + "," + rho[3] + "\n";
    if (o.json)
      rows.push_back({{"n", n}, {"F_arg", a.str()}, {"G_arg", b.str()}, {"F_count", sf.value(ap.at(n)).str()},
                      {"G_count", sg.value(ap2.at(n)).str()}, {"ratio", ratio}, {"main_term_ratio", main_ratio},
                      {"power_factor", power}, {"rho", {{"2", rho[0]}, {"3", rho[1]}, {"5", rho[2]}, {"7", rho[3]}}}});
  }
  line.finish();

  CertifyOptions copt;
  copt.prec = prec;
  Certificate cert = certify_pair(pair, copt);
  nlohmann::json summary;
  std::vector<std::string> varying;
  for (const auto& [p, vals] : rho_values)
    if (vals.size() > 1) varying.push_back(std::to_string(p));
  summary["rho_varies_at"] = varying;
  summary["ratio_range_display"] = zero_g > K ? std::string("none (G vanishes on every row)")
                                              : "[" + std::to_string(lo) + ", " + std::to_string(hi) + "]";
  summary["rows_with_G_zero"] = zero_g;
  summary["sigma_constant_square"] = has_main ? limit_parts.sigma_square.str() : "n/a";
  summary["sigma_constant"] = has_main ? limit_parts.sigma.str(15) : "n/a";
  summary["power_factor_limit"] = has_main ? limit_parts.power_limit.str(15) : "n/a";
  summary["verdict"] = verdict_name(cert.verdict);
  summary["verdict_reason"] = cert.reason;
  if (cert.verdict == Verdict::NonConvergent) {
    summary["classes"] = {{{"residue", cert.classes[0].residue.str()}, {"modulus", cert.modulus.str()},
                           {"limit_interval", interval_display(cert.classes[0].limit)}},
                          {{"residue", cert.classes[1].residue.str()}, {"modulus", cert.modulus.str()},
                           {"limit_interval", interval_display(cert.classes[1].limit)}}};
  }
  const Provenance prov = Provenance::now(command_line(), prec);
  std::string text;
  if (o.json) {
    nlohmann::json j{{"provenance", prov.to_json()}, {"F", f.name()}, {"G", g.name()}, {"ap", ap.str()},
                     {"ap2", ap2.str()}, {"weight", pair.weight_str()}, {"rows", rows}, {"summary", summary}};
    text = j.dump(1) + "\n";
  } else {
    text = prov.csv_comment() + csv;  // on standard output too: a redirected table keeps its provenance
  }
  sink.stream() << text;
  sink.finish();
  if (!o.json) {
    std::cerr << "summary: rho_p varies at p in {";
    for (size_t i = 0; i < varying.size(); ++i) std::cerr << (i ? "," : "") << varying[i];
    std::cerr << "} (p <= 7 shown); exact ratio range " << summary["ratio_range_display"].get<std::string>()
              << "; sigma constant sqrt(" << summary["sigma_constant_square"].get<std::string>()
              << ") = " << (has_main ? limit_parts.sigma.str(10) : "n/a")
              << "; (A/A2)^{w-1} = " << (has_main ? limit_parts.power_limit.str(10) : "n/a") << "\nverdict: " << verdict_name(cert.verdict)
              << " -- " << cert.reason << "\n";
    if (cert.verdict == Verdict::NonConvergent)
      std::cerr << "  n = " << cert.classes[0].residue.str() << " mod " << cert.modulus.str() << ": limit in "
                << interval_display(cert.classes[0].limit) << "; n = " << cert.classes[1].residue.str() << " mod "
                << cert.modulus.str() << ": limit in " << interval_display(cert.classes[1].limit) << "\n";
  }
}

const Registration registration{CommandSpec{
    "ratio", 59, [](CLI::App& app) {
      auto o = std::make_shared<RatioCliOptions>();
      auto* cmd = app.add_subcommand("ratio", "F(A n+B) / G(A2 n+B2): exact counts, main-term ratio, local factors, verdict");
      cmd->add_option("F", o->F, "first family: c<T> (t-cores), sc<T> (self-conjugate t-cores), sq<S> (sums of S squares), e.g. c6")->required();
      cmd->add_option("G", o->G, "second family of the same weight, e.g. sc11")->required();
      cmd->add_option("--ap", o->ap, "progression A,B of F: F is taken at A*n+B (default 1,0)");
      cmd->add_option("--ap2", o->ap2, "progression A2,B2 of G: G is taken at A2*n+B2 (A' and B' in docs/MATH.md §7; default 1,0)");
      cmd->add_option("--to", o->to, "rows n = 0..K")->required();
      cmd->add_option("--prec", o->prec, "precision in bits (default 128)");
      cmd->add_flag("--json", o->json, "JSON output (rows and summary) instead of CSV");
      cmd->add_option("-o,--output", o->output, "write to FILE (atomically) instead of standard output");
      cmd->callback([o]() { run_ratio(*o); });
    }}};

}  // namespace

}  // namespace circlet::cli
