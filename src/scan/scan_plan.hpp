#pragma once
// The jobs of a scan (src/cli/scan.cpp): for each t in [t_lo, t_hi] and every
// pair of progressions (A,B), (A2,B2) with 1 ≤ A, A2 ≤ M, 0 ≤ B < A,
// 0 ≤ B2 < A2, one job comparing c_t(A n + B) with sc_{2t−1}(A2 n + B2).
//
// Job order is deterministic: index = (t − t_lo)·P + i·N + i2, where N = M(M+1)/2,
// P = N², and i = A(A−1)/2 + B enumerates (A,B) by A, then B (likewise i2).
// A shard i/k owns the jobs with index ≡ i (mod k), so k shards cover every job
// exactly once.
#include <string>

#include "family/progression.hpp"

namespace circlet {

struct ScanSpec {
  int t_lo = 6, t_hi = 6;
  long M = 1;
  /// Parses "6..12" (or a single "6") for --t; UserError on bad text or t < 2 or t > 60.
  static void parse_t_range(const std::string& text, int* lo, int* hi);
  long progressions() const { return M * (M + 1) / 2; }
  long pairs_per_t() const { return progressions() * progressions(); }
  long job_count() const { return pairs_per_t() * (t_hi - t_lo + 1); }
  bool operator==(const ScanSpec& o) const { return t_lo == o.t_lo && t_hi == o.t_hi && M == o.M; }
};

struct ScanJob {
  long index = 0;
  int t = 0;
  Progression ap, ap2;
};

/// The job with a given index (0 ≤ index < job_count()).
ScanJob scan_job(const ScanSpec& spec, long index);

/// The progression with enumeration index i = A(A−1)/2 + B.
Progression progression_of_index(long i);

struct ShardSpec {
  long i = 0, k = 1;
  /// Parses "i/k" with 0 ≤ i < k; UserError otherwise.
  static ShardSpec parse(const std::string& text);
  bool owns(long index) const { return index % k == i; }
  std::string str() const { return std::to_string(i) + "/" + std::to_string(k); }
};

}  // namespace circlet
