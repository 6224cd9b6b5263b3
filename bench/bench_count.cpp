// Benchmark of the exact series engine: wall time of each stage for
//   bench_count FAMILY N [threads]
// (plan = bound and primes, series = residues mod the FFT primes, crt, text =
// decimal CSV text in memory). bench/count_vs_pari.sh runs it against PARI/GP.
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <string>

#include "family/family.hpp"
#include "series/eta_series.hpp"

using namespace circlet;
using Clock = std::chrono::steady_clock;

static double seconds_since(Clock::time_point t) {
  return std::chrono::duration<double>(Clock::now() - t).count();
}

int main(int argc, char** argv) {
  if (argc < 3) {
    std::fprintf(stderr, "usage: bench_count FAMILY N [threads]\n");
    return 2;
  }
  const Family family = Family::parse(argv[1]);
  const long N = std::atol(argv[2]);
  const int threads = argc > 3 ? std::atoi(argv[3]) : 2;
  auto t0 = Clock::now();
  SeriesPlan plan = plan_family_series(family, N, threads);
  check_resources(plan);
  const double t_plan = seconds_since(t0);
  double t_series = 0;
  auto t1 = Clock::now();
  IntegerSeries s = compute_series(plan, [&](const std::string& stage, double) {
    if ((stage == "CRT" || stage == "done") && t_series == 0) t_series = seconds_since(t1);
  });
  const double t_total = seconds_since(t1);
  auto t2 = Clock::now();
  std::string text;
  text.reserve(static_cast<size_t>(N) * 12);
  for (long n = 0; n <= N; ++n) {
    text += std::to_string(n);
    text += ',';
    append_decimal(text, s.at(n));
    text += '\n';
  }
  const double t_text = seconds_since(t2);
  std::printf("%s N=%ld primes=%zu bound_bits=%ld threads=%d plan=%.3fs series=%.3fs crt=%.3fs text=%.3fs "
              "total=%.3fs est_mem=%.0fMB last=%s\n",
              family.name().c_str(), N, plan.primes.size(), static_cast<long>(fmpz_bits(plan.bound.bound.get())),
              threads, t_plan, t_series, t_total - t_series, t_text, t_plan + t_total + t_text,
              plan.memory_bytes / 1e6, s.value(N).str().substr(0, 30).c_str());
  return 0;
}
