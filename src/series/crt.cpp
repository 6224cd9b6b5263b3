#include "series/crt.hpp"

#include "core/error.hpp"

namespace circlet {

CrtReconstructor::CrtReconstructor(std::vector<ulong> primes, bool is_signed)
    : primes_(std::move(primes)), signed_(is_signed) {
  CIRCLET_ASSERT(!primes_.empty(), "CRT needs at least one prime");
  fmpz_one(modulus_.get());
  for (size_t i = 0; i < primes_.size(); ++i) {
    const ulong p = primes_[i];
    CIRCLET_ASSERT(p >= 3 && p < (UWORD(1) << 63), "CRT prime out of range");
    preinv_.push_back(n_preinvert_limb(p));
    ulong prod = fmpz_fdiv_ui(modulus_.get(), p);
    ulong inv = 0;
    if (i > 0) {
      CIRCLET_ASSERT(prod != 0, "CRT primes are not coprime");
      inv = n_invmod(prod, p);
    }
    inverse_.push_back(inv);
    fmpz_mul_ui(modulus_.get(), modulus_.get(), p);
  }
  fmpz_sub_ui(half_.get(), modulus_.get(), 1);
  fmpz_fdiv_q_2exp(half_.get(), half_.get(), 1);
  fits128_ = fmpz_bits(modulus_.get()) <= 127;
  if (fits128_) {
    modulus128_ = 1;
    for (ulong p : primes_) modulus128_ *= p;
    half128_ = (modulus128_ - 1) / 2;
  }
}

void CrtReconstructor::reconstruct(fmpz_t out, const ulong* residues, long stride) const {
  const size_t k = primes_.size();
  // Garner: digits v_i with value = v_0 + p_0(v_1 + p_1(v_2 + …)).
  ulong small[64];
  std::vector<ulong> large;
  ulong* v = small;
  if (k > 64) {
    large.resize(k);
    v = large.data();
  }
  v[0] = residues[0];
  for (size_t i = 1; i < k; ++i) {
    const ulong p = primes_[i], pinv = preinv_[i];
    // x = (v_0 + p_0(v_1 + … + p_{i−2} v_{i−1})) mod p, by Horner from the top digit.
    ulong x = v[i - 1] % p;
    for (size_t j = i - 1; j-- > 0;) {
      x = n_mulmod2_preinv(x, primes_[j] % p, p, pinv);
      x = n_addmod(x, v[j] % p, p);
    }
    const ulong r = residues[i * stride];
    v[i] = n_mulmod2_preinv(n_submod(r, x, p), inverse_[i], p, pinv);
  }
  if (fits128_) {
    unsigned __int128 acc = v[k - 1];
    for (size_t j = k - 1; j-- > 0;) acc = acc * primes_[j] + v[j];
    if (signed_ && acc > half128_) {
      unsigned __int128 neg = modulus128_ - acc;
      fmpz_neg_uiui(out, static_cast<ulong>(neg >> 64), static_cast<ulong>(neg));
    } else {
      fmpz_set_uiui(out, static_cast<ulong>(acc >> 64), static_cast<ulong>(acc));
    }
    return;
  }
  fmpz_set_ui(out, v[k - 1]);
  for (size_t j = k - 1; j-- > 0;) {
    fmpz_mul_ui(out, out, primes_[j]);
    fmpz_add_ui(out, out, v[j]);
  }
  if (signed_ && fmpz_cmp(out, half_.get()) > 0) fmpz_sub(out, out, modulus_.get());
}

}  // namespace circlet
