#pragma once
// One job of a scan: F_t(A n + B) against G_t(A2 n + B2) (default c_t and sc_{2t−1}).
//  * weight ≥ 5/2: the verdict of certify_pair (src/progression/certify.hpp).
//  * weight ≤ 2 (c_t with t ≤ 5): no certificate; exact comparison of the
//    counts for n ≤ K and on the sub-progressions modulo 2, 3, 5 and 7 (exact_compare.hpp).
// The record is a JSON object with deterministic content (no dates), so that
// shard-and-merge and interrupted-and-resumed scans give identical rows.
#include <map>
#include <memory>
#include <mutex>
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
  nlohmann::json header() const;  // the plan's header (results_db.hpp)
};

/// The settings a header describes (UserError when malformed).
ScanSettings scan_settings_from_header(const nlohmann::json& header);

/// Holds the exact series needed by the weight ≤ 2 jobs; shared by the worker
/// threads of a scan (series() is thread-safe).
class ScanContext {
 public:
  explicit ScanContext(ScanSettings s) : settings_(std::move(s)) {}
  const ScanSettings& settings() const { return settings_; }
  /// The series of f up to at least N (computed once per family and N).
  const IntegerSeries& series(const Family& f, long N);

 private:
  ScanSettings settings_;
  std::mutex mu_;
  std::map<std::pair<std::string, long>, std::unique_ptr<IntegerSeries>> cache_;
};

nlohmann::json run_scan_job(ScanContext& ctx, const ScanJob& job);

/// Does a pair of this rank get a certificate (weight > 2), or an exact comparison?
inline bool scan_uses_certificates(int rank) { return rank >= 5; }

}  // namespace circlet
