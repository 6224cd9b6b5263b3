#pragma once
// Chinese remaindering of word-size residues into exact integers (Garner's
// mixed-radix form). With primes p_0..p_{k−1} and M = Π p_i, the value
//   v = v_0 + p_0 (v_1 + p_1 (v_2 + …)),  0 ≤ v_i < p_i,
// is the unique integer in [0, M) with the given residues; the signed variant
// returns the representative in (−M/2, M/2]. Correct whenever the true integer
// lies in that range (the caller chooses M from a rigorous bound).
#include <flint/fmpz.h>
#include <flint/ulong_extras.h>

#include <vector>

#include "core/flint_types.hpp"

namespace circlet {

class CrtReconstructor {
 public:
  /// `primes` must be distinct primes below 2^63; `is_signed` selects (−M/2, M/2].
  CrtReconstructor(std::vector<ulong> primes, bool is_signed);

  /// out ← the integer with residue residues[i * stride] modulo primes[i].
  void reconstruct(fmpz_t out, const ulong* residues, long stride = 1) const;

  const Fmpz& modulus() const { return modulus_; }
  const std::vector<ulong>& primes() const { return primes_; }
  bool is_signed() const { return signed_; }

 private:
  std::vector<ulong> primes_;
  std::vector<ulong> preinv_;   // n_preinvert_limb(p_i)
  std::vector<ulong> inverse_;  // (p_0 … p_{i−1})^{−1} mod p_i
  Fmpz modulus_;
  Fmpz half_;                   // ⌊(M − 1)/2⌋
  bool signed_;
  bool fits128_;                // M < 2^127: a two-limb fast path
  unsigned __int128 modulus128_ = 0, half128_ = 0;
};

}  // namespace circlet
