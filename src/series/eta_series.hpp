#pragma once
// The exact series engine: coefficients 0..N of an eta quotient
//   F(q) = Π_d Π_{k≥1} (1 − q^{dk})^{e_d}
// as exact integers, by multimodular arithmetic.
//
// Method (per prime p, NTL's FFT primes, zz_pX):
//  * E(q) = Π(1 − q^k) = Σ_k (−1)^k q^{k(3k−1)/2} (Euler's pentagonal theorem)
//    and E(q)^3 = Σ_{k≥0} (−1)^k (2k+1) q^{k(k+1)/2} (Jacobi) are sparse;
//    E^e = (E^3)^{⌊e/3⌋} · E^{e mod 3} by binary powering with MulTrunc, and
//    E^{−e} by InvTrunc. Each factor E(q^d)^{e} is a series in Q = q^d of
//    length ⌊N/d⌋ + 1.
//  * Factors are multiplied pairwise, largest common level g = gcd(d, d') first,
//    as series in q^g. A series in q^{g m} times a series in q^g is done by
//    splitting the latter into its m residue classes of exponents (m products
//    of length N/(g m) instead of one of length N/g).
//  * The residues for all primes are combined by CRT (crt.hpp). The number of
//    primes is fixed in advance so that M = Π p exceeds the rigorous bound of
//    coefficient_bound.hpp (M > B for counts, M > 2B + 1 otherwise).
// Primes run in parallel threads, each with its own zz_p context.
#include <functional>
#include <string>
#include <vector>

#include "family/family.hpp"
#include "series/coefficient_bound.hpp"
#include "series/integer_series.hpp"

namespace circlet {

/// Progress report: a stage name ("series mod p", "CRT") and the fraction of the
/// whole run done, in [0, 1]. May be called from worker threads (serialised).
using SeriesProgress = std::function<void(const std::string& stage, double fraction)>;

/// Largest N the engine accepts: NTL's FFT primes allow transforms of length
/// 2^25, and a truncated product of two series of length N + 1 needs 2N + 1 ≤ 2^25.
constexpr long kMaxSeriesN = (1L << 24) - 1;

struct SeriesPlan {
  EtaQuotient quotient;
  long N = 0;
  CoefficientBound bound;
  std::vector<long> prime_indices;  // NTL FFT prime indices used
  std::vector<ulong> primes;
  int threads = 2;
  /// Estimated peak memory of compute_series, in bytes.
  double memory_bytes = 0;
};

/// Plans the computation of a family's generating function to N (box bound).
/// Throws UserError if N < 0. Plans beyond kMaxSeriesN are made (their memory
/// estimate is reported) but refused by check_resources.
SeriesPlan plan_family_series(const Family& family, long N, int threads = 2);
/// Plans an arbitrary eta quotient to N (general majorant bound, signed CRT).
SeriesPlan plan_eta_series(const EtaQuotient& quotient, long N, int threads = 2);

/// Bytes of memory available to a new run: memory_budget() of core/memory_limit.hpp
/// (MemAvailable, cgroup limit, RLIMIT_AS; CIRCLET_MEMORY_AVAILABLE overrides).
/// Returns a negative number if unknown.
double available_memory_bytes();

/// Throws UserError stating the estimate when the plan would not fit in the
/// available memory, or when N exceeds kMaxSeriesN.
void check_resources(const SeriesPlan& plan);

/// Runs the plan: exact coefficients 0..N.
IntegerSeries compute_series(const SeriesPlan& plan, const SeriesProgress& progress = {});

/// Plan, memory check and run for a family.
IntegerSeries family_series(const Family& family, long N, const SeriesProgress& progress = {});

/// The residues of the coefficients 0..N modulo NTL FFT prime number `fft_index`,
/// in [0, p). The prime is returned in *prime when non-null.
std::vector<ulong> eta_series_mod_prime(const EtaQuotient& quotient, long N, long fft_index,
                                        ulong* prime = nullptr,
                                        const std::function<void(double)>& progress = {});

}  // namespace circlet
