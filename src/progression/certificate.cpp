#include "progression/certificate.hpp"

#include "core/error.hpp"
#include "progression/ball_io.hpp"

namespace circlet {

std::string verdict_name(Verdict v) {
  switch (v) {
    case Verdict::NonConvergent: return "NON-CONVERGENT";
    case Verdict::Constant: return "CONSTANT";
    case Verdict::Undecided: return "UNDECIDED";
  }
  return "UNDECIDED";
}

Verdict verdict_from_name(const std::string& s) {
  if (s == "NON-CONVERGENT") return Verdict::NonConvergent;
  if (s == "CONSTANT") return Verdict::Constant;
  if (s == "UNDECIDED") return Verdict::Undecided;
  throw UserError("unknown verdict '" + s + "' (expected NON-CONVERGENT, CONSTANT or UNDECIDED)");
}

nlohmann::json certificate_theorems() {
  using nlohmann::json;
  return json::array({
      json{{"name", "main term = Eisenstein part (Siegel)"},
           {"statement",
            "The Eisenstein part of the theta series of a positive definite quadratic polynomial of rank r has "
            "n-th coefficient sigma_inf(X) * prod_p beta_p(n) (Siegel's mass formula for the genus, via the "
            "Siegel-Weil identity); for t-cores this is the circle-method main term."},
           {"citation",
            "C. L. Siegel, Uber die analytische Theorie der quadratischen Formen, Ann. of Math. 36 (1935) "
            "527-606; J. Anderson, An asymptotic formula for the t-core partition function and a conjecture "
            "of Stanton, J. Number Theory 128 (2008) 2591-2615"}},
      json{{"name", "cusp part is o(main term) for weight w > 2"},
           {"statement",
            "The cusp-form part has coefficients O(n^{w/2}) (Hecke's bound, any weight w, integral or "
            "half-integral; O(n^{(w-1)/2+eps}) by Deligne for integral weight), while the main term is >> "
            "X^{w-1} on a class where prod_{q<=Q} beta_q^G is a non-zero constant and prod_{q>Q} beta_q^G >= "
            "exp(-S) > 0; w/2 < w-1 iff w > 2."},
           {"citation",
            "E. Hecke, Theorie der Eisensteinschen Reihen hoeherer Stufe und ihre Anwendung auf "
            "Funktionentheorie und Arithmetik, Abh. Math. Sem. Univ. Hamburg 5 (1927) 199-224; P. Deligne, "
            "La conjecture de Weil. I, Publ. Math. IHES 43 (1974) 273-307"}},
      json{{"name", "local densities"},
           {"statement",
            "beta_p(n) = lim_j N_j(n)/p^{j(r-1)} stabilises at an explicit j (Hensel's lemma); the closed "
            "forms of MATH.md section 4 give it in terms of v_p(X) and the unit part of X; verify recomputes "
            "it by counting modulo p^j."},
           {"citation", "C. L. Siegel, Ann. of Math. 36 (1935), section on local densities; MATH.md section 4"}},
  });
}

namespace {
nlohmann::json class_to_json(const CertClass& c) {
  nlohmann::json factors = nlohmann::json::array();
  for (const auto& f : c.factors) {
    Fmpq rho;
    if (!f.betaG.is_zero()) fmpq_div(rho, f.betaF, f.betaG);
    factors.push_back({{"p", f.p},
                       {"e", f.e},
                       {"residue", f.residue.str()},
                       {"beta_F", f.betaF.str()},
                       {"beta_G", f.betaG.str()},
                       {"rho", f.betaG.is_zero() ? std::string("undefined") : rho.str()}});
  }
  return {{"residue", c.residue.str()},
          {"local_factors", factors},
          {"pinned_product", c.pinned_product.str()},
          {"limit_interval", ball_to_json(c.limit)},
          {"limit_interval_display", interval_display(c.limit)},
          {"interval_n_ge_n0", ball_to_json(c.from_n0)}};
}
}  // namespace

nlohmann::json certificate_to_json(const Certificate& c) {
  nlohmann::json j;
  j["format"] = kCertificateFormat;
  j["provenance"] = c.provenance.to_json();
  j["F"] = c.F;
  j["G"] = c.G;
  j["ap"] = {{"A", c.apF.A}, {"B", c.apF.B}};
  j["ap2"] = {{"A", c.apG.A}, {"B", c.apG.B}};
  j["weight"] = weight_string(c.rank);
  j["verdict"] = verdict_name(c.verdict);
  j["reason"] = c.reason;
  j["precision_bits"] = c.prec;
  j["theorems"] = certificate_theorems();
  if (c.verdict == Verdict::NonConvergent) {
    nlohmann::json mod = nlohmann::json::array();
    for (const auto& f : c.modulus_factors) mod.push_back({{"p", f.first}, {"e", f.second}});
    j["Q"] = c.Q;
    j["Q_max"] = c.Q_max;
    j["distinguishing_prime"] = c.distinguishing_prime;
    j["modulus"] = c.modulus.str();
    j["modulus_factors"] = mod;
    j["sigma_constant"] = {{"square", c.sigma_square.str()},
                           {"note", "ratio of pi^{r/2}/(Gamma(r/2) sqrt(det S)) for F and G = sqrt(det S_G/det S_F)"},
                           {"ball", ball_to_json(c.sigma)}};
    j["power_factor"] = {{"base", c.power_base.str()},
                         {"exponent", weight_string(c.rank - 2)},
                         {"limit", ball_to_json(c.power_limit)},
                         {"n0", c.n0.str()},
                         {"for_n_ge_n0", ball_to_json(c.power_from_n0)},
                         {"note", "(X_F(n)/X_G(n))^{w-1} is monotone in n and tends to (A/A')^{w-1}"}};
    if (c.tail_exact) {
      j["tail_route"] = "proportional";
      j["lambda"] = c.lambda.str();
      j["discriminant_product"] = c.discriminant_product.str();
      j["tail_argument"] = "X_G = lambda X_F for all n and discriminant_product is a rational square, so rho_q = 1 for "
                           "every prime q outside {2, 3} and the primes of t_F t_G lambda, all of which are <= Q: the "
                           "product over q > Q is exactly 1";
    }
    j["tail"] = {{"Q", c.Q},
                 {"explicit_primes_up_to", c.q2},
                 {"log_bound", ball_to_json(c.tail_log)},
                 {"interval", ball_to_json(c.tail)},
                 {"per_prime_bound",
                  c.rank % 2 ? "|beta_q - 1| <= q^{(1-r)/2} + q^{2-r}/(1 - q^{1-r/2})"
                             : "|beta_q - 1| <= q^{-w} + (1 + q^{-w}) q^{1-w}/(1 - q^{1-w})"},
                 {"note", "prod_{q>Q} rho_q(n) in [exp(-S), exp(S)] for every n; S bounds sum_{q>Q} "
                          "log((1+d_q)/(1-d_q)) (explicit primes up to explicit_primes_up_to, integral bound beyond)"}};
    j["classes"] = {class_to_json(c.classes.at(0)), class_to_json(c.classes.at(1))};
    j["disjoint"] = c.disjoint;
  } else if (c.verdict == Verdict::Constant) {
    nlohmann::json fin = nlohmann::json::array();
    for (const auto& [p, rho] : c.finite_rho) {
      nlohmann::json cls = nlohmann::json::array();
      for (const auto& f : c.finite_classes)
        if (f.p == p)
          cls.push_back({{"e", f.e}, {"residue", f.residue.str()}, {"beta_F", f.betaF.str()}, {"beta_G", f.betaG.str()}});
      fin.push_back({{"p", p}, {"rho", rho.str()}, {"classes", cls}});
    }
    j["constant_route"] = c.constant_route;
    if (c.constant_route == "proportional") {
      j["lambda"] = c.lambda.str();
      j["discriminant_product"] = c.discriminant_product.str();
      j["finite_primes"] = fin;
      j["constant_argument"] =
          "X_G(n) = lambda X_F(n) for all n, and discriminant_product is a rational square, so for every prime p "
          "outside finite_primes both local densities are the same function of (v_p(X), quadratic character of "
          "the unit part) and rho_p = 1; at each p in finite_primes the listed classes partition Z, each is pinned, "
          "and all give the same rho_p. Hence M_F/M_G = sqrt(square) for every n, (X_F/X_G)^{w-1} = (A/A')^{w-1} "
          "exactly.";
    }
    j["constant"] = {{"square", c.constant_square.str()},
                     {"value", c.constant_value.str()},
                     {"interval", ball_to_json(c.constant)},
                     {"contains_integer", c.contains_integer},
                     {"integer", c.contains_integer ? nlohmann::json(c.integer.str()) : nlohmann::json(nullptr)}};
  } else {
    j["Q_max"] = c.Q_max;
  }
  return j;
}

}  // namespace circlet
