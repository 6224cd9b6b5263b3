// Tests of the a-priori coefficient bounds (src/series/coefficient_bound.hpp):
// they really bound the true maxima, and they are not absurdly loose.
#include "series/coefficient_bound.hpp"

#include <flint/fmpz_poly.h>

#include <catch2/catch.hpp>
#include <cmath>

#include "series/eta_series.hpp"

using namespace circlet;

namespace {
Fmpz max_abs(const IntegerSeries& s) {
  Fmpz m, a;
  for (long n = 0; n < s.length(); ++n) {
    fmpz_abs(a.get(), s.at(n));
    if (fmpz_cmp(a.get(), m.get()) > 0) fmpz_set(m.get(), a.get());
  }
  return m;
}
}  // namespace

TEST_CASE("family bounds dominate the true maxima and are within a square of them", "[series][bound]") {
  for (const char* name : {"c2", "c3", "c5", "c7", "c12", "c25", "sc3", "sc7", "sc9", "sc10", "sc16", "sq1", "sq3", "sq8"}) {
    const Family f = Family::parse(name);
    for (long N : {10L, 200L, 3000L}) {
      INFO(name << " N = " << N);
      const CoefficientBound b = family_coefficient_bound(f, N);
      CHECK(b.nonnegative);
      // The true values, with the prime count taken from the general majorant
      // bound (independent of the box bound under test).
      SeriesPlan plan = plan_eta_series(f.eta_quotient(), N);
      IntegerSeries s = compute_series(plan);
      const Fmpz m = max_abs(s);
      CHECK(fmpz_cmp(m.get(), b.bound.get()) <= 0);
      // Not absurd: bits(bound) ≤ 2·bits(max) + 16 once the values are non-trivial.
      if (fmpz_bits(m.get()) >= 8) CHECK(static_cast<long>(fmpz_bits(b.bound.get())) <= 2 * static_cast<long>(fmpz_bits(m.get())) + 16);
    }
  }
}

TEST_CASE("large T: the partition cap keeps the prime count small", "[series][bound]") {
  // c_1000(n) = p(n) for n < 1000; the box bound would be 19^999.
  const CoefficientBound b = family_coefficient_bound(Family::parse("c1000"), 100);
  CHECK(b.method.find("partition") != std::string::npos);
  CHECK(fmpz_cmp(b.bound.get(), Fmpz(190569292).get()) >= 0);  // p(100) (Hardy–Ramanujan 1918; from memory)
  CHECK(fmpz_bits(b.bound.get()) <= 40);
  IntegerSeries s = family_series(Family::parse("c1000"), 100);
  CHECK(s.value(100) == Fmpz(190569292));
  CHECK(plan_family_series(Family::parse("sc999"), 200).primes.size() == 1);
}

TEST_CASE("bound values by hand", "[series][bound]") {
  // c_7, N = 0: the box gives 2^6 (8X/t = 16/7), the partition cap p(0) = 1 wins.
  CHECK(family_coefficient_bound(Family::parse("c7"), 0).bound == Fmpz(1));
  // c_7, N = 10^5: 8X/t = (24N + 48)/21 = 114287.9…, ⌊sqrt⌋ = 338, bound 339^6.
  Fmpz b339;
  fmpz_ui_pow_ui(b339.get(), 339, 6);
  CHECK(fmpz_cmp(family_coefficient_bound(Family::parse("c7"), 100000).bound.get(), b339.get()) <= 0);
  // c_1: a single coefficient 1, bound (…)^0 = 1.
  CHECK(family_coefficient_bound(Family::parse("c1"), 1000).bound == Fmpz(1));
  // sq3 at N = 100: box (2·10 + 1)^3 = 9261; slice 2·V_2·(10 + √2/2)² = 2π·114.642… = 720.31…
  CHECK(family_coefficient_bound(Family::parse("sq3"), 100).bound == Fmpz(721));
  CHECK(family_coefficient_bound(Family::parse("sq3"), 100).method.find("slice") != std::string::npos);
  // sc7 at N = 1000: S = 36 + 16 + 4 = 56, 4X/t = 28056/49 = 572.5…, ⌊sqrt⌋ = 23, bound 24^3.
  CHECK(fmpz_cmp(family_coefficient_bound(Family::parse("sc7"), 1000).bound.get(), Fmpz(13824).get()) <= 0);
  // c_7 to N = 10^7 fits one 60-bit FFT prime thanks to the slice bound
  // (2 V_5 (√X + 7√5/4)^5 / 3.5^3 ≈ 7.8·10^16; the box bound is ≈ 2^71).
  CHECK(plan_family_series(Family::parse("c7"), 10000000).primes.size() == 1);
}

TEST_CASE("general majorant bound dominates |coefficients| and tracks E(q)^-A", "[series][bound]") {
  for (const EtaQuotient& q : std::vector<EtaQuotient>{{{1, 24}}, {{1, -1}}, {{1, 5}, {2, -3}, {3, 7}}, {{1, -3}, {5, 4}, {10, -1}}}) {
    long A = 0;
    for (const auto& f : q) A += std::labs(f.e);
    for (long N : {1L, 50L, 2000L}) {
      const CoefficientBound b = eta_quotient_coefficient_bound(q, N, 64);
      CHECK_FALSE(b.nonnegative);
      SeriesPlan plan = plan_eta_series(q, N);
      IntegerSeries s = compute_series(plan);
      CHECK(fmpz_cmp(max_abs(s).get(), b.bound.get()) <= 0);
      // The majorant coefficient [q^N] E(q)^{−A} itself (exact, FLINT) and the
      // bound differ by a modest factor: the saddle-point bound loses O(N^{3/4}),
      // and x/(1−x) exceeds 1/log(1/x) by about 1/2, i.e. e^{Aπ²/12} ≈ 2^{1.2A}:
      //   bits(bound) ≤ bits(majorant) + 2 log2 N + 1.5 A + 12.
      fmpz_poly_t E;
      fmpz_poly_init(E);
      for (long k = -N - 2; k <= N + 2; ++k) {
        const long e = k * (3 * k - 1) / 2;
        if (e >= 0 && e <= N) fmpz_poly_set_coeff_si(E, e, (k % 2) ? -1 : 1);
      }
      fmpz_poly_pow_trunc(E, E, static_cast<ulong>(A), N + 1);
      fmpz_poly_inv_series(E, E, N + 1);
      Fmpz maj;
      fmpz_poly_get_coeff_fmpz(maj.get(), E, N);
      fmpz_poly_clear(E);
      CHECK(fmpz_cmp(maj.get(), b.bound.get()) <= 0);
      CHECK(static_cast<double>(fmpz_bits(b.bound.get())) <= static_cast<double>(fmpz_bits(maj.get())) + 2 * std::log2(N + 1.0) + 1.5 * A + 12);
    }
  }
}
