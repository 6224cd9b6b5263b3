// `circlet arcs FAMILY --at N --upto K [--prec BITS] [--json] [-o FILE]`:
// the circle method's major-arc terms σ_∞(X)·A_k(n)/k^w for k = 1..K
// (docs/MATH.md §6), their partial sums, a rigorous tail bound after each k, and
// the main term of src/mainterm/ for comparison.
#include <climits>
#include <iostream>
#include <memory>
#include <sstream>
#include <string>

#include <nlohmann/json.hpp>

#include "arcs/arc_terms.hpp"
#include "arcs/gauss_sum.hpp"
#include "cli/command.hpp"
#include "cli/private_factoring.hpp"
#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "core/provenance.hpp"
#include "core/resource_guard.hpp"
#include "family/family.hpp"
#include "family/progression.hpp"
#include "mainterm/main_term.hpp"
#include "quadratic/model.hpp"

namespace circlet::cli {

namespace {

struct ArcsOptions {
  std::string family;
  std::string at, upto = "20";
  std::string prec = "128", digits = "15";
  bool json = false;
  bool gauss = false;
  std::string output;
  double factor_timeout = 60;
  double class_number_steps = 3e8;
  double l_value_terms = 4e7;
};

constexpr long kMaxGaussUpto = 300;

constexpr long kMaxUpto = 100000;

// A ball as "[mid +/- rad]" with `digits` digits of the midpoint even where the
// radius is large (ARB_STR_MORE); reading it back gives a ball containing x.
std::string ball_text(const Arb& x, slong digits) { return x.str(digits, ARB_STR_MORE); }

// An upper bound printed as a ball that contains it, or "inf" when there is none.
std::string bound_text(const Arb& b, slong digits) { return arb_is_finite(b.get()) ? ball_text(b, digits) : "inf"; }

// partial sum ± tail bound after k terms: a ball containing M(n).
std::string enclosure_text(const ArcTerm& t, slong digits) {
  Arb e = t.partial_sum;
  arb_add_error(e.get(), t.tail_bound.get());
  return ball_text(e, digits);
}

void run_arcs(const ArcsOptions& opt) {
  const Family family = Family::parse(opt.family);
  if (opt.at.empty()) throw UserError("give the argument n with --at N");
  if (opt.at[0] == '-' && is_decimal_digits(opt.at.substr(1))) throw UserError("--at: n must be non-negative");
  const Fmpz n = parse_nonnegative_fmpz("--at", opt.at);
  const long K = parse_nonnegative("--upto", opt.upto, kMaxUpto);
  const slong prec = parse_int_in_range("--prec", opt.prec, 32, 100000);
  const slong dg = parse_int_in_range("--digits", opt.digits, 1, 1000);
  const QuadraticModel model = quadratic_model(family);
  if (model.rank < 2) throw UserError("family " + family.name() + " has rank " + std::to_string(model.rank) +
                                      ": no circle-method main term");
  check_main_term_input(model, n);

  if (opt.gauss && K > kMaxGaussUpto)
    throw UserError("--gauss is limited to --upto " + std::to_string(kMaxGaussUpto) + " (cost grows like K^3)");

  if (!(opt.factor_timeout > 0)) throw UserError("--factor-timeout must be a positive number of seconds");
  require_resources(factoring_estimate(model, n, "the arc terms"));  // a refusal naming --allow-large

  OutputSink sink(opt.output);
  // Writes the table to out; returns whether the main term lies in the arc enclosure.
  auto compute = [&](std::ostream& out) -> bool {
    const ArcExpansion e = arc_expansion(model, n, static_cast<ulong>(K), prec);
    // Route (b): the Gauss-sum form of each coefficient, which must pin the same rational.
    std::vector<std::string> gauss_text;
    if (opt.gauss) {
      for (const auto& t : e.terms) {
        GaussArcCoefficient g = arc_coefficient_by_gauss_sums(model, n, t.k, prec);
        if (!g.exact || *g.exact != t.coefficient)
          throw InternalError("route (b) disagrees with route (a) at k = " + std::to_string(t.k));
        gauss_text.push_back(ball_text(g.re, dg));
      }
    }
    MainTermOptions mo;
    mo.max_class_number_steps = opt.class_number_steps;
    mo.max_theta_terms = opt.l_value_terms;
    const MainTerm M = main_term(model, n, prec, mo);
    const bool contained = arb_overlaps(e.enclosure.get(), M.ball.get());

    const Provenance prov = Provenance::now(command_line(), prec);
    if (opt.json) {
      nlohmann::json j;
      j["provenance"] = prov.to_json();
      j["family"] = family.name();
      j["n"] = n.str();
      j["X"] = e.X.str();
      j["rank"] = model.rank;
      j["singular_integral"] = ball_text(e.singular_integral, dg);
      j["formula"] = "term_k = sigma_inf(X) * A_k(n)/k^w; A_k/k^w exact from local pieces (route a)";
      nlohmann::json rows = nlohmann::json::array();
      for (const auto& t : e.terms)
        rows.push_back({{"k", t.k},
                        {"coefficient", t.coefficient.str()},
                        {"term", ball_text(t.term, dg)},
                        {"partial_sum", ball_text(t.partial_sum, dg)},
                        {"tail_bound", bound_text(t.tail_bound, dg)},
                        {"enclosure", enclosure_text(t, dg)}});
      if (opt.gauss)
        for (size_t i = 0; i < rows.size(); ++i) rows[i]["coefficient_gauss"] = gauss_text[i];
      j["terms"] = rows;
      j["tail"] = {{"bound", bound_text(e.term_tail, dg)},
                   {"coefficient_bound", bound_text(e.tail.coefficient_tail, dg)},
                   {"prime_cutoff", e.tail.prime_cutoff},
                   {"good_prime_decay", e.tail.decay},
                   {"method", e.tail.method}};
      j["enclosure"] = ball_text(e.enclosure, dg);
      j["main_term"] = ball_text(M.ball, dg);
      j["main_term_exact"] = M.exact ? M.exact->str() : std::string();
      j["main_term_in_enclosure"] = contained;
      out << j.dump(2) << "\n";
    } else {
      out << prov.csv_comment();  // on standard output too: a redirected table keeps its provenance
      // Every row carries the enclosure after k terms and the main term, so that
      // convergence can be plotted from the CSV alone.
      const std::string main_text = ball_text(M.ball, dg);
      out << "k,coefficient,term,partial_sum,tail_bound,enclosure,main_term" << (opt.gauss ? ",coefficient_gauss" : "")
          << "\n";
      for (size_t i = 0; i < e.terms.size(); ++i) {
        const ArcTerm& t = e.terms[i];
        out << t.k << "," << t.coefficient.str() << "," << ball_text(t.term, dg) << "," << ball_text(t.partial_sum, dg) << ","
            << bound_text(t.tail_bound, dg) << "," << enclosure_text(t, dg) << "," << main_text;
        if (opt.gauss) out << "," << gauss_text[i];
        out << "\n";
      }
    }
    return contained;
  };
  bool contained = true;
  if (!needs_private_factoring(model, n)) {
    contained = compute(sink.stream());
  } else {
    // X may need FLINT's quadratic sieve, which writes work files into the working
    // directory: the whole computation runs in a private child (private_factoring.hpp).
    if (stderr_is_terminal())
      std::cerr << "circlet arcs: factoring X in a private temporary directory; giving up after "
                << opt.factor_timeout << " s (--factor-timeout)\n";
    auto r = run_in_private_child(
        [&] {
          std::ostringstream o;
          const bool in = compute(o);
          return std::string(in ? "1" : "0") + o.str();
        },
        opt.factor_timeout);
    if (!r)
      throw UserError("the arc terms need X = n + Delta factored, and it could not be factored in the time allowed "
                      "(--factor-timeout " + std::to_string((long)opt.factor_timeout) + " s; raise it to wait longer)");
    if (r->user_error) throw UserError(r->text);
    contained = !r->text.empty() && r->text[0] == '1';
    sink.stream() << r->text.substr(1);
  }
  sink.finish();
  if (!contained)
    throw InternalError("the main term lies outside the arc enclosure (partial sum +- tail bound)");
}

const Registration registration{CommandSpec{
    "arcs", 40, [](CLI::App& app) {
      auto opt = std::make_shared<ArcsOptions>();
      auto* cmd = app.add_subcommand(
          "arcs", "major-arc terms sigma_inf(X) A_k(n)/k^w for k = 1..K, partial sums and a rigorous tail bound");
      cmd->add_option("family", opt->family, "family: c<T> (t-cores), sc<T> (self-conjugate t-cores), sq<S> (sums of S squares)")->required();
      cmd->add_option("--at", opt->at, "the argument n")->required();
      cmd->add_option("--upto", opt->upto, "largest denominator K (default 20)");
      cmd->add_option("--prec", opt->prec, "working precision in bits (default 128)");
      cmd->add_option("--digits", opt->digits, "decimal digits of printed balls (default 15)");
      cmd->add_flag("--gauss", opt->gauss,
                    "also compute each A_k(n)/k^w from Gauss sums (route b) and check it (K <= 300)");
      cmd->add_option("--factor-timeout", opt->factor_timeout,
                      "seconds allowed for factoring a large X (default 60); then the command gives up");
      cmd->add_option("--class-number-steps", opt->class_number_steps,
                      "weight 3/2: largest class-number sieve for the main term (about sqrt(|D|/3) steps; default 3e8)");
      cmd->add_option("--l-value-terms", opt->l_value_terms,
                      "weight >= 7/2: largest theta series for an exact L(k, chi) above conductor 2e6 "
                      "(default 4e7 terms, about 15 s on two cores); above it the L-value is an Euler-product ball");
      cmd->add_flag("--json", opt->json, "JSON output with provenance instead of CSV");
      cmd->add_option("-o,--output", opt->output, "write to FILE (atomically) instead of standard output");
      cmd->callback([opt]() { run_arcs(*opt); });
    }}};

}  // namespace

}  // namespace circlet::cli
