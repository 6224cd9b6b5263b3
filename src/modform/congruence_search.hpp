#pragma once
// Search, then prove: congruences F(A n + B) ≡ 0 (mod ℓ^k) for the families c_t, sc_t
// (docs/MATH.md §8, §9). Candidates come from exact counts for n ≤ K; each candidate
// with the largest k seen is handed to the prover (proof.hpp), and the prover's
// verdict — PROVED with a certificate, REFUTED, or UNKNOWN — is the result.
// Progressions vanishing identically on the tested range are proved as "F(An+B) = 0".
#include <functional>
#include <string>
#include <vector>

#include "family/family.hpp"
#include "modform/proof.hpp"

namespace circlet {

struct CongruenceSearchSpec {
  int t_lo = 2, t_hi = 12;
  long A_max = 50;
  long ell_max = 13;
  int k_max = 6;       // the largest power ℓ^k tried
  long test_n = 200;   // candidates: n = 0..test_n
  ProofOptions proof;  // limits of each proof
};

struct CongruenceHit {
  Family family;
  long A = 1, B = 0;
  long ell = 0;  // 0: the progression vanishes (an identity "= 0")
  int k = 0;
  std::string relation;  // as given to the prover
  ProofResult proof;
};

/// Progress: a one-line description and the fraction done.
using SearchProgress = std::function<void(const std::string&, double)>;

/// Minimal candidates only: (A, B, ℓ, k) is skipped when a proper divisor A0 of A has
/// the candidate (A0, B mod A0, ℓ, k0 ≥ k) (it is implied), and likewise for vanishing.
std::vector<CongruenceHit> search_congruences(const CongruenceSearchSpec& spec, const SearchProgress& progress = {});

}  // namespace circlet
