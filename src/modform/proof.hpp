#pragma once
// Proving a relation of relation.hpp by Sturm's bound (docs/MATH.md §8):
//  1. each F_i becomes an eta quotient f_i (eta_product.hpp) with its level and
//     character, holomorphic at every cusp;
//  2. alignment: F_i(A_i n + B_i) is the coefficient of q^{L(n+β_i)} of a series
//     g_i obtained from f_i by U_a, a sieve and V_b (form_space.hpp); the relation is
//     one statement about Σ λ_i g_i only when every β_i is the same number β;
//  3. the combination (and the restriction of n to a class, a sieve on m = L n + Lβ)
//     lies in one space; Sturm's bound gives the last m to check;
//  4. the exact coefficients (src/series/) up to that m decide: PROVED or REFUTED.
// A proof certificate records all of it and verify_proof_certificate re-checks it.
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "core/flint_types.hpp"
#include "modform/form_space.hpp"
#include "modform/relation.hpp"

namespace circlet {

inline constexpr const char* kProofCertificateFormat = "circlet-proof-certificate/1";

enum class ProofVerdict { Proved, Refuted, Unknown };
std::string proof_verdict_name(ProofVerdict v);  // "PROVED", "REFUTED", "UNKNOWN"

struct ProofOptions {
  /// Largest coefficient index m the prover computes up to (beyond: UNKNOWN).
  long max_m = 4000000;
  /// Below the bound the prover still compares at least this many n (a counterexample
  /// beyond the Sturm bound would expose a bookkeeping error).
  long min_n = 100;
};

struct ProofResult {
  ProofVerdict verdict = ProofVerdict::Unknown;
  std::string reason;  // one line
  LinearRelation relation;
  FormSpace space;
  Fmpz index, bound;
  long n_checked = -1;  // n = 0..n_checked were compared (in the class)
  std::string coefficient_digest;
  // REFUTED: the first n, the value of each term, and the value of the whole left side.
  long counterexample_n = -1;
  std::vector<std::string> counterexample_values;
  std::string counterexample_total;
  nlohmann::json certificate;  // always filled (verdict inside)
};

/// Runs the whole proof. Never throws for mathematics out of reach (UNKNOWN with a reason).
ProofResult prove_relation(const LinearRelation& rel, const ProofOptions& opt = {});

struct ProofVerifyReport {
  std::vector<std::string> failures;
  std::vector<std::string> checked;
  bool ok() const { return failures.empty(); }
};

/// Re-checks a proof certificate: its digest, then every recorded claim against a
/// fresh computation from the relation text (levels, characters, chain, index, bound,
/// the coefficients and their digest, the verdict). Never throws on bad data.
ProofVerifyReport verify_proof_certificate(const nlohmann::json& cert);

/// "sha256:<hex>" of nlohmann's dump() of the certificate without its "digest" field.
std::string proof_certificate_digest(const nlohmann::json& cert);

}  // namespace circlet
