#include "scan/scan_output.hpp"

#include <sys/stat.h>

#include <algorithm>
#include <map>
#include <set>
#include <sstream>

#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "core/provenance.hpp"
#include "scan/exact_compare.hpp"

namespace circlet {

namespace {
std::string csv_field(const nlohmann::json& r, const char* key) {
  if (!r.contains(key) || r[key].is_null()) return "";
  std::string s = r[key].is_string() ? r[key].get<std::string>() : r[key].dump();
  if (s.find_first_of(",\"\n") != std::string::npos) {
    std::string q = "\"";
    for (char c : s) q += (c == '"') ? std::string("\"\"") : std::string(1, c);
    return q + "\"";
  }
  return s;
}
const char* kColumns[] = {"job", "t", "F", "G", "A", "B", "A2", "B2", "verdict", "Q", "prime", "modulus",
                          "r1", "r2", "limit1", "limit2", "k", "verified", "reason"};

void ensure_dir(const std::string& dir) {
  struct stat st;
  if (::stat(dir.c_str(), &st) == 0) {
    if (!S_ISDIR(st.st_mode)) throw UserError(dir + " exists and is not a directory");
    return;
  }
  if (::mkdir(dir.c_str(), 0755) != 0) throw UserError("cannot create directory " + dir);
}
}  // namespace

std::string scan_csv_header() {
  std::string s;
  for (const char* c : kColumns) s += (s.empty() ? "" : ",") + std::string(c);
  return s + "\n";
}

nlohmann::json scan_summary(const std::vector<nlohmann::json>& rows, ScanContext* ctx) {
  std::map<int, std::map<std::string, long>> per_t;
  std::map<std::string, long> total;
  std::map<long, long> by_Q, by_prime;
  nlohmann::json candidates = nlohmann::json::array(), proportional = nlohmann::json::array(),
                 sub_proportional = nlohmann::json::array();
  for (const auto& r : rows) {
    std::string v = r.at("verdict").get<std::string>();
    per_t[r.at("t").get<int>()][v]++;
    if (r.contains("Q") && r["Q"].is_number()) by_Q[r["Q"].get<long>()]++;
    if (r.contains("prime") && r["prime"].is_number()) by_prime[r["prime"].get<long>()]++;
    total[v]++;
    std::string pair = r["F"].get<std::string>() + "(" + std::to_string(r["A"].get<long>()) + "n+" +
                       std::to_string(r["B"].get<long>()) + ") vs " + r["G"].get<std::string>() + "(" +
                       std::to_string(r["A2"].get<long>()) + "n+" + std::to_string(r["B2"].get<long>()) + ")";
    if (v == "CONSTANT" && r.value("contains_integer", false)) {
      nlohmann::json c{{"job", r["job"]}, {"pair", pair}, {"constant", r.value("constant", "")}};
      if (ctx) {
        // Exact-count comparison up to n = 10^4 for a candidate.
        const long K = 10000;
        Family F = Family::parse(r["F"].get<std::string>()), G = Family::parse(r["G"].get<std::string>());
        Progression ap{r["A"].get<long>(), r["B"].get<long>()}, ap2{r["A2"].get<long>(), r["B2"].get<long>()};
        const IntegerSeries& f = ctx->series(F, ap.A * K + ap.B);
        const IntegerSeries& g = ctx->series(G, ap2.A * K + ap2.B);
        ProportionalityResult p = compare_exact(f, ap, g, ap2, K);
        c["exact_compare_to_10000"] = relation_name(p.relation) +
                                      (p.relation == Relation::Proportional ? " k=" + p.k.str() : std::string());
      }
      candidates.push_back(c);
    }
    if (v == "PROPORTIONAL") proportional.push_back({{"job", r["job"]}, {"pair", pair}, {"k", r.value("k", "")}});
    if (r.contains("proportional_subclasses") && !r["proportional_subclasses"].empty())
      sub_proportional.push_back({{"job", r["job"]}, {"pair", pair}, {"classes", r["proportional_subclasses"]},
                                  {"description", r.value("reason", "")}});
  }
  nlohmann::json pt = nlohmann::json::array();
  long verified = 0, verify_failed = 0;
  for (const auto& r : rows)
    if (r.contains("verified")) (r["verified"] == true ? verified : verify_failed)++;
  for (const auto& [t, m] : per_t) pt.push_back({{"t", t}, {"verdicts", m}});
  nlohmann::json q = nlohmann::json::array(), pr = nlohmann::json::array();
  for (const auto& [k, n] : by_Q) q.push_back({{"Q", k}, {"pairs", n}});
  for (const auto& [k, n] : by_prime) pr.push_back({{"prime", k}, {"pairs", n}});
  return {{"jobs", rows.size()},
          {"non_convergent_by_Q", q},
          {"non_convergent_by_distinguishing_prime", pr},
          {"certificates_verified", verified},
          {"certificates_failing_verification", verify_failed},
          {"verdicts", total},
          {"per_t", pt},
          {"candidates", candidates},
          {"proportional_pairs", proportional},
          {"proportional_subprogressions", sub_proportional},
          {"subprogression_skipping",
           "none: every pair is decided directly, so that shards are independent. (Skipping would be valid only "
           "from a CONSTANT pair to its restrictions, and from a NON-CONVERGENT restriction to the pair containing it.)"}};
}

std::string scan_summary_text(const nlohmann::json& header, const std::string& shard, const nlohmann::json& s) {
  std::ostringstream o;
  o << "circlet scan: c_t vs sc_{2t-1}, t = " << header["t_lo"] << ".." << header["t_hi"] << ", all progression pairs "
    << "with A, A2 <= " << header["modulus"] << " (shard " << shard << ")\n";
  o << "jobs: " << s["jobs"] << "\n";
  for (const auto& [v, n] : s["verdicts"].items()) o << "  " << v << ": " << n << "\n";
  o << "per t:\n";
  for (const auto& e : s["per_t"]) {
    o << "  t = " << e["t"] << ":";
    for (const auto& [v, n] : e["verdicts"].items()) o << " " << v << " " << n;
    o << "\n";
  }
  if (s["certificates_verified"].get<long>() + s["certificates_failing_verification"].get<long>() > 0)
    o << "certificates re-checked by circlet verify's route: " << s["certificates_verified"] << " verified, "
      << s["certificates_failing_verification"] << " FAILED\n";
  if (!s["non_convergent_by_Q"].empty()) {
    o << "NON-CONVERGENT pairs by Q (largest prime pinned):";
    for (const auto& e : s["non_convergent_by_Q"]) o << " Q=" << e["Q"] << ": " << e["pairs"] << ";";
    o << "\nNON-CONVERGENT pairs by the prime whose rho separates the classes:";
    for (const auto& e : s["non_convergent_by_distinguishing_prime"]) o << " p=" << e["prime"] << ": " << e["pairs"] << ";";
    o << "\n";
  }
  if (s["candidates"].empty()) {
    o << "CANDIDATES (CONSTANT with an integer in the interval): none\n";
  } else {
    o << "*** CANDIDATES (CONSTANT with an integer in the interval): " << s["candidates"].size() << " ***\n";
    for (const auto& c : s["candidates"])
      o << "  " << c["pair"].get<std::string>() << " constant " << c["constant"].get<std::string>() << "  exact counts: "
        << c.value("exact_compare_to_10000", std::string("not compared")) << "\n";
  }
  if (!s["proportional_pairs"].empty() || !s["proportional_subprogressions"].empty()) {
    o << "exact proportionality (t <= 5, every tested n):\n";
    for (const auto& c : s["proportional_pairs"]) o << "  " << c["pair"].get<std::string>() << ": k = " << c["k"].get<std::string>() << "\n";
    for (const auto& c : s["proportional_subprogressions"]) {
      o << "  " << c["pair"].get<std::string>() << ": " << c["description"].get<std::string>() << "\n";
    }
  }
  o << "sub-progression skipping: " << s["subprogression_skipping"].get<std::string>() << "\n";
  return o.str();
}

void write_scan_outputs(const std::string& dir, const nlohmann::json& header, const std::string& shard,
                        std::vector<nlohmann::json> rows, ScanContext* ctx) {
  ensure_dir(dir);
  std::sort(rows.begin(), rows.end(),
            [](const nlohmann::json& a, const nlohmann::json& b) { return a["job"].get<long>() < b["job"].get<long>(); });
  const Provenance prov = Provenance::now(command_line(), header.value("prec", 0L));
  nlohmann::json summary = scan_summary(rows, ctx);
  {
    std::string csv = prov.csv_comment() + scan_csv_header();
    for (const auto& r : rows) {
      std::string line;
      for (const char* c : kColumns) line += (line.empty() ? "" : ",") + csv_field(r, c);
      csv += line + "\n";
    }
    write_file_atomically(dir + "/scan.csv", csv);
  }
  nlohmann::json j{{"provenance", prov.to_json()}, {"header", header}, {"shard", shard}, {"summary", summary}, {"rows", rows}};
  write_file_atomically(dir + "/scan.json", j.dump(1) + "\n");
  write_file_atomically(dir + "/summary.txt", "# " + prov.csv_comment().substr(2) + scan_summary_text(header, shard, summary));
}

void merge_scan_outputs(const std::vector<std::string>& dirs, const std::string& out_dir) {
  if (dirs.empty()) throw UserError("scan-merge needs at least one shard directory");
  nlohmann::json header;
  long k = -1;
  std::set<long> shards;
  std::map<long, nlohmann::json> rows;
  for (const auto& d : dirs) {
    nlohmann::json j;
    try {
      j = nlohmann::json::parse(read_file(d + "/scan.json"));
    } catch (const nlohmann::json::exception& e) {
      throw UserError(d + "/scan.json is not valid JSON: " + e.what());
    }
    if (header.is_null()) header = j.at("header");
    else if (j.at("header") != header) throw UserError(d + ": scan parameters differ from " + dirs[0]);
    ShardSpec s = ShardSpec::parse(j.at("shard").get<std::string>());
    if (k < 0) k = s.k;
    else if (s.k != k) throw UserError(d + ": shard " + s.str() + " is not one of " + std::to_string(k) + " shards");
    if (!shards.insert(s.i).second) throw UserError(d + ": shard " + s.str() + " given twice");
    for (const auto& r : j.at("rows")) {
      long job = r.at("job").get<long>();
      if (!s.owns(job)) throw UserError(d + ": job " + std::to_string(job) + " does not belong to shard " + s.str());
      if (!rows.emplace(job, r).second) throw UserError("job " + std::to_string(job) + " appears twice");
    }
  }
  for (long i = 0; i < k; ++i)
    if (!shards.count(i)) throw UserError("shard " + std::to_string(i) + "/" + std::to_string(k) + " is missing");
  ScanSpec spec;
  spec.t_lo = header.at("t_lo").get<int>();
  spec.t_hi = header.at("t_hi").get<int>();
  spec.M = header.at("modulus").get<long>();
  long missing = 0, first_missing = -1;
  for (long job = 0; job < spec.job_count(); ++job)
    if (!rows.count(job)) {
      if (first_missing < 0) first_missing = job;
      ++missing;
    }
  if (missing) throw UserError(std::to_string(missing) + " jobs are missing (first: job " + std::to_string(first_missing) + ")");
  if (static_cast<long>(rows.size()) != spec.job_count()) throw UserError("more rows than jobs in the scan");
  std::vector<nlohmann::json> all;
  for (auto& [job, r] : rows) all.push_back(std::move(r));
  write_scan_outputs(out_dir, header, "all (merged from " + std::to_string(k) + " shards)", std::move(all), nullptr);
}

}  // namespace circlet
