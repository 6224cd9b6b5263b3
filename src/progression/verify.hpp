#pragma once
// Independent re-check of a certificate (certificate.hpp).
//  * local factors: by direct counting modulo p^j (local_density_by_counting),
//    not by the closed forms, at two representatives of each class;
//  * pinning: by recomputing valuations of X on the class (pinning.hpp);
//  * the tail bound and every interval: recomputed at a different precision
//    (prec + 64) and required to lie inside the stored ball, which must not be
//    wider than the recomputed one by more than a relative 2^{-40};
//  * disjointness, integer containment and the verdict: rechecked from the
//    stored balls; UNDECIDED by rerunning the decision.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

namespace circlet {

struct VerifyReport {
  std::vector<std::string> failures;  // empty: every claim holds
  std::vector<std::string> checked;   // what was checked, one line each
  bool ok() const { return failures.empty(); }
};

/// Never throws on a bad certificate: malformed data is a failure in the report.
VerifyReport verify_certificate(const nlohmann::json& cert);

}  // namespace circlet
