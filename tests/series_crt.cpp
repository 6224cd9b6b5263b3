// Tests of the Chinese remaindering (src/series/crt.hpp) against FLINT's fmpz_CRT.
#include "series/crt.hpp"

#include <flint/flint.h>

#include <catch2/catch.hpp>
#include <NTL/lzz_p.h>

using namespace circlet;

namespace {
std::vector<ulong> fft_primes(long k) {
  std::vector<ulong> p;
  for (long i = 0; i < k; ++i) {
    NTL::zz_pPush push(NTL::INIT_FFT, i);
    p.push_back(static_cast<ulong>(NTL::zz_p::modulus()));
  }
  return p;
}
}  // namespace

TEST_CASE("CRT reconstructs random integers in range, signed and unsigned", "[series][crt]") {
  flint_rand_t state;
  flint_randinit(state);
  for (long k : {1L, 2L, 3L, 5L, 9L}) {
    const auto primes = fft_primes(k);
    for (bool is_signed : {false, true}) {
      CrtReconstructor crt(primes, is_signed);
      Fmpz M(1);
      for (ulong p : primes) fmpz_mul_ui(M.get(), M.get(), p);
      CHECK(crt.modulus() == M);
      Fmpz x, y, half;
      fmpz_sub_ui(half.get(), M.get(), 1);
      fmpz_fdiv_q_2exp(half.get(), half.get(), 1);
      std::vector<ulong> r(static_cast<size_t>(k));
      for (int trial = 0; trial < 300; ++trial) {
        // Random value in the representable range, plus its extremes.
        if (trial == 0) fmpz_zero(x.get());
        else if (trial == 1) is_signed ? fmpz_set(x.get(), half.get()) : fmpz_sub_ui(x.get(), M.get(), 1);
        else if (trial == 2) is_signed ? fmpz_neg(x.get(), half.get()) : fmpz_one(x.get());
        else {
          fmpz_randm(x.get(), state, is_signed ? half.get() : M.get());
          if (is_signed && trial % 2) fmpz_neg(x.get(), x.get());
        }
        for (long i = 0; i < k; ++i) r[static_cast<size_t>(i)] = fmpz_fdiv_ui(x.get(), primes[static_cast<size_t>(i)]);
        crt.reconstruct(y.get(), r.data());
        INFO("k = " << k << " signed = " << is_signed << " x = " << x.str());
        REQUIRE(y == x);
        // FLINT's own CRT, built up prime by prime, agrees.
        Fmpz z, m(1);
        for (long i = 0; i < k; ++i) {
          Fmpz pi = Fmpz::from_ui(primes[static_cast<size_t>(i)]), ri = Fmpz::from_ui(r[static_cast<size_t>(i)]);
          fmpz_CRT(z.get(), z.get(), m.get(), ri.get(), pi.get(), i + 1 == k ? is_signed : 0);
          fmpz_mul(m.get(), m.get(), pi.get());
        }
        REQUIRE(z == x);
      }
    }
  }
  flint_randclear(state);
}

TEST_CASE("CRT with a stride reads interleaved residues", "[series][crt]") {
  const auto primes = fft_primes(3);
  CrtReconstructor crt(primes, true);
  Fmpz x = Fmpz::from_str("-123456789012345678901234567890123");
  ulong buf[9] = {0};
  for (int i = 0; i < 3; ++i) buf[3 * i] = fmpz_fdiv_ui(x.get(), primes[static_cast<size_t>(i)]);
  Fmpz y;
  crt.reconstruct(y.get(), buf, 3);
  CHECK(y == x);
}
