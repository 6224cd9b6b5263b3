#pragma once
// The certificate of a verdict on a progression pair (docs/MATH.md §7), and its
// JSON form. Everything a reader needs to re-check the verdict is stored:
// exact rationals as strings "p/q", balls exactly (ball_io.hpp).
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "core/flint_types.hpp"
#include "core/provenance.hpp"
#include "progression/progression_pair.hpp"

namespace circlet {

enum class Verdict { NonConvergent, Constant, Undecided };
std::string verdict_name(Verdict v);  // "NON-CONVERGENT", "CONSTANT", "UNDECIDED"
/// Throws UserError on an unknown name.
Verdict verdict_from_name(const std::string& s);

/// The pinned local factor of one prime on one class.
struct ClassFactor {
  ulong p = 0;
  ulong e = 0;
  Fmpz residue;  // the class n ≡ residue (mod p^e)
  Fmpq betaF, betaG;
};

/// One residue class n ≡ residue (mod modulus) of the progression variable.
struct CertClass {
  Fmpz residue;
  std::vector<ClassFactor> factors;  // one per prime q ≤ Q, ascending
  Fmpq pinned_product;               // Π_{q ≤ Q} β_q^F/β_q^G
  Arb limit;                         // ⊇ every limit point of R(n), n → ∞ in the class
  Arb from_n0;                       // ⊇ R(n) for every n ≥ n0 in the class
};

struct Certificate {
  std::string F, G;  // family names
  Progression apF, apG;
  int rank = 0;
  Verdict verdict = Verdict::Undecided;
  std::string reason;
  slong prec = 0;

  // NON-CONVERGENT data
  ulong Q = 0;             // every prime q ≤ Q is pinned
  ulong q2 = 0;            // explicit primes Q < q ≤ q2 in the tail bound
  ulong Q_max = 0;         // the search limit used
  ulong distinguishing_prime = 0;
  Fmpz modulus;            // Π_{q ≤ Q} q^{e_q}
  std::vector<std::pair<ulong, ulong>> modulus_factors;  // (q, e_q), q ≤ Q ascending
  std::vector<CertClass> classes;
  Fmpq sigma_square;       // (σ_∞ constant of F / that of G)² = det S_G / det S_F
  Arb sigma;
  Fmpq power_base;         // A/A'
  Arb power_limit;         // (A/A')^{w−1}
  Fmpz n0;
  Arb power_from_n0;       // ⊇ (X_F(n)/X_G(n))^{w−1} for all n ≥ n0
  bool tail_exact = false; // proportional route: ρ_q = 1 for every q > Q (Q ≥ every finite prime), S = 0
  Arb tail_log;            // S: |log Π_{q>Q} ρ_q| ≤ S for every n
  Arb tail;                // ⊇ [e^{−S}, e^{S}]
  bool disjoint = false;

  // CONSTANT data
  std::string constant_route;  // "identical" or "proportional" (see certify.hpp)
  Fmpq lambda;             // X_G(n) = λ·X_F(n) for every n
  Fmpq discriminant_product;  // det S_F · det S_G (· λ for odd rank): a rational square
  std::vector<ClassFactor> finite_classes;  // per prime of the finite set: a partition of Z into pinned classes
  std::vector<std::pair<ulong, Fmpq>> finite_rho;  // (p, ρ_p), the common value on those classes
  Fmpq constant_square;    // the square of the constant, exact
  Fmpq constant_value;     // the constant itself when it is rational (always, on both routes)
  Arb constant;
  bool contains_integer = false;
  Fmpz integer;

  Provenance provenance;
};

/// The theorems every verdict relies on, with citations (stored in the certificate).
nlohmann::json certificate_theorems();

nlohmann::json certificate_to_json(const Certificate& c);

inline constexpr const char* kCertificateFormat = "circlet-certificate/1";

}  // namespace circlet
