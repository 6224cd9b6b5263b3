#pragma once
// Re-check of a certificate (docs/certificate-format.md is the normative list
// of what is checked).
//  * reading: strict (certificate_reader.hpp) — unknown, missing, duplicate or
//    badly typed fields and absurd numbers are rejected before any claim is
//    looked at, so every loop below is bounded by the format's limits;
//  * the digest, provenance.command and the theorem ids: regenerated, compared;
//  * local factors: by direct counting modulo p^j (local_value_counts), not by
//    the closed forms, at two representatives of each class; the cost of each
//    count is estimated first and refused beyond a stated limit;
//  * pinning: by recomputing valuations of X on the class (here, not with
//    pinning.hpp);
//  * σ, the power factor and the class intervals: recomputed here at a
//    different precision (prec + 64); the tail bound with tail_bound.hpp (the
//    one piece shared with certify; the independent Python checker
//    re-derives it from docs/MATH.md §7.2); every stored ball must contain the
//    recomputed one and be no wider than it by more than a relative 2^{-20}
//    plus 2^{-40};
//  * disjointness, integer containment and the verdict: rechecked from the
//    stored balls; UNDECIDED by rerunning the decision.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

namespace circlet {

struct VerifyReport {
  std::vector<std::string> failures;  // empty: every claim holds
  std::vector<std::string> checked;   // what was checked, one line each
  std::vector<std::string> summary;   // generated from the checked fields: verdict, reason, intervals
  bool ok() const { return failures.empty(); }
};

struct VerifyLimits {
  /// Estimated seconds of counting modulo p^j allowed before it starts (0: no limit).
  double max_count_seconds = 6.0;
};

/// A malformed certificate (docs/certificate-format.md §1: schema, limits,
/// another program version) or one whose checks would exceed the stated cost
/// limits throws UserError naming the field. A well-formed certificate whose
/// digest or claims do not hold gives a report with failures.
VerifyReport verify_certificate(const nlohmann::json& cert, const VerifyLimits& limits = {});

/// The text of a certificate file, read strictly (parse_certificate_text) and verified.
VerifyReport verify_certificate_text(const std::string& text, const VerifyLimits& limits = {});

}  // namespace circlet
