// Tests of the exact series engine (src/series/eta_series.hpp) against
// references outside the engine: the hook-length definition, the abacus
// lattice model (docs/MATH.md §2), OEIS tables, PARI/GP and exact series over Z.
#include "series/eta_series.hpp"

#include <flint/fmpz_poly.h>
#include <unistd.h>

#include <catch2/catch.hpp>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <functional>
#include <map>
#include <string>
#include <vector>

#include "core/error.hpp"

using namespace circlet;

namespace {

std::vector<long> as_longs(const IntegerSeries& s) {
  std::vector<long> out;
  for (long n = 0; n < s.length(); ++n) {
    REQUIRE(fmpz_fits_si(s.at(n)));
    out.push_back(fmpz_get_si(s.at(n)));
  }
  return out;
}

// All partitions of n (parts non-increasing), by recursion.
void partitions(long n, long max_part, std::vector<long>& cur, const std::function<void(const std::vector<long>&)>& f) {
  if (n == 0) {
    f(cur);
    return;
  }
  for (long p = std::min(n, max_part); p >= 1; --p) {
    cur.push_back(p);
    partitions(n - p, p, cur, f);
    cur.pop_back();
  }
}

std::vector<long> conjugate(const std::vector<long>& la) {
  std::vector<long> c(la.empty() ? 0 : static_cast<size_t>(la[0]), 0);
  for (long part : la)
    for (long j = 0; j < part; ++j) ++c[static_cast<size_t>(j)];
  return c;
}

// Hook length of cell (i, j): arm + leg + 1 = (λ_i − j − 1) + (λ'_j − i − 1) + 1.
bool is_core(const std::vector<long>& la, long t) {
  const auto c = conjugate(la);
  for (size_t i = 0; i < la.size(); ++i)
    for (long j = 0; j < la[i]; ++j) {
      const long hook = (la[i] - j - 1) + (c[static_cast<size_t>(j)] - static_cast<long>(i) - 1) + 1;
      if (hook % t == 0) return false;
    }
  return true;
}

// Exact series over Z (FLINT fmpz_poly): Π_d E(q^d)^{e_d} to length N + 1,
// with E from the pentagonal theorem, powers by fmpz_poly_pow_trunc and
// inverses by fmpz_poly_inv_series. An independent route to the same numbers.
void exact_eta_series(fmpz_poly_t out, const EtaQuotient& q, long N) {
  const long L = N + 1;
  fmpz_poly_one(out);
  for (const auto& f : q) {
    fmpz_poly_t E, P;
    fmpz_poly_init(E);
    fmpz_poly_init(P);
    for (long k = -L; k <= L; ++k) {
      const long e = k * (3 * k - 1) / 2;  // generalised pentagonal numbers
      if (e * f.d < L && e >= 0) fmpz_poly_set_coeff_si(E, e * f.d, (k % 2) ? -1 : 1);
    }
    fmpz_poly_pow_trunc(P, E, static_cast<ulong>(std::labs(f.e)), L);
    if (f.e < 0) fmpz_poly_inv_series(P, P, L);
    fmpz_poly_mullow(out, out, P, L);
    fmpz_poly_clear(E);
    fmpz_poly_clear(P);
  }
}

bool have_gp() { return std::system("command -v gp >/dev/null 2>&1") == 0; }

// Runs a gp script and returns its stdout lines.
std::vector<std::string> run_gp(const std::string& script) {
  const std::string path = "/tmp/circlet_series_test_" + std::to_string(::getpid()) + ".gp";
  FILE* f = std::fopen(path.c_str(), "w");
  REQUIRE(f);
  std::fputs(script.c_str(), f);
  std::fclose(f);
  FILE* p = popen(("gp -q -f --default parisizemax=1000000000 < " + path + " 2>&1").c_str(), "r");
  REQUIRE(p);
  std::vector<std::string> lines;
  char buf[1 << 16];
  while (std::fgets(buf, sizeof buf, p)) {
    std::string s(buf);
    while (!s.empty() && (s.back() == '\n' || s.back() == '\r')) s.pop_back();
    lines.push_back(s);
  }
  pclose(p);
  std::remove(path.c_str());
  return lines;
}

}  // namespace

TEST_CASE("definition: t-cores and self-conjugate t-cores by hook lengths, n <= 25, T <= 8", "[series]") {
  const long N = 25;
  std::map<long, std::vector<long>> core, sc;
  for (long t = 1; t <= 8; ++t) {
    core[t].assign(N + 1, 0);
    sc[t].assign(N + 1, 0);
  }
  std::vector<long> cur;
  for (long n = 0; n <= N; ++n)
    partitions(n, n, cur, [&](const std::vector<long>& la) {
      const bool self_conjugate = conjugate(la) == la;
      for (long t = 1; t <= 8; ++t)
        if (is_core(la, t)) {
          ++core[t][static_cast<size_t>(n)];
          if (self_conjugate) ++sc[t][static_cast<size_t>(n)];
        }
    });
  for (long t = 1; t <= 8; ++t) {
    INFO("T = " << t);
    CHECK(as_longs(family_series(Family{FamilyKind::Core, static_cast<int>(t)}, N)) == core[t]);
    CHECK(as_longs(family_series(Family{FamilyKind::SelfConjugateCore, static_cast<int>(t)}, N)) == sc[t]);
  }
}

TEST_CASE("abacus model: lattice vectors of docs/MATH.md Â§2 match the engine", "[series]") {
  // c_t(n) = #{x ∈ Z^t : Σx = 0, (t/2)Σx² + Σ i·x_i = n}; enumerate the free
  // coordinates x_0..x_{t−2} in a box |x_i| ≤ R and set x_{t−1} = −Σ.
  for (long t = 2; t <= 6; ++t) {
    const long N = 30;
    const long R = static_cast<long>(std::sqrt(2.0 * (N + t * t) / t)) + 2;
    std::vector<long> count(N + 1, 0), x(static_cast<size_t>(t), 0);
    std::function<void(long)> rec = [&](long i) {
      if (i == t - 1) {
        long s = 0;
        for (long j = 0; j < t - 1; ++j) s += x[static_cast<size_t>(j)];
        x[static_cast<size_t>(t - 1)] = -s;
        long twice_n = 0;  // 2n = tΣx² + 2Σ i x_i
        for (long j = 0; j < t; ++j) twice_n += t * x[static_cast<size_t>(j)] * x[static_cast<size_t>(j)] + 2 * j * x[static_cast<size_t>(j)];
        REQUIRE(twice_n % 2 == 0);
        if (twice_n / 2 <= N) ++count[static_cast<size_t>(twice_n / 2)];
        return;
      }
      for (long v = -R; v <= R; ++v) {
        x[static_cast<size_t>(i)] = v;
        rec(i + 1);
      }
    };
    rec(0);
    INFO("c_" << t);
    CHECK(as_longs(family_series(Family{FamilyKind::Core, static_cast<int>(t)}, N)) == count);
  }
  // sc_t(n) = #{y ∈ Z^m : tΣy² + Σ (2i+1−t) y_i = n}, m = ⌊t/2⌋.
  for (long t = 2; t <= 11; ++t) {
    const long N = 60, m = t / 2;
    const long R = static_cast<long>(std::sqrt(static_cast<double>(N + t * t) / t)) + 2;
    std::vector<long> count(N + 1, 0), y(static_cast<size_t>(m), 0);
    std::function<void(long)> rec = [&](long i) {
      if (i == m) {
        long n = 0;
        for (long j = 0; j < m; ++j) n += t * y[static_cast<size_t>(j)] * y[static_cast<size_t>(j)] + (2 * j + 1 - t) * y[static_cast<size_t>(j)];
        if (n >= 0 && n <= N) ++count[static_cast<size_t>(n)];
        return;
      }
      for (long v = -R; v <= R; ++v) {
        y[static_cast<size_t>(i)] = v;
        rec(i + 1);
      }
    };
    rec(0);
    INFO("sc_" << t);
    CHECK(as_longs(family_series(Family{FamilyKind::SelfConjugateCore, static_cast<int>(t)}, N)) == count);
  }
}

TEST_CASE("OEIS: A045831 (4-cores), A053724 (7-cores), A175595, A000700", "[series][oeis]") {
  // A045831, Number of 4-core partitions of n, terms n = 0..50 as read from the
  // OEIS entry (https://oeis.org/A045831).
  const std::vector<long> a045831 = {1, 1, 2, 3, 1, 3, 3, 3, 4, 4, 2, 2, 7, 3, 5, 6, 2, 4, 7, 3, 4, 7, 5, 8, 5, 4,
                                     4, 8, 5, 6, 7, 2, 9, 11, 3, 8, 9, 4, 6, 5, 7, 5, 14, 7, 4, 10, 5, 10, 11, 3, 9};
  CHECK(as_longs(family_series(Family::parse("c4"), 50)) == a045831);
  // A053724, Number of 7-core partitions of n, n = 0..58, read from the OEIS entry.
  const std::vector<long> a053724 = {1,   1,   2,   3,   5,   7,   11,  8,   15,  16,  21,  21,  28,  24,  44,
                                     36,  49,  45,  63,  49,  74,  64,  85,  72,  105, 82,  133, 112, 120, 120,
                                     165, 122, 180, 147, 186, 176, 225, 168, 255, 210, 245, 224, 324, 219, 338,
                                     276, 341, 294, 385, 288, 441, 352, 410, 366, 518, 360, 506, 435, 504};
  CHECK(as_longs(family_series(Family::parse("c7"), 58)) == a053724);
  // A175595, square array A(n, t) = number of t-core partitions of n; the rows
  // printed in the entry ("Square array A(n,t) begins"), columns t = 1..7:
  const std::vector<std::vector<long>> a175595 = {
      {1, 1, 1, 1, 1, 1, 1}, {0, 1, 1, 1, 1, 1, 1}, {0, 0, 2, 2, 2, 2, 2}, {0, 1, 0, 3, 3, 3, 3},
      {0, 0, 2, 1, 5, 5, 5}, {0, 0, 1, 3, 2, 7, 7}, {0, 1, 2, 3, 6, 5, 11}, {0, 0, 0, 3, 5, 9, 8}};
  for (int t = 1; t <= 7; ++t) {
    auto s = as_longs(family_series(Family{FamilyKind::Core, t}, 7));
    for (size_t n = 0; n < 8; ++n) CHECK(s[n] == a175595[n][static_cast<size_t>(t - 1)]);
  }
  // A000700 (self-conjugate partitions; values for n = 1..20 as listed on
  // MathWorld's "Self-Conjugate Partition" page). For n < t every hook is < t,
  // so sc_t(n) counts all self-conjugate partitions of n.
  const std::vector<long> a000700 = {1, 0, 1, 1, 1, 1, 1, 2, 2, 2, 2, 3, 3, 3, 4, 5, 5, 5, 6, 7};
  auto sc21 = as_longs(family_series(Family::parse("sc21"), 20));
  CHECK(std::vector<long>(sc21.begin() + 1, sc21.end()) == a000700);
}

namespace {
// 12·H(D) for the Hurwitz class number H(D), D > 0 (H(D) = 0 unless D ≡ 0, 3 mod 4):
// reduced forms (a, b, c), b² − 4ac = −D, |b| ≤ a ≤ c, b ≥ 0 when |b| = a or a = c;
// the classes of a(x² + y²) weigh 1/2 and of a(x² + xy + y²) weigh 1/3.
long twelve_hurwitz(long D) {
  if (D <= 0 || (D % 4 != 0 && D % 4 != 3)) return 0;
  long total = 0;
  for (long a = 1; 3 * a * a <= D; ++a)
    for (long b = -a + 1; b <= a; ++b) {
      const long num = b * b + D;
      if (num % (4 * a) != 0) continue;
      const long c = num / (4 * a);
      if (c < a || (a == c && b < 0)) continue;
      if (a == c && b == 0) total += 6;
      else if (a == b && b == c) total += 4;
      else total += 12;
    }
  return total;
}
// 12·H(x) for rational x = num/den: 0 unless an integer.
long twelve_hurwitz_frac(long num, long den) { return num % den ? 0 : twelve_hurwitz(num / den); }
}  // namespace

TEST_CASE("published theorems on sc_7 and 4-cores", "[series]") {
  const long N = 400;
  IntegerSeries sc7 = family_series(Family::parse("sc7"), 8 * N + 7);
  // K. Bringmann, B. Kane, "Extending Ono and Raji's relations between class numbers
  // and self-conjugate 7-cores", arXiv:2005.07020v1 (2020) — the title of version 1,
  // read; later versions of the same number (with J. Males) are titled "On t-core and
  // self-conjugate (2t−1)-core partitions in arithmetic progressions" (docs/MATH.md §11).
  // Theorem 1.1 (read): for n ∈ N,
  //   sc_7(n) = (H(28n+56) − H((4n+8)/7) − 2H(7n+14) + 2H((n+2)/7)) / 4.
  for (long n = 1; n <= N; ++n) {
    const long rhs12 = twelve_hurwitz(28 * n + 56) - twelve_hurwitz_frac(4 * n + 8, 7) -
                       2 * twelve_hurwitz(7 * n + 14) + 2 * twelve_hurwitz_frac(n + 2, 7);
    if (48 * fmpz_get_si(sc7.at(n)) != rhs12) FAIL("Theorem 1.1 fails at n = " << n);
  }
  // K. Ono, W. Raji, "Class numbers and self-conjugate 7-cores", arXiv:1909.05209 (abstract read):
  // sc_7(n) = 0 for n ≡ 7 (mod 8).
  for (long n = 7; n <= 8 * N + 7; n += 8) REQUIRE(fmpz_is_zero(sc7.at(n)));
  // Hirschhorn and Sellers, "Some amazing facts about 4-cores", J. Number Theory
  // 60 (1996) 51–69 (bibliographic data read in OEIS A045831; identities quoted
  // from memory, checked here): for k ≥ 1, with a_4 = c_4,
  //   a_4(3^{2k+1} n + (5·3^{2k} − 5)/8)    = 3^k a_4(3n),
  //   a_4(3^{2k+1} n + (13·3^{2k} − 5)/8)   = (2·3^k − 1) a_4(3n + 1),
  //   a_4(3^{2k+2} n + (7·3^{2k+1} − 5)/8)  = ((3^{k+1} − 1)/2) a_4(9n + 2).
  IntegerSeries c4 = family_series(Family::parse("c4"), 200000);
  auto a4 = [&](long n) { return fmpz_get_si(c4.at(n)); };
  long p3 = 1;
  for (long k = 1; k <= 3; ++k) {
    p3 *= 3;  // 3^k
    const long p2k = p3 * p3, p2k1 = 3 * p2k;
    for (long n = 0; 9 * p2k * n + 7 * p2k1 < 200000; ++n) {
      INFO("k = " << k << " n = " << n);
      REQUIRE(a4(p2k1 * n + (5 * p2k - 5) / 8) == p3 * a4(3 * n));
      REQUIRE(a4(p2k1 * n + (13 * p2k - 5) / 8) == (2 * p3 - 1) * a4(3 * n + 1));
      REQUIRE(a4(3 * p2k1 * n + (7 * p2k1 - 5) / 8) == (3 * p3 - 1) / 2 * a4(9 * n + 2));
    }
  }
}

TEST_CASE("PARI/GP: eta quotient series agree up to N = 2000", "[series][gp]") {
  if (!have_gp()) {
    WARN("gp not found on PATH: skipping the PARI/GP comparison");
    return;
  }
  const long N = 2000;
  for (const char* name : {"c5", "c12", "c40", "sc9", "sc10", "sq3"}) {
    const Family f = Family::parse(name);
    const EtaQuotient q = f.eta_quotient();
    // PARI: eta(x + O(x^L)) is the series Π(1 − x^k) (no q^{1/24}).
    std::string expr = "1";
    for (const auto& fac : q)
      expr += "*eta(x^" + std::to_string(fac.d) + "+O(x^" + std::to_string(N + 1) + "))^(" + std::to_string(fac.e) + ")";
    const std::string script = "s=" + expr + ";\nfor(n=0," + std::to_string(N) + ",print(polcoeff(s,n)));\nquit;\n";
    const auto lines = run_gp(script);
    REQUIRE(lines.size() == static_cast<size_t>(N + 1));
    IntegerSeries s = family_series(f, N);
    for (long n = 0; n <= N; ++n) {
      INFO(name << " n = " << n);
      if (lines[static_cast<size_t>(n)] != s.value(n).str()) FAIL(name << " n = " << n << ": gp " << lines[static_cast<size_t>(n)] << " vs " << s.value(n).str());
    }
  }
}

TEST_CASE("CRT with several primes: c_40 to N = 5000 equals the exact series over Z", "[series][crt]") {
  const long N = 5000;
  const Family f = Family::parse("c40");
  SeriesPlan plan = plan_family_series(f, N);
  CHECK(plan.primes.size() >= 3);
  IntegerSeries s = compute_series(plan);
  fmpz_poly_t exact;
  fmpz_poly_init(exact);
  exact_eta_series(exact, f.eta_quotient(), N);
  Fmpz c, maxc;
  for (long n = 0; n <= N; ++n) {
    fmpz_poly_get_coeff_fmpz(c.get(), exact, n);
    if (!fmpz_equal(c.get(), s.at(n))) FAIL("n = " << n);
    if (fmpz_cmp(c.get(), maxc.get()) > 0) fmpz_set(maxc.get(), c.get());
  }
  // The values really need more than two 60-bit primes.
  CHECK(fmpz_bits(maxc.get()) > 100);
  fmpz_poly_clear(exact);
}

TEST_CASE("signed eta quotients through the general bound", "[series][crt]") {
  // Ramanujan's tau: E(q)^24 = Σ τ(n+1) q^n; τ(1..6) = 1, −24, 252, −1472, 4830, −6048
  // (Ramanujan 1916, "On certain arithmetical functions"; values from memory).
  SeriesPlan tau = plan_eta_series({{1, 24}}, 5);
  IntegerSeries t = compute_series(tau);
  CHECK(as_longs(t) == std::vector<long>{1, -24, 252, -1472, 4830, -6048});
  // Mixed signs and levels, checked against exact products over Z.
  for (const EtaQuotient& q : std::vector<EtaQuotient>{{{1, 5}, {2, -3}, {3, 7}},
                                                       {{1, -3}, {5, 4}, {10, -1}},
                                                       {{2, 2}, {4, -1}},
                                                       {{1, 24}},
                                                       {}}) {
    const long N = 1500;
    SeriesPlan plan = plan_eta_series(q, N);
    CHECK_FALSE(plan.bound.nonnegative);
    IntegerSeries s = compute_series(plan);
    fmpz_poly_t exact;
    fmpz_poly_init(exact);
    exact_eta_series(exact, q, N);
    Fmpz c;
    for (long n = 0; n <= N; ++n) {
      fmpz_poly_get_coeff_fmpz(c.get(), exact, n);
      if (!fmpz_equal(c.get(), s.at(n))) FAIL("n = " << n);
    }
    fmpz_poly_clear(exact);
  }
}

TEST_CASE("residues for one prime and one thread agree with two threads", "[series]") {
  const Family f = Family::parse("sc13");
  SeriesPlan p1 = plan_family_series(f, 3000, 1), p2 = plan_family_series(f, 3000, 2);
  IntegerSeries a = compute_series(p1), b = compute_series(p2);
  for (long n = 0; n <= 3000; ++n) REQUIRE(fmpz_equal(a.at(n), b.at(n)));
  ulong p = 0;
  auto r = eta_series_mod_prime(f.eta_quotient(), 3000, 0, &p);
  REQUIRE(p == p1.primes[0]);
  for (long n = 0; n <= 3000; ++n) CHECK(r[static_cast<size_t>(n)] == fmpz_fdiv_ui(a.at(n), p));
}

TEST_CASE("progress is reported and reaches 1", "[series]") {
  double last = -1;
  bool monotone = true;
  std::string stage;
  SeriesPlan plan = plan_family_series(Family::parse("c9"), 20000);
  compute_series(plan, [&](const std::string& s, double f) {
    if (f < last) monotone = false;
    last = f;
    stage = s;
  });
  CHECK(monotone);
  CHECK(last == 1.0);
  CHECK(stage == "done");
}

TEST_CASE("resources: negative N, the FFT limit and the memory estimate", "[series][errors]") {
  CHECK_THROWS_WITH(plan_family_series(Family::parse("c7"), -1), Catch::Contains("negative"));
  SeriesPlan big = plan_family_series(Family::parse("c7"), kMaxSeriesN + 1);
  // The refusal message states the estimate, whichever limit is hit first.
  ::setenv("CIRCLET_MEMORY_AVAILABLE", "1000000000000000", 1);
  CHECK_THROWS_WITH(check_resources(big), Catch::Contains("beyond the series engine's limit"));
  ::setenv("CIRCLET_MEMORY_AVAILABLE", "1000000", 1);
  SeriesPlan small = plan_family_series(Family::parse("c7"), 100000);
  CHECK(small.memory_bytes > 1e6);
  CHECK_THROWS_WITH(check_resources(small), Catch::Contains("needs about") && Catch::Contains("GB of memory"));
  ::unsetenv("CIRCLET_MEMORY_AVAILABLE");
  CHECK(available_memory_bytes() > 0);
  CHECK_NOTHROW(check_resources(small));
  // Memory estimate grows linearly in N.
  const double m1 = plan_family_series(Family::parse("c7"), 2000000).memory_bytes;
  const double m2 = plan_family_series(Family::parse("c7"), 8000000).memory_bytes;
  CHECK(m2 < 4.2 * m1);
}
