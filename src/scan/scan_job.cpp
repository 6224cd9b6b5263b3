#include "scan/scan_job.hpp"

#include "core/error.hpp"

#include "progression/ball_io.hpp"
#include "progression/certificate.hpp"
#include "progression/verify.hpp"
#include "core/error.hpp"
#include "scan/exact_compare.hpp"
#include "scan/results_db.hpp"
#include "series/eta_series.hpp"

namespace circlet {

nlohmann::json ScanSettings::header() const {
  return {{"pair", spec.pair.str()},
          {"t_lo", spec.t_lo},
          {"t_hi", spec.t_hi},
          {"modulus", spec.M},
          {"compare_K", compare_K},
          {"Q_max", certify.Q_max},
          {"prec", certify.prec},
          {"prec_max", certify.prec_max},
          {"verify", verify}};
}

ScanSettings scan_settings_from_header(const nlohmann::json& h) {
  ScanSettings s;
  s.spec = scan_spec_from_header(h);
  try {
    s.compare_K = h.at("compare_K").get<long>();
    s.certify.Q_max = h.at("Q_max").get<ulong>();
    s.certify.prec = h.at("prec").get<slong>();
    s.certify.prec_max = h.at("prec_max").get<slong>();
    s.verify = h.at("verify").get<bool>();
  } catch (const nlohmann::json::exception& e) {
    throw UserError(std::string("malformed scan header: ") + e.what());
  }
  return s;
}

const IntegerSeries& ScanContext::series(const Family& f, long N) {
  std::lock_guard<std::mutex> lock(mu_);
  auto key = std::make_pair(f.name(), N);
  auto it = cache_.find(key);
  if (it == cache_.end())
    it = cache_.emplace(key, std::make_unique<IntegerSeries>(family_series(f, N))).first;
  return *it->second;
}

nlohmann::json run_scan_job(ScanContext& ctx, const ScanJob& job) {
  const Family& F = job.F;
  const Family& G = job.G;
  nlohmann::json r{{"job", job.index}, {"t", job.t},       {"F", F.name()},      {"G", G.name()},
                   {"A", job.ap.A},    {"B", job.ap.B},    {"A2", job.ap2.A},    {"B2", job.ap2.B}};
  if (scan_uses_certificates(F.rank())) {
    ProgressionPair pair(F, job.ap, G, job.ap2);
    Certificate c = certify_pair(pair, ctx.settings().certify);
    r["verdict"] = verdict_name(c.verdict);
    r["reason"] = c.reason;
    r["prec"] = c.prec;
    if (ctx.settings().verify) {
      try {
        // --verify asks for every re-check: verify's interactive limit on the
        // estimated counting time (6 s) does not apply inside a scan.
        VerifyLimits unlimited;
        unlimited.max_count_seconds = 0;
        VerifyReport v = verify_certificate(certificate_to_json(c), unlimited);
        r["verified"] = v.ok();
        if (!v.ok()) r["verify_failure"] = v.failures.front();
      } catch (const UserError& e) {  // e.g. a count beyond verify's time limit
        r["verified"] = false;
        r["verify_failure"] = e.what();
      }
    }
    if (c.verdict == Verdict::NonConvergent) {
      r["Q"] = c.Q;
      r["prime"] = c.distinguishing_prime;
      r["modulus"] = c.modulus.str();
      r["r1"] = c.classes[0].residue.str();
      r["r2"] = c.classes[1].residue.str();
      r["limit1"] = interval_display(c.classes[0].limit);
      r["limit2"] = interval_display(c.classes[1].limit);
      r["limit1_ball"] = ball_to_json(c.classes[0].limit);
      r["limit2_ball"] = ball_to_json(c.classes[1].limit);
    } else if (c.verdict == Verdict::Constant) {
      r["constant"] = c.constant_value.str();
      r["k"] = c.constant_value.str();
      r["contains_integer"] = c.contains_integer;
    }
  } else {
    const long K = ctx.settings().compare_K;
    const long M = ctx.settings().spec.M;
    const long N = M * K + M;  // ≥ A·K + B for all A ≤ M, B < A
    const IntegerSeries& f = ctx.series(F, N);
    const IntegerSeries& g = ctx.series(G, N);
    ExactComparison e = compare_pair_exact(f, job.ap, g, job.ap2, K, {2, 3, 5, 7});
    r["verdict"] = e.whole.relation == Relation::Proportional ? "PROPORTIONAL"
                   : e.whole.relation == Relation::BothVanish ? "BOTH-VANISH"
                                                              : "NOT-PROPORTIONAL";
    // Each relation the comparison suggests is proved for all n (or refuted) by the
    // Sturm bound (src/modform/, docs/MATH.md §8); "exact counts n = 0..K" only when
    // the comparison suggests no relation.
    const std::vector<ProvedRelation> rs = prove_exact_comparison(e, F, job.ap, G, job.ap2);
    if (rs.empty()) {
      r["reason"] = "exact counts n = 0.." + std::to_string(K) + ": " + e.describe();
    } else {
      r["reason"] = describe_proved(rs);  // the relations, each PROVED or REFUTED, in one line
    }
    if (e.whole.relation == Relation::Proportional) r["k"] = e.whole.k.str();
    nlohmann::json sub = nlohmann::json::array();
    for (const auto& s : e.sub) sub.push_back({{"p", s.p}, {"j", s.j}, {"k", s.k.str()}});
    r["proportional_subclasses"] = sub;
  }
  return r;
}

}  // namespace circlet
