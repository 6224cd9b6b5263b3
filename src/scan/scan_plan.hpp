#pragma once
// The jobs of a scan (src/cli/scan.cpp): for each t in [t_lo, t_hi] and every
// pair of progressions (A,B), (A2,B2) with 1 ≤ A, A2 ≤ M, 0 ≤ B < A,
// 0 ≤ B2 < A2, one job comparing F_t(A n + B) with G_t(A2 n + B2), where the
// families F_t, G_t come from the scan's family pair (default c_t vs sc_{2t−1};
// `--pair`, see FamilyPair).
//
// Job order is deterministic: index = (t − t_lo)·P + i·N + i2, where N = M(M+1)/2,
// P = N², and i = A(A−1)/2 + B enumerates (A,B) by A, then B (likewise i2).
// A shard i/k owns the jobs with index ≡ i (mod k), so k shards cover every job
// exactly once.
#include <string>

#include "family/family.hpp"
#include "family/progression.hpp"

namespace circlet {

/// A family whose parameter is an affine function a·t + b of the scan's t
/// (a = 0: a fixed family). Written as the family prefix followed by the
/// parameter: "ct", "sc2t-1", "sqt-1", "c2t+1", or a fixed "sq5".
struct FamilyTemplate {
  FamilyKind kind = FamilyKind::Core;
  long a = 1, b = 0;
  /// UserError naming `text` when malformed.
  static FamilyTemplate parse(const std::string& text);
  /// The family at this t; UserError when its parameter is out of range.
  Family at(int t) const;
  std::string str() const;
  bool operator==(const FamilyTemplate& o) const { return kind == o.kind && a == o.a && b == o.b; }
};

/// The two families compared by a scan, "F:G" (e.g. "ct:sc2t-1", the default;
/// "c6:sq5"; "ct:sqt-1"; "sc2t+1:sqt"; "ct:c2t" is refused: the weights differ). Both must have the same
/// weight at every t of the scan.
struct FamilyPair {
  FamilyTemplate F{FamilyKind::Core, 1, 0};
  FamilyTemplate G{FamilyKind::SelfConjugateCore, 2, -1};
  static FamilyPair parse(const std::string& text);
  std::string str() const { return F.str() + ":" + G.str(); }
  bool depends_on_t() const { return F.a != 0 || G.a != 0; }
  bool operator==(const FamilyPair& o) const { return F == o.F && G == o.G; }
};

struct ScanSpec {
  int t_lo = 6, t_hi = 6;
  long M = 1;
  FamilyPair pair;
  /// Parses "6..12" (or a single "6") for --t; UserError on bad text or t < 2 or t > 60.
  static void parse_t_range(const std::string& text, int* lo, int* hi);
  /// UserError unless both families exist and have equal weight at every t,
  /// and (for a pair not depending on t) the range is a single t.
  void validate() const;
  long progressions() const { return M * (M + 1) / 2; }
  long pairs_per_t() const { return progressions() * progressions(); }
  long job_count() const { return pairs_per_t() * (t_hi - t_lo + 1); }
  bool operator==(const ScanSpec& o) const { return t_lo == o.t_lo && t_hi == o.t_hi && M == o.M && pair == o.pair; }
};

struct ScanJob {
  long index = 0;
  int t = 0;
  Family F{FamilyKind::Core, 6}, G{FamilyKind::SelfConjugateCore, 11};
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
  /// Number of jobs among 0..total−1 this shard owns.
  long owned(long total) const { return total > i ? (total - i + k - 1) / k : 0; }
  std::string str() const { return std::to_string(i) + "/" + std::to_string(k); }
};

}  // namespace circlet
