// Benchmarks for src/mainterm/ (issue 3 targets). Not a test: prints figures.
//   bench_mainterm [single|table9|half|table6|all] [rows]
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <string>
#include <vector>

#include "mainterm/main_term.hpp"
#include "mainterm/main_term_batch.hpp"
#include "quadratic/model.hpp"
#include "series/eta_series.hpp"

using namespace circlet;
using Clock = std::chrono::steady_clock;

static double secs(Clock::time_point a) { return std::chrono::duration<double>(Clock::now() - a).count(); }

static void bench_single_integral() {
  std::printf("== integral weight: exact M(n), single n (target < 5 ms)\n");
  for (const char* name : {"c5", "c9", "c13", "sc9", "sq8", "c25"}) {
    QuadraticModel m = quadratic_model(Family::parse(name));
    for (const char* ns : {"1000000", "1000000000000", "999999999999999989", "1000000000000000000"}) {
      Fmpz n = Fmpz::from_str(ns);
      MainTermOptions o;
      o.with_parts = false;
      auto t0 = Clock::now();
      int reps = 20;
      size_t len = 0;
      for (int i = 0; i < reps; ++i) {
        Fmpz nn;
        fmpz_add_ui(nn.get(), n.get(), i);
        MainTerm t = main_term(m, nn, 64, o);
        len = t.exact->str().size();
      }
      std::printf("  %-4s n=%-20s %8.3f ms/term  (%zu chars of exact rational)\n", name, ns, 1e3 * secs(t0) / reps, len);
    }
  }
}

static void bench_table9(long rows) {
  std::printf("== c9 table n = 0..%ld: count, exact main, remainder (target 10^6 rows < 30 s)\n", rows - 1);
  Family f = Family::parse("c9");
  QuadraticModel m = quadratic_model(f);
  auto t0 = Clock::now();
  IntegerSeries s = family_series(f, rows - 1);
  double ts = secs(t0);
  auto t1 = Clock::now();
  MainTermOptions o;
  o.with_parts = false;
  Fmpq rem;
  for (long n = 0; n < rows; ++n) {
    MainTerm t = main_term(m, Fmpz(n), 64, o);
    Fmpq c(s.value(n));
    fmpq_sub(rem.get(), c.get(), t.exact->get());
  }
  double tm = secs(t1);
  std::printf("  series %.2f s, main terms + remainders %.2f s, total %.2f s\n", ts, tm, ts + tm);
}

static void bench_half() {
  std::printf("== half-integral weight: single n, relative radius <= 1e-10 (target < 100 ms)\n");
  for (const char* name : {"c6", "sq5", "c8", "sq7", "sc15", "c10"}) {
    QuadraticModel m = quadratic_model(Family::parse(name));
    for (const char* ns : {"1000003", "1000000007", "1000000000039", "999999999989"}) {
      Fmpz n = Fmpz::from_str(ns);
      MainTermOptions o;
      o.with_parts = false;
      o.max_exact_conductor = 100000;
      auto t0 = Clock::now();
      CertifiedMainTerm c = main_term_certified(m, n, 10, 512, o);
      double t = secs(t0);
      Arb r;
      double relrad = 0;
      if (!c.term.exact) {
        mag_t rm;
        mag_init(rm);
        arb_get_mag(rm, c.term.ball);
        relrad = mag_get_d(arb_radref(c.term.ball.get())) / mag_get_d(rm);
        mag_clear(rm);
      }
      std::printf("  %-4s n=%-14s %9.1f ms  %s  rel.radius %.2e  certified(10 digits)=%s\n", name, ns, 1e3 * t,
                  c.term.exact ? "exact" : "ball ", relrad, c.certified ? "yes" : "no");
    }
  }
}

static void bench_table6(long rows) {
  std::printf("== c6 table n = 0..%ld, relative radius <= 1e-6 (target 10^6 rows < 60 s)\n", rows - 1);
  QuadraticModel m = quadratic_model(Family::parse("c6"));
  ulong P = main_term_batch_prime_bound(m.rank, 20);  // 2^{-20} < 1e-6
  auto t0 = Clock::now();
  std::vector<Arb> v = main_term_batch(m, 0, 1, rows, P, 64);
  double t = secs(t0);
  double worst = 0;
  for (const Arb& b : v) {
    if (arb_is_exact(b)) continue;
    mag_t rm;
    mag_init(rm);
    arb_get_mag_lower(rm, b);
    worst = std::max(worst, mag_get_d(arb_radref(b.get())) / mag_get_d(rm));
    mag_clear(rm);
  }
  std::printf("  batched Euler product to P = %lu: %ld rows in %.2f s (%.3f ms/row), worst relative radius %.2e\n",
              P, rows, t, 1e3 * t / rows, worst);
  // with the exact counts and remainders, as `circlet main c6 --to N` does
  auto t1 = Clock::now();
  IntegerSeries s = family_series(Family::parse("c6"), rows - 1);
  Arb rem;
  for (long n = 0; n < rows; ++n) {
    arb_set_fmpz(rem, s.at(n));
    arb_sub(rem, rem, v[n], 64);
  }
  std::printf("  + series and remainders %.2f s\n", secs(t1));
}

int main(int argc, char** argv) {
  std::string what = argc > 1 ? argv[1] : "all";
  long rows = argc > 2 ? std::atol(argv[2]) : 0;
  if (what == "single" || what == "all") bench_single_integral();
  if (what == "table9" || what == "all") bench_table9(rows ? rows : 1000000);
  if (what == "half" || what == "all") bench_half();
  if (what == "table6" || what == "all") bench_table6(rows ? rows : 1000000);
  return 0;
}
