#pragma once
// One job of a scan: c_t(A n + B) against sc_{2t−1}(A2 n + B2).
//  * t ≥ 6 (weight ≥ 5/2): the verdict of certify_pair (src/progression/certify.hpp).
//  * t = 4, 5 (weight 3/2, 2) and below: no certificate; exact comparison of the
//    counts for n ≤ K and on the sub-progressions modulo 2, 3, 5 and 7 (exact_compare.hpp).
// The record is a JSON object with deterministic content (no dates), so that
// shard-and-merge and interrupted-and-resumed scans give identical rows.
#include <map>
#include <memory>
#include <nlohmann/json.hpp>

#include "progression/certify.hpp"
#include "scan/scan_plan.hpp"
#include "series/integer_series.hpp"

namespace circlet {

struct ScanSettings {
  ScanSpec spec;
  long compare_K = 1000;    // exact comparisons for t ≤ 5: n = 0..K
  CertifyOptions certify;   // for t ≥ 6
  bool verify = false;      // re-check every certificate with verify_certificate (independent route)
  nlohmann::json header() const;  // the checkpoint header
};

/// Holds the exact series of c_t and sc_{2t−1} needed by the t ≤ 5 jobs.
class ScanContext {
 public:
  explicit ScanContext(ScanSettings s) : settings_(std::move(s)) {}
  const ScanSettings& settings() const { return settings_; }
  /// Series of c_t and sc_{2t−1} up to at least N (computed once per t and N).
  const IntegerSeries& series(const Family& f, long N);

 private:
  ScanSettings settings_;
  std::map<std::pair<std::string, long>, std::unique_ptr<IntegerSeries>> cache_;
};

nlohmann::json run_scan_job(ScanContext& ctx, const ScanJob& job);

/// Does t use certificates (weight > 2)?
inline bool scan_uses_certificates(int t) { return t >= 6; }

}  // namespace circlet
