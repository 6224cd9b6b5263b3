#include "progression/certificate.hpp"

#include "core/error.hpp"
#include "progression/ball_io.hpp"

#include <openssl/evp.h>

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

const std::vector<CatalogueTheorem>& theorem_catalogue() {
  static const std::vector<CatalogueTheorem> cat = {
      {"siegel-eisenstein",
       "The Eisenstein part of the theta series of a positive definite quadratic polynomial of rank r has n-th "
       "coefficient sigma_inf(X) * prod_p beta_p(n) (Siegel's mass formula via the Siegel-Weil identity); for "
       "t-cores this is the circle-method main term.",
       "C. L. Siegel, Ueber die analytische Theorie der quadratischen Formen, Ann. of Math. 36 (1935) (quoted from "
       "memory); J. Anderson, An asymptotic formula for the t-core partition function and a conjecture of Stanton, "
       "J. Number Theory 128 (2008) (quoted from memory); docs/MATH.md §3"},
      {"cusp-bound",
       "The cusp-form part has coefficients O(n^{w/2}) (Hecke's bound, integral or half-integral weight w), while "
       "the main term is >> X^{w-1} on a class where prod_{q<=Q} beta_q^G is a non-zero constant and "
       "prod_{q>Q} beta_q^G >= exp(-S) > 0; w/2 < w-1 iff w > 2.",
       "E. Hecke, Theorie der Eisensteinschen Reihen hoeherer Stufe und ihre Anwendung auf Funktionentheorie und "
       "Arithmetik, Abh. Math. Sem. Univ. Hamburg 5 (1927) (quoted from memory); docs/MATH.md §7.3"},
      {"local-densities",
       "beta_p(n) = lim_j N_j(n)/p^{j(r-1)} is attained at an explicit j (Hensel's lemma), and it is constant on "
       "a pinned class.",
       "C. L. Siegel, Ann. of Math. 36 (1935) (quoted from memory); docs/MATH.md §4, §7.1"},
  };
  return cat;
}

std::vector<std::string> required_theorems(Verdict v, const std::string& constant_route) {
  if (v == Verdict::NonConvergent || (v == Verdict::Constant && constant_route == "proportional")) {
    std::vector<std::string> ids;
    for (const auto& t : theorem_catalogue()) ids.push_back(t.id);
    return ids;
  }
  return {};
}

std::string certify_command(const std::string& F, const std::string& G, const Progression& ap,
                            const Progression& ap2, ulong Q_max, slong prec) {
  return "circlet certify " + F + " " + G + " --ap " + std::to_string(ap.A) + "," + std::to_string(ap.B) +
         " --ap2 " + std::to_string(ap2.A) + "," + std::to_string(ap2.B) + " --qmax " + std::to_string(Q_max) +
         " --prec " + std::to_string(prec);
}

std::string certificate_digest(const nlohmann::json& cert) {
  nlohmann::json body = cert;
  if (body.is_object()) body.erase("digest");
  const std::string text = body.dump();
  unsigned char md[EVP_MAX_MD_SIZE];
  unsigned int len = 0;
  CIRCLET_ASSERT(EVP_Digest(text.data(), text.size(), md, &len, EVP_sha256(), nullptr) == 1 && len == 32,
                 "SHA-256 failed");
  static const char* hex = "0123456789abcdef";
  std::string out = "sha256:";
  for (unsigned int i = 0; i < len; ++i) {
    out += hex[md[i] >> 4];
    out += hex[md[i] & 15];
  }
  return out;
}

namespace {
nlohmann::json exact_ball(const arb_t x) {
  nlohmann::json j = ball_to_json(x);
  j.erase("decimal");
  return j;
}

nlohmann::json class_to_json(const CertClass& c) {
  nlohmann::json factors = nlohmann::json::array();
  for (const auto& f : c.factors) {
    CIRCLET_ASSERT(!f.betaG.is_zero(), "a certified class with beta_G = 0");
    Fmpq rho;
    fmpq_div(rho, f.betaF, f.betaG);
    factors.push_back({{"p", f.p},
                       {"e", f.e},
                       {"residue", f.residue.str()},
                       {"beta_F", f.betaF.str()},
                       {"beta_G", f.betaG.str()},
                       {"rho", rho.str()}});
  }
  return {{"residue", c.residue.str()},
          {"local_factors", factors},
          {"pinned_product", c.pinned_product.str()},
          {"limit_interval", exact_ball(c.limit)},
          {"interval_n_ge_n0", exact_ball(c.from_n0)}};
}
}  // namespace

nlohmann::json certificate_to_json(const Certificate& c) {
  nlohmann::json j;
  j["format"] = kCertificateFormat;
  j["provenance"] = {{"program", c.provenance.program},
                     {"version", c.provenance.version},
                     {"command", certify_command(c.F, c.G, c.apF, c.apG, c.Q_max, c.prec)},
                     {"date", c.provenance.date_utc}};
  j["F"] = c.F;
  j["G"] = c.G;
  j["ap"] = {{"A", c.apF.A}, {"B", c.apF.B}};
  j["ap2"] = {{"A", c.apG.A}, {"B", c.apG.B}};
  j["weight"] = weight_string(c.rank);
  j["verdict"] = verdict_name(c.verdict);
  j["precision_bits"] = c.prec;
  j["Q_max"] = c.Q_max;
  j["theorems"] = required_theorems(c.verdict, c.constant_route);
  if (c.verdict == Verdict::NonConvergent) {
    nlohmann::json mod = nlohmann::json::array();
    for (const auto& f : c.modulus_factors) mod.push_back({{"p", f.first}, {"e", f.second}});
    j["Q"] = c.Q;
    j["distinguishing_prime"] = c.distinguishing_prime;
    j["modulus"] = c.modulus.str();
    j["modulus_factors"] = mod;
    j["sigma_constant"] = {{"square", c.sigma_square.str()}, {"ball", exact_ball(c.sigma)}};
    j["power_factor"] = {{"base", c.power_base.str()},
                         {"exponent", weight_string(c.rank - 2)},
                         {"limit", exact_ball(c.power_limit)},
                         {"n0", c.n0.str()},
                         {"for_n_ge_n0", exact_ball(c.power_from_n0)}};
    nlohmann::json tail = {{"route", c.tail_exact ? "proportional" : "bound"},
                           {"explicit_primes_up_to", c.q2},
                           {"log_bound", exact_ball(c.tail_log)},
                           {"interval", exact_ball(c.tail)}};
    if (c.tail_exact) {
      tail["lambda"] = c.lambda.str();
      tail["discriminant_product"] = c.discriminant_product.str();
    }
    j["tail"] = tail;
    j["classes"] = {class_to_json(c.classes.at(0)), class_to_json(c.classes.at(1))};
    j["disjoint"] = c.disjoint;
  } else if (c.verdict == Verdict::Constant) {
    j["constant_route"] = c.constant_route;
    if (c.constant_route == "proportional") {
      nlohmann::json fin = nlohmann::json::array();
      for (const auto& [p, rho] : c.finite_rho) {
        nlohmann::json cls = nlohmann::json::array();
        for (const auto& f : c.finite_classes)
          if (f.p == p)
            cls.push_back({{"e", f.e}, {"residue", f.residue.str()}, {"beta_F", f.betaF.str()}, {"beta_G", f.betaG.str()}});
        fin.push_back({{"p", p}, {"rho", rho.str()}, {"classes", cls}});
      }
      j["lambda"] = c.lambda.str();
      j["discriminant_product"] = c.discriminant_product.str();
      j["finite_primes"] = fin;
    }
    j["constant"] = {{"square", c.constant_square.str()},
                     {"value", c.constant_value.str()},
                     {"interval", exact_ball(c.constant)},
                     {"contains_integer", c.contains_integer},
                     {"integer", c.contains_integer ? nlohmann::json(c.integer.str()) : nlohmann::json(nullptr)}};
  }
  j["digest"] = certificate_digest(j);
  return j;
}

}  // namespace circlet
