#include "quadratic/local_density.hpp"

#include <flint/ulong_extras.h>

#include <catch2/catch.hpp>

#include "quadratic_families.hpp"
#include <map>
#include <set>
#include <tuple>

#include "core/error.hpp"

using namespace circlet;

namespace {

const ulong kPrimes[] = {2, 3, 5, 7, 11, 13};

using circlet::testing::swept_families;

// Value tables modulo p^j, computed once per (family, p, j): every n then costs a lookup.
class CountCache {
 public:
  Fmpq normalised(const QuadraticModel& m, long n, ulong p, int j) {
    auto key = std::make_tuple(m.family.name(), p, j);
    auto it = tables_.find(key);
    if (it == tables_.end()) it = tables_.emplace(key, local_value_counts(m, p, j)).first;
    const auto& tab = it->second;
    const ulong q = tab.size();
    Fmpq out(tab[static_cast<ulong>(((n % static_cast<long>(q)) + q) % q)]);
    Fmpz norm = Fmpz::from_ui(q);
    fmpz_pow_ui(norm.get(), norm.get(), static_cast<ulong>(m.rank - 1));
    fmpq_div_fmpz(out.get(), out.get(), norm.get());
    return out;
  }

 private:
  std::map<std::tuple<std::string, ulong, int>, std::vector<Fmpz>> tables_;
};

// The sweep of docs/MATH.md §4: closed form = count at the proved stable exponent J and at J + 1,
// and the closed-form level ν_j = count for every j ≤ J + 1 (so every arc piece is checked too).
void sweep(long n_end, CountCache& cache) {
  for (const auto& f : swept_families()) {
    const QuadraticModel m = quadratic_model(f);
    for (ulong p : kPrimes)
      for (long n = 0; n < n_end; ++n) {
        if (f.kind == FamilyKind::SumOfSquares && n == 0) continue;  // X = 0
        INFO(f.name() << " p=" << p << " n=" << n);
        const Fmpz N(n);
        const int J = local_density_stable_exponent(m, N, p);
        const Fmpq beta = local_density(m, N, p);
        REQUIRE(cache.normalised(m, n, p, J) == beta);
        REQUIRE(cache.normalised(m, n, p, J + 1) == beta);
        for (int j = 0; j <= J + 1; ++j) REQUIRE(local_density_level(m, N, p, j) == cache.normalised(m, n, p, j));
        REQUIRE(local_arc_piece(m, N, p, J + 1) == Fmpq(0));
      }
  }
}

}  // namespace

TEST_CASE("closed forms equal counts modulo p^j, stable at the proved exponent (n < 24)", "[quadratic][local]") {
  CountCache cache;
  sweep(24, cache);
}

TEST_CASE("closed forms equal counts modulo p^j for T <= 11, S <= 8, p <= 13, n < 200", "[quadratic][local][slow]") {
  CountCache cache;
  sweep(200, cache);
}

TEST_CASE("block-diagonalised counts for c_t agree with the literal (P, sum) dynamic programming", "[quadratic][local]") {
  struct Case { const char* fam; ulong p; int jmax; };
  for (const Case& c : {Case{"c5", 2, 4}, Case{"c5", 3, 3}, Case{"c3", 2, 6}, Case{"c7", 3, 3}, Case{"c7", 2, 4},
                        Case{"c11", 2, 3}, Case{"c6", 5, 2}, Case{"c4", 3, 3}, Case{"c9", 2, 3}, Case{"c8", 7, 2}}) {
    const QuadraticModel m = quadratic_model(Family::parse(c.fam));
    for (int j = 1; j <= c.jmax; ++j) {
      INFO(c.fam << " p=" << c.p << " j=" << j);
      CHECK(local_value_counts(m, c.p, j) == local_value_counts_literal(m, c.p, j));
    }
  }
}

TEST_CASE("beta_p = 1 for p | t, by counting: the cases listed in docs/MATH.md Â§4 and all t <= 11", "[quadratic][local]") {
  // docs/MATH.md §4 lists these as verified; re-check them by counting at j = 1, 2 (and 3 when small).
  const std::vector<std::pair<const char*, ulong>> listed = {
      {"c9", 3}, {"c6", 2}, {"c6", 3}, {"c8", 2}, {"c10", 2}, {"c10", 5}, {"c4", 2},
      {"sc9", 3}, {"sc15", 3}, {"sc15", 5}, {"sc7", 7}, {"sc6", 2}, {"sc6", 3}, {"sc8", 2}};
  CountCache cache;
  auto check_one = [&](const QuadraticModel& m, ulong p) {
    REQUIRE(is_structural_prime(m, p));
    for (int j = 1; j <= 3; ++j) {
      if (m.sum_zero && m.family.t * std::pow(static_cast<double>(p), 3.0 * j) > 4e7) break;
      if (std::pow(static_cast<double>(p), j) > 3000) break;
      for (long n = 0; n < 60; ++n) {
        INFO(m.family.name() << " p=" << p << " j=" << j << " n=" << n);
        CHECK(cache.normalised(m, n, p, j) == Fmpq(1));
        CHECK(local_density(m, Fmpz(n), p) == Fmpq(1));
        CHECK(local_density_stable_exponent(m, Fmpz(n), p) == 1);
      }
    }
  };
  for (const auto& [fam, p] : listed) check_one(quadratic_model(Family::parse(fam)), p);
  for (int t = 2; t <= 11; ++t)
    for (ulong p : kPrimes)
      if (t % static_cast<long>(p) == 0) {
        check_one(quadratic_model({FamilyKind::Core, t}), p);
        check_one(quadratic_model({FamilyKind::SelfConjugateCore, t}), p);
      }
}

TEST_CASE("sc_7 at p = 2: the values of docs/MATH.md Â§4, and beta(4N) = beta(N)/2 beyond them", "[quadratic][local]") {
  // docs/MATH.md §4 says β_2 of sc_7 takes the values {0, 1/4, 1/2, 3/4, 1, 3/2}. Those all occur, but
  // the list is incomplete: for m = 3 squares no primitive solution has Σz² ≡ 0 mod 4, so β(4N) = β(N)/2
  // and X = 32 (n = 30) already gives 3/8, confirmed here by counting at the stable exponent and one beyond.
  const QuadraticModel m = quadratic_model(Family::parse("sc7"));
  std::set<std::string> low, all;
  for (long n = 0; n < 2000; ++n) {
    const Fmpz N(n);
    const std::string v = local_density(m, N, 2).str();
    all.insert(v);
    if (n < 200) low.insert(v);
  }
  // First occurrences: 3/2 at n = 0, 0 at 2, 1 at 3, 3/4 at 6, 1/2 at 18, 3/8 at 30, 1/4 at 78, 3/16 at 126.
  CHECK(low == std::set<std::string>{"0", "3/16", "1/4", "3/8", "1/2", "3/4", "1", "3/2"});
  CHECK(all == std::set<std::string>{"0", "1/16", "3/32", "1/8", "3/16", "1/4", "3/8", "1/2", "3/4", "1", "3/2"});
  for (long n = 0; n < 500; ++n) {  // X(4n + 6) = 4n + 8 = 4·X(n)
    INFO("n = " << n);
    Fmpq half = local_density(m, Fmpz(n), 2);
    fmpq_div_2exp(half.get(), half.get(), 1);
    CHECK(local_density(m, Fmpz(4 * n + 6), 2) == half);
  }
  for (auto [n, value] : {std::pair<long, Fmpq>{30, Fmpq(3, 8)}, {78, Fmpq(1, 4)}, {126, Fmpq(3, 16)}}) {
    const int J = local_density_stable_exponent(m, Fmpz(n), 2);
    CHECK(local_density(m, Fmpz(n), 2) == value);
    CHECK(local_density_by_counting(m, Fmpz(n), 2, J) == value);
    CHECK(local_density_by_counting(m, Fmpz(n), 2, J + 1) == value);
  }
}

TEST_CASE("sc_11 at p = 2 ranges over [5/8, 5/4] as docs/MATH.md Â§4 says", "[quadratic][local]") {
  const QuadraticModel m = quadratic_model(Family::parse("sc11"));
  Fmpq lo = local_density(m, Fmpz(0), 2), hi = lo;
  for (long n = 1; n < 2000; ++n) {
    const Fmpq b = local_density(m, Fmpz(n), 2);
    if (fmpq_cmp(b.get(), lo.get()) < 0) lo = b;
    if (fmpq_cmp(b.get(), hi.get()) > 0) hi = b;
  }
  CHECK(lo == Fmpq(5, 8));
  CHECK(hi == Fmpq(5, 4));
}

TEST_CASE("beta_2 = 0 classes of sc_7 exist and the count vanishes on them", "[quadratic][local]") {
  // sc_7(n) = #{y ∈ Z³ : 7Σy_i² − 6y_0 − 4y_1 − 2y_2 = n} (docs/MATH.md §2), enumerated directly:
  // 7y² − 6|y| ≥ 7y²/2 once |y| ≥ 2, so |y_i| ≤ 8 covers n < 200.
  const QuadraticModel m = quadratic_model(Family::parse("sc7"));
  std::vector<long> count(200, 0);
  for (long a = -8; a <= 8; ++a)
    for (long b = -8; b <= 8; ++b)
      for (long c = -8; c <= 8; ++c) {
        const long v = 7 * (a * a + b * b + c * c) - 6 * a - 4 * b - 2 * c;
        if (v >= 0 && v < 200) count[v]++;
      }
  int zero_classes = 0;
  for (long n = 0; n < 200; ++n)
    if (local_density(m, Fmpz(n), 2).is_zero()) {
      ++zero_classes;
      INFO("n = " << n);
      CHECK(count[n] == 0);
    }
  CHECK(zero_classes > 0);
}

namespace {

// Σ_{d | n, 4 ∤ d} d, and Σ_{d | n} (−1)^{n+d} d³, by trial division.
long jacobi4_sum(long n) {
  long s = 0;
  for (long d = 1; d <= n; ++d)
    if (n % d == 0 && d % 4 != 0) s += d;
  return s;
}
long jacobi8_sum(long n) {
  long s = 0;
  for (long d = 1; d <= n; ++d)
    if (n % d == 0) s += ((n + d) % 2 == 0 ? 1 : -1) * d * d * d;
  return s;
}

}  // namespace

TEST_CASE("sq4: the local factors of Jacobi's four-square formula", "[quadratic][local]") {
  // Jacobi (1829, Fundamenta nova theoriae functionum ellipticarum; quoted from memory): r_4(n) = 8 Σ_{d|n, 4∤d} d.
  // With σ_∞ = π²n and Π_{p odd}(1 − p⁻²) = (6/π²)/(3/4) = 8/π², the Siegel product
  // r_4(n) = π²n Π_p β_p splits into β_2 = 1 (n odd), 3/2^a (2^a ∥ n, a ≥ 1), and for odd p
  // β_p = (1 − p⁻²) Σ_{i ≤ v_p(n)} p^{−i}; then r_4(n) = 8n·β_2·Π_{p | n odd} Σ_{i ≤ v} p^{−i}.
  const QuadraticModel m = quadratic_model(Family::parse("sq4"));
  for (long n = 1; n <= 300; ++n) {
    INFO("n = " << n);
    const Fmpz N(n);
    long a = 0, odd = n;
    while (odd % 2 == 0) odd /= 2, ++a;
    CHECK(local_density(m, N, 2) == (a == 0 ? Fmpq(1) : Fmpq(3, 1UL << a)));
    Fmpq product(8 * n);
    fmpq_mul(product.get(), product.get(), local_density(m, N, 2).get());
    for (ulong p = 3; p <= 31; p += 2) {
      if (!n_is_prime(p)) continue;
      long v = 0;
      for (long x = n; x % static_cast<long>(p) == 0; x /= static_cast<long>(p)) ++v;
      Fmpq geom(0), pinv(1);
      for (long i = 0; i <= v; ++i) {
        fmpq_add(geom.get(), geom.get(), pinv.get());
        fmpq_div_fmpz(pinv.get(), pinv.get(), Fmpz(static_cast<slong>(p)).get());
      }
      Fmpq expect = geom;
      fmpq_mul(expect.get(), expect.get(), Fmpq(static_cast<slong>(p * p - 1), p * p).get());
      CHECK(local_density(m, N, p) == expect);
      if (v > 0) fmpq_mul(product.get(), product.get(), geom.get());
    }
    // Primes above 31 dividing n ≤ 300 appear at most once.
    for (const Fmpz& P : local_density_special_primes(m, N))
      if (const ulong p = fmpz_get_ui(P.get()); p > 31) fmpq_mul(product.get(), product.get(), Fmpq(static_cast<slong>(p + 1), p).get());
    CHECK(product == Fmpq(8 * jacobi4_sum(n)));
  }
}

TEST_CASE("sq8: the Siegel product reproduces Jacobi's eight-square formula exactly", "[quadratic][local]") {
  // r_8(n) = 16 Σ_{d|n} (−1)^{n+d} d³ (Jacobi; see Grosswald, Representations of Integers as Sums
  // of Squares, Springer 1985, ch. 9; quoted from memory). No cusp forms of weight 4 on Γ0(4), so r_8 = σ_∞ Π β_p with
  // σ_∞ = π⁴n³/Γ(4) and Π_{p odd}(1 − p⁻⁴) = (90/π⁴)/(15/16) = 96/π⁴: r_8(n) = 16n³·β_2·Π_{p|n odd} β_p/(1 − p⁻⁴).
  const QuadraticModel m = quadratic_model(Family::parse("sq8"));
  for (long n = 1; n <= 200; ++n) {
    INFO("n = " << n);
    const Fmpz N(n);
    Fmpq product(16 * n * n * n);
    for (const Fmpz& P : local_density_special_primes(m, N)) {
      const ulong p = fmpz_get_ui(P.get());
      fmpq_mul(product.get(), product.get(), local_density(m, N, p).get());
      if (p != 2) {
        const long p4 = static_cast<long>(p * p * p * p);
        fmpq_mul(product.get(), product.get(), Fmpq(p4, p4 - 1).get());
      }
    }
    CHECK(product == Fmpq(16 * jacobi8_sum(n)));
  }
}

TEST_CASE("generic factors outside the special primes follow the character of the discriminant", "[quadratic][local]") {
  CHECK(local_character_discriminant(quadratic_model(Family::parse("c5")), Fmpz(3)) == Fmpz(5));
  CHECK(local_character_discriminant(quadratic_model(Family::parse("c7")), Fmpz(3)) == Fmpz(-7));
  CHECK(local_character_discriminant(quadratic_model(Family::parse("c9")), Fmpz(3)) == Fmpz(1));
  CHECK(local_character_discriminant(quadratic_model(Family::parse("c3")), Fmpz(3)) == Fmpz(-3));
  CHECK(local_character_discriminant(quadratic_model(Family::parse("sc4")), Fmpz(3)) == Fmpz(-4));
  CHECK(local_character_discriminant(quadratic_model(Family::parse("sc8")), Fmpz(3)) == Fmpz(1));
  CHECK(local_character_discriminant(quadratic_model(Family::parse("sq2")), Fmpz(3)) == Fmpz(-4));
  CHECK(local_character_discriminant(quadratic_model(Family::parse("sq4")), Fmpz(3)) == Fmpz(1));
  // sq3 (r = 3): D from (−1)·n, e.g. n = 1 → −4, n = 3 → −3, n = 2 → −8.
  CHECK(local_character_discriminant(quadratic_model(Family::parse("sq3")), Fmpz(1)) == Fmpz(-4));
  CHECK(local_character_discriminant(quadratic_model(Family::parse("sq3")), Fmpz(3)) == Fmpz(-3));
  CHECK(local_character_discriminant(quadratic_model(Family::parse("sq3")), Fmpz(2)) == Fmpz(-8));
  for (const auto& f : swept_families()) {
    const QuadraticModel m = quadratic_model(f);
    for (long n = 1; n < 60; ++n) {
      const Fmpz N(n);
      const auto special = local_density_special_primes(m, N);
      CHECK(std::is_sorted(special.begin(), special.end()));
      for (ulong p = 2; p < 100; ++p) {
        if (!n_is_prime(p)) continue;
        INFO(f.name() << " n=" << n << " p=" << p);
        const bool is_special = std::binary_search(special.begin(), special.end(), Fmpz::from_ui(p));
        CHECK(is_special == (is_structural_prime(m, p) || local_density_stable_exponent(m, N, p) > (p == 2 ? 3 : 1)));
        if (is_special) {
          CHECK_THROWS_AS(local_density_generic_factor(m, N, p), UserError);
        } else {
          CHECK(local_density_generic_factor(m, N, p) == local_density(m, N, p));
        }
      }
    }
  }
}

TEST_CASE("primes beyond 64 bits: special primes and closed forms take Fmpz primes", "[quadratic][local]") {
  // c_6: X = (24n + 35)/24. With the prime P = 2^64 + 13 take n = (kP − 35)/24 for the smallest
  // k > 0 making it an integer; then P exactly divides the numerator of X (k < 48 < P).
  Fmpz P;
  fmpz_set_str(P.get(), "18446744073709551629", 10);  // 2^64 + 13, prime (checked below)
  REQUIRE(fmpz_is_prime(P.get()));
  const QuadraticModel m = quadratic_model(Family::parse("c6"));
  Fmpz n;
  for (long k = 1; k < 48; ++k) {
    Fmpz num;
    fmpz_mul_si(num.get(), P.get(), k);
    fmpz_sub_ui(num.get(), num.get(), 35);
    if (fmpz_fdiv_ui(num.get(), 24) == 0 && fmpz_sgn(num.get()) > 0) {
      fmpz_divexact_ui(n.get(), num.get(), 24);
      break;
    }
  }
  const auto special = local_density_special_primes(m, n);
  REQUIRE(std::binary_search(special.begin(), special.end(), P));
  // r = 5 odd, v = 1: a_1 = 0 (odd i ≤ v), a_2 = −p^{2(1−r/2)−1} = −p^{−4}: β = 1 − p^{−4}.
  Fmpq expect(1), p4;
  Fmpz P4;
  fmpz_pow_ui(P4.get(), P.get(), 4);
  fmpq_set_fmpz_frac(p4.get(), Fmpz(1).get(), P4.get());
  fmpq_sub(expect.get(), expect.get(), p4.get());
  CHECK(local_density(m, n, P) == expect);
  CHECK(local_density_stable_exponent(m, n, P) == 2);
  CHECK_THROWS_WITH(local_density_generic_factor(m, n, P), Catch::Contains("is a special prime"));
  Fmpz Q;
  fmpz_nextprime(Q.get(), P.get(), 1);
  CHECK(local_density_generic_factor(m, n, Q) == local_density(m, n, Q));
  CHECK_THROWS_WITH(local_density(m, n, Fmpz(91)), Catch::Contains("p = 91 is not a prime"));
}

TEST_CASE("arc pieces sum to the local density and vanish beyond the stable exponent", "[quadratic][local]") {
  for (const char* name : {"c6", "c7", "sc7", "sc11", "sq5", "c4", "sc8"}) {
    const QuadraticModel m = quadratic_model(Family::parse(name));
    for (long n : {1L, 7L, 24L, 250L, 1000L, 12345L, 3L * 3 * 3 * 3 * 5 * 5 * 7 * 7 * 7}) {
      for (ulong p : {2UL, 3UL, 5UL, 7UL}) {
        INFO(name << " n=" << n << " p=" << p);
        const Fmpz N(n);
        const int J = local_density_stable_exponent(m, N, p);
        Fmpq s(0);
        for (int j = 0; j <= J + 2; ++j) fmpq_add(s.get(), s.get(), local_arc_piece(m, N, p, j).get());
        CHECK(s == local_density(m, N, p));
        CHECK(local_arc_piece(m, N, p, J + 1) == Fmpq(0));
        CHECK(local_arc_piece(m, N, p, 0) == Fmpq(1));
      }
    }
  }
}

TEST_CASE("bad arguments are rejected with a clear message", "[quadratic][local][errors]") {
  const QuadraticModel m = quadratic_model(Family::parse("c5"));
  CHECK_THROWS_WITH(local_density(m, Fmpz(3), 4), Catch::Contains("p = 4 is not a prime"));
  CHECK_THROWS_WITH(local_density(quadratic_model(Family::parse("c1")), Fmpz(3), 3),
                    Catch::Contains("family c1 has rank 0"));
  CHECK_THROWS_WITH(local_density(quadratic_model(Family::parse("sq4")), Fmpz(0), 3),
                    Catch::Contains("X = n + Δ = 0"));
  CHECK_THROWS_WITH(local_density_by_counting(m, Fmpz(3), 3, 40), Catch::Contains("too large"));
  CHECK_THROWS_WITH(local_arc_piece(m, Fmpz(3), 3, -1), Catch::Contains("must be non-negative"));
  CHECK_THROWS_WITH(local_value_counts_literal(quadratic_model(Family::parse("sc5")), 3, 1),
                    Catch::Contains("for c_t only"));
}
