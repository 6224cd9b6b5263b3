#include "series/eta_series.hpp"

#include <NTL/lzz_pX.h>

#include <algorithm>
#include <atomic>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <mutex>
#include <numeric>
#include <thread>

#include "core/error.hpp"
#include "core/library_errors.hpp"
#include "core/memory_limit.hpp"
#include "series/crt.hpp"

namespace circlet {

namespace {

using NTL::zz_p;
using NTL::zz_pX;

long length_at(long N, long level) { return N / level + 1; }

// Runs fn(i) for 0 ≤ i < n on up to `threads` threads; helper threads run under
// the caller's zz_p context (NTL contexts are per thread). Used when there are
// fewer primes than threads, so that one prime's independent pieces overlap.
void parallel_for(long n, int threads, const std::function<void(long)>& fn) {
  if (threads <= 1 || n <= 1) {
    for (long i = 0; i < n; ++i) fn(i);
    return;
  }
  NTL::zz_pContext context;
  context.save();
  std::atomic<long> next{0};
  std::exception_ptr failure;
  std::mutex failure_mutex;
  auto work = [&]() {
    NTL::zz_pPush push(context);
    try {
      for (long i = next++; i < n; i = next++) fn(i);
    } catch (...) {
      std::lock_guard<std::mutex> lock(failure_mutex);
      if (!failure) failure = std::current_exception();
    }
  };
  std::vector<std::thread> helpers;
  for (int t = 1; t < threads && t < n; ++t)
    helpers.emplace_back([&work] {
      install_library_error_handlers();  // NTL's handler is per thread
      work();
    });
  work();
  for (auto& h : helpers) h.join();
  if (failure) std::rethrow_exception(failure);
}

// E(q) = Σ_{k∈Z} (−1)^k q^{k(3k−1)/2} mod p, truncated to length L.
zz_pX pentagonal_series(long L) {
  const long p = zz_p::modulus();
  zz_pX a;
  a.rep.SetLength(L);  // zero-filled
  a.rep[0].LoopHole() = 1;
  for (long k = 1;; ++k) {
    const long e1 = k * (3 * k - 1) / 2;  // exponents for ±k: k(3k∓1)/2
    if (e1 >= L) break;
    const long sign = (k % 2) ? p - 1 : 1;
    a.rep[e1].LoopHole() = sign;
    if (e1 + k < L) a.rep[e1 + k].LoopHole() = sign;
  }
  a.normalize();
  return a;
}

// E(q)^3 = Σ_{k≥0} (−1)^k (2k+1) q^{k(k+1)/2} mod p (Jacobi), truncated to length L.
zz_pX jacobi_cube_series(long L) {
  const long p = zz_p::modulus();
  zz_pX a;
  a.rep.SetLength(L);
  for (long k = 0;; ++k) {
    const long e = k * (k + 1) / 2;
    if (e >= L) break;
    const long c = (2 * k + 1) % p;
    a.rep[e].LoopHole() = (k % 2) ? (c == 0 ? 0 : p - c) : c;
  }
  a.normalize();
  return a;
}

// g = f^{−1} mod x^L (f(0) invertible) by Newton iteration on NTL FFT
// representations, with two 2^s-point buffers only (NTL's InvTrunc peaks at
// about twice that memory). From g = f^{−1} mod x^k to length m ≤ 2k:
//   f·g ≡ 1 + x^k h (mod x^m),  f^{−1} ≡ g − x^k (g·h mod x^{m−k}) (mod x^m).
// h is read from the cyclic product f·g mod (x^{2^s} − 1), 2^s ≥ m: the
// wrapped terms (degrees ≥ 2^s, at most m + k − 2) land below k, outside h.
void newton_inverse(zz_pX& g, const zz_pX& f, long L) {
  std::vector<long> lengths;
  for (long m = L; m > 4096; m = (m + 1) / 2) lengths.push_back(m);
  const long start = lengths.empty() ? L : (lengths.back() + 1) / 2;
  NTL::InvTrunc(g, f, start);
  NTL::fftRep Rg, Rw;
  zz_pX h, t;
  long k = start;
  for (auto it = lengths.rbegin(); it != lengths.rend(); ++it) {
    const long m = *it;
    const long s = NTL::NextPowerOfTwo(m);
    NTL::TofftRep(Rg, g, s);
    NTL::TofftRep(Rw, f, s, 0, std::min(m - 1, NTL::deg(f)));
    NTL::mul(Rw, Rw, Rg);
    NTL::FromfftRep(h, Rw, k, m - 1);  // h = coefficients k..m−1 of f·g
    NTL::TofftRep(Rw, h, s);
    NTL::mul(Rw, Rw, Rg);
    NTL::FromfftRep(t, Rw, 0, m - k - 1);  // t = g·h mod x^{m−k}
    g.rep.SetLength(m);
    for (long i = k; i < m; ++i) g.rep[i] = (i - k <= NTL::deg(t)) ? -t.rep[i - k] : zz_p(0);
    g.normalize();
    k = m;
  }
}

// E(q)^e mod p to length L, any integer e.
zz_pX euler_power(long e, long L) {
  zz_pX r;
  const long a = std::labs(e);
  switch (a % 3) {
    case 0: NTL::set(r); break;
    case 1: r = pentagonal_series(L); break;
    default: {
      zz_pX E = pentagonal_series(L);
      NTL::MulTrunc(r, E, E, L);
    }
  }
  long m = a / 3;
  if (m > 0) {
    zz_pX b = jacobi_cube_series(L);
    for (;;) {
      if (m & 1) NTL::MulTrunc(r, r, b, L);
      m >>= 1;
      if (!m) break;
      NTL::MulTrunc(b, b, b, L);
    }
  }
  if (e < 0) {
    zz_pX inv;
    newton_inverse(inv, r, L);
    return inv;
  }
  return r;
}

// A factor or partial product: a series in Q = q^level, truncated to length ⌊N/level⌋ + 1.
struct Piece {
  long level;
  zz_pX s;
};

long coefficient_rep(const zz_pX& a, long i) { return i <= NTL::deg(a) ? NTL::rep(a.rep[i]) : 0; }

// F(Q) · G(Q^m) for F of length L: split F by exponent mod m,
// F = Σ_r Q^r F_r(Q^m), and multiply each F_r by G at length ⌈(L − r)/m⌉.
// G is transformed once (truncated FFT of the full product length, so no
// wrap-around) and reused for all m phases.
zz_pX mul_polyphase(const zz_pX& F, long L, const zz_pX& G, long m, int threads) {
  if (m == 1) {
    zz_pX out;
    NTL::MulTrunc(out, F, G, L);
    return out;
  }
  zz_pX out;
  out.rep.SetLength(L);
  const long len0 = (L - 1) / m + 1;  // the longest phase
  const long dG = std::min(NTL::deg(G), len0 - 1);
  if (dG < 0) return out;  // G = 0
  const long plen = len0 + dG;          // product length of a phase, untruncated
  const long s = NTL::NextPowerOfTwo(plen);
  NTL::fftRep RG;
  NTL::TofftRep_trunc(RG, G, s, plen, 0, dG);
  // Phases write disjoint coefficients r + j·m of `out`; RG is only read.
  parallel_for(std::min(m, L), threads, [&](long r) {
    const long len = (L - 1 - r) / m + 1;
    zz_pX Fr, Hr;
    Fr.rep.SetLength(len);
    for (long j = 0; j < len; ++j) Fr.rep[j].LoopHole() = coefficient_rep(F, r + j * m);
    Fr.normalize();
    if (NTL::deg(Fr) < 0) return;
    NTL::fftRep RF;
    NTL::TofftRep_trunc(RF, Fr, s, plen);
    NTL::mul(RF, RF, RG);
    NTL::FromfftRep(Hr, RF, 0, len - 1);
    const long top = std::min(len - 1, NTL::deg(Hr));
    for (long j = 0; j <= top; ++j) out.rep[r + j * m] = Hr.rep[j];
  });
  out.normalize();
  return out;
}

// a · b as a series in q^g, g = gcd(a.level, b.level).
Piece combine(const Piece& a, const Piece& b, long N, int threads) {
  const long g = std::gcd(a.level, b.level);
  const long L = length_at(N, g);
  const long ma = a.level / g, mb = b.level / g;
  // Spread the factor with the smaller ratio to level g; split by the larger one.
  const Piece& spread_me = (ma <= mb) ? a : b;
  const Piece& other = (ma <= mb) ? b : a;
  const long ms = spread_me.level / g, mo = other.level / g;
  zz_pX F;
  if (ms == 1) {
    F = spread_me.s;
  } else {
    F.rep.SetLength(L);
    const long top = std::min(NTL::deg(spread_me.s), (L - 1) / ms);
    for (long j = 0; j <= top; ++j) F.rep[j * ms] = spread_me.s.rep[j];
    F.normalize();
  }
  return Piece{g, mul_polyphase(F, L, other.s, mo, threads)};
}

// The order in which factors are multiplied: repeatedly the pair of pieces with
// the largest common level (ties: the sparsest pair). Returns the merge list.
struct Merge {
  size_t i, j;
  long level;
};
std::vector<Merge> merge_schedule(std::vector<long> levels) {
  std::vector<Merge> out;
  while (levels.size() > 1) {
    size_t bi = 0, bj = 1;
    long bg = -1, bl = -1;
    for (size_t i = 0; i < levels.size(); ++i)
      for (size_t j = i + 1; j < levels.size(); ++j) {
        const long g = std::gcd(levels[i], levels[j]);
        const long l = std::max(levels[i], levels[j]);
        if (g > bg || (g == bg && l > bl)) { bg = g; bl = l; bi = i; bj = j; }
      }
    out.push_back({bi, bj, bg});
    levels[bi] = bg;
    levels.erase(levels.begin() + static_cast<long>(bj));
  }
  return out;
}

// Rough cost units (series length × number of full-length operations), only to
// make the progress fraction move evenly.
double factor_cost(long e, long L) {
  const long a = std::labs(e);
  double mults = (a % 3 == 2 ? 1 : 0) + 2.0 * std::log2(1.0 + static_cast<double>(a / 3));
  return static_cast<double>(L) * (mults + (e < 0 ? 3.0 : 0.0) + 0.1);
}

// Residues of the coefficients 0..N modulo the current zz_p modulus written to
// out[n * stride]. Reports fractions of this prime's work through `progress`.
void eta_series_mod_current(const EtaQuotient& quotient, long N, ulong* out, long stride,
                            const std::function<void(double)>& progress, int threads = 1) {
  const EtaQuotient q = normalise(quotient);
  std::vector<long> levels;
  for (const auto& f : q) levels.push_back(f.d);
  const auto schedule = merge_schedule(levels);
  double total = 0, done = 0;
  for (const auto& f : q) total += factor_cost(f.e, length_at(N, f.d));
  for (const auto& m : schedule) total += static_cast<double>(length_at(N, m.level));
  std::mutex tick_mutex;
  auto tick = [&](double c) {
    std::lock_guard<std::mutex> lock(tick_mutex);
    done += c;
    if (progress) progress(total > 0 ? std::min(1.0, done / total) : 1.0);
  };

  // The factors are independent: with spare threads they are computed side by side.
  std::vector<Piece> pieces(q.size());
  parallel_for(static_cast<long>(q.size()), threads, [&](long i) {
    const auto& f = q[static_cast<size_t>(i)];
    const long L = length_at(N, f.d);
    pieces[static_cast<size_t>(i)] = Piece{f.d, euler_power(f.e, L)};
    tick(factor_cost(f.e, L));
  });
  for (const auto& m : schedule) {
    Piece merged = combine(pieces[m.i], pieces[m.j], N, threads);
    pieces[m.i] = std::move(merged);
    pieces.erase(pieces.begin() + static_cast<long>(m.j));
    tick(static_cast<double>(length_at(N, m.level)));
  }
  for (long n = 0; n <= N; ++n) out[n * stride] = 0;
  if (pieces.empty()) {  // the empty product: F = 1
    out[0] = 1;
    return;
  }
  const Piece& r = pieces.front();
  const long top = std::min(NTL::deg(r.s), N / r.level);
  for (long j = 0; j <= top; ++j) out[j * r.level * stride] = static_cast<ulong>(NTL::rep(r.s.rep[j]));
}

ulong fft_prime(long index) {
  NTL::zz_pPush push(NTL::INIT_FFT, index);
  return static_cast<ulong>(zz_p::modulus());
}

SeriesPlan make_plan(const EtaQuotient& quotient, long N, int threads, CoefficientBound bound) {
  if (N < 0) throw UserError("N = " + std::to_string(N) + " is negative");
  SeriesPlan plan;
  plan.quotient = normalise(quotient);
  plan.N = N;
  plan.bound = std::move(bound);
  plan.threads = std::max(1, threads);
  // Need M > B (non-negative coefficients reconstructed in [0, M)) or
  // M > 2B + 1 (signed, reconstructed in (−M/2, M/2] ⊇ [−B, B]).
  Fmpz need;
  if (plan.bound.nonnegative) {
    fmpz_set(need.get(), plan.bound.bound.get());
  } else {
    fmpz_mul_ui(need.get(), plan.bound.bound.get(), 2);
    fmpz_add_ui(need.get(), need.get(), 1);
  }
  Fmpz M(1);
  for (long i = 0; fmpz_cmp(M.get(), need.get()) <= 0; ++i) {
    const ulong p = fft_prime(i);
    plan.prime_indices.push_back(i);
    plan.primes.push_back(p);
    fmpz_mul_ui(M.get(), M.get(), p);
  }
  // Memory model (bytes), calibrated on NTL 11.5 by /usr/bin/time -v: a worker
  // thread peaks in newton_inverse at length L = N + 1 with two 2^s-point FFT
  // buffers (2^s ≥ L, 8 bytes a point) and about three series of length L;
  // residues take 8·k·L, the output fmpz array 8·L plus, when the bound exceeds
  // 2^62, a GMP integer per coefficient (header, limbs, allocator overhead).
  const double len = static_cast<double>(N) + 1;
  const double k = static_cast<double>(plan.primes.size());
  // Spare threads work inside a prime (parallel_for), so count every thread.
  const double active = plan.threads;
  const double bits = static_cast<double>(fmpz_bits(plan.bound.bound.get())) + 1;
  const double fft_points = std::exp2(std::ceil(std::log2(len)));
  double bytes = active * (16.0 * fft_points + 24.0 * len + 16e6) + 8.0 * k * len + 8.0 * len;
  if (bits > 62) bytes += len * (48.0 + 8.0 * std::ceil(bits / 64.0));
  plan.memory_bytes = bytes;
  return plan;
}

std::string gigabytes(double bytes) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.2f GB", bytes / 1e9);
  return buf;
}

}  // namespace

SeriesPlan plan_family_series(const Family& family, long N, int threads) {
  if (N < 0) throw UserError("N = " + std::to_string(N) + " is negative");
  return make_plan(family.eta_quotient(), N, threads, family_coefficient_bound(family, N));
}

SeriesPlan plan_eta_series(const EtaQuotient& quotient, long N, int threads) {
  if (N < 0) throw UserError("N = " + std::to_string(N) + " is negative");
  return make_plan(quotient, N, threads, eta_quotient_coefficient_bound(quotient, N, 64));
}

double available_memory_bytes() { return memory_budget().bytes; }

void check_resources(const SeriesPlan& plan) {
  const MemoryBudget budget = memory_budget();
  if (budget.bytes >= 0 && plan.memory_bytes > budget.bytes)
    throw UserError("N = " + std::to_string(plan.N) + " needs about " + gigabytes(plan.memory_bytes) +
                    " of memory, more than the " + gigabytes(budget.bytes) + " available (" + budget.source + ")");
  if (plan.N > kMaxSeriesN)
    throw UserError("N = " + std::to_string(plan.N) + " is beyond the series engine's limit " +
                    std::to_string(kMaxSeriesN) + " (NTL FFT length 2^25)");
}

std::vector<ulong> eta_series_mod_prime(const EtaQuotient& quotient, long N, long fft_index, ulong* prime,
                                        const std::function<void(double)>& progress) {
  CIRCLET_ASSERT(N >= 0 && N <= kMaxSeriesN, "series length out of range");
  NTL::zz_pPush push(NTL::INIT_FFT, fft_index);
  if (prime) *prime = static_cast<ulong>(zz_p::modulus());
  std::vector<ulong> out(static_cast<size_t>(N) + 1);
  eta_series_mod_current(quotient, N, out.data(), 1, progress);
  return out;
}

IntegerSeries compute_series(const SeriesPlan& plan, const SeriesProgress& progress) {
  const long N = plan.N;
  const size_t k = plan.primes.size();
  CIRCLET_ASSERT(k >= 1, "plan without primes");
  CIRCLET_ASSERT(N >= 0 && N <= kMaxSeriesN, "series length out of range (call check_resources first)");
  const size_t len = static_cast<size_t>(N) + 1;
  // residues[n·k + i] = coefficient n mod prime i: CRT reads one contiguous row per n.
  std::vector<ulong> residues(len * k);

  std::mutex report_mutex;
  std::vector<double> fraction(k, 0.0);
  constexpr double kSeriesShare = 0.9;  // the CRT takes the rest
  auto report = [&](size_t i, double f) {
    if (!progress) return;
    std::lock_guard<std::mutex> lock(report_mutex);
    fraction[i] = f;
    double s = 0;
    for (double x : fraction) s += x;
    progress("series mod p", kSeriesShare * s / static_cast<double>(k));
  };

  std::atomic<size_t> next{0};
  std::exception_ptr failure;
  std::mutex failure_mutex;
  // With fewer primes than threads (e.g. c_7 to 10^7: one prime), the spare
  // threads work inside a prime.
  const int inner = k < static_cast<size_t>(plan.threads) ? plan.threads / static_cast<int>(k) : 1;
  auto worker = [&]() {
    try {
      for (size_t i = next++; i < k; i = next++) {
        NTL::zz_pPush push(NTL::INIT_FFT, plan.prime_indices[i]);
        CIRCLET_ASSERT(static_cast<ulong>(zz_p::modulus()) == plan.primes[i], "FFT prime changed");
        eta_series_mod_current(plan.quotient, N, residues.data() + i, static_cast<long>(k),
                               [&, i](double f) { report(i, f); }, inner);
      }
    } catch (...) {
      std::lock_guard<std::mutex> lock(failure_mutex);
      if (!failure) failure = std::current_exception();
    }
  };
  const size_t nthreads = std::min<size_t>(static_cast<size_t>(plan.threads), k);
  if (nthreads <= 1) {
    worker();
  } else {
    std::vector<std::thread> pool;
    for (size_t t = 0; t < nthreads; ++t)
      pool.emplace_back([&worker] {
        install_library_error_handlers();  // NTL's handler is per thread
        worker();
      });
    for (auto& th : pool) th.join();
  }
  if (failure) std::rethrow_exception(failure);

  IntegerSeries out(static_cast<long>(len));
  if (k == 1 && plan.bound.nonnegative) {
    for (size_t n = 0; n < len; ++n) fmpz_set_ui(out.at(static_cast<long>(n)), residues[n]);
  } else {
    CrtReconstructor crt(plan.primes, !plan.bound.nonnegative);
    const size_t step = std::max<size_t>(1, len / 100);
    for (size_t n = 0; n < len; ++n) {
      crt.reconstruct(out.at(static_cast<long>(n)), residues.data() + n * k, 1);
      if (progress && n % step == 0)
        progress("CRT", kSeriesShare + (1 - kSeriesShare) * static_cast<double>(n) / static_cast<double>(len));
    }
  }
  if (progress) progress("done", 1.0);
  return out;
}

IntegerSeries family_series(const Family& family, long N, const SeriesProgress& progress) {
  SeriesPlan plan = plan_family_series(family, N);
  check_resources(plan);
  return compute_series(plan, progress);
}

}  // namespace circlet
