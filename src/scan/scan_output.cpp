#include "scan/scan_output.hpp"

#include <sys/stat.h>
#include <unistd.h>

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

void ensure_dir(const std::string& dir) {
  struct stat st;
  if (::stat(dir.c_str(), &st) == 0) {
    if (!S_ISDIR(st.st_mode)) throw UserError(dir + " exists and is not a directory");
    return;
  }
  if (::mkdir(dir.c_str(), 0755) != 0) throw UserError("cannot create directory " + dir);
}

// (SELECT a, count(*) ... GROUP BY a) as a list of {key: a, "pairs": n}.
nlohmann::json grouped(ResultsDb& db, const std::string& key, const std::string& where) {
  SqliteStatement s(db.db(), "SELECT " + key + ", count(*) FROM pairs WHERE " + where + " GROUP BY " + key +
                                 " ORDER BY " + key);
  nlohmann::json out = nlohmann::json::array();
  while (s.step()) out.push_back({{key, static_cast<long>(s.int_at(0))}, {"pairs", static_cast<long>(s.int_at(1))}});
  return out;
}

long count_where(ResultsDb& db, const std::string& where) {
  SqliteStatement s(db.db(), "SELECT count(*) FROM pairs WHERE " + where);
  s.step();
  return static_cast<long>(s.int_at(0));
}
}  // namespace

std::string scan_csv_header() {
  std::string s;
  for (const auto& c : scan_columns()) s += (s.empty() ? "" : ",") + std::string(c.name);
  return s + "\n";
}

std::string scan_pair_text(const nlohmann::json& r) {
  return r.at("F").get<std::string>() + "(" + std::to_string(r.at("A").get<long>()) + "n+" +
         std::to_string(r.at("B").get<long>()) + ") vs " + r.at("G").get<std::string>() + "(" +
         std::to_string(r.at("A2").get<long>()) + "n+" + std::to_string(r.at("B2").get<long>()) + ")";
}

nlohmann::json scan_summary(ResultsDb& db, ScanContext* ctx) {
  nlohmann::json total = nlohmann::json::object();
  {
    SqliteStatement s(db.db(), "SELECT verdict, count(*) FROM pairs GROUP BY verdict ORDER BY verdict");
    while (s.step()) total[s.text_at(0)] = static_cast<long>(s.int_at(1));
  }
  nlohmann::json pt = nlohmann::json::array();
  {
    SqliteStatement s(db.db(), "SELECT t, verdict, count(*) FROM pairs GROUP BY t, verdict ORDER BY t, verdict");
    long last_t = -1;
    while (s.step()) {
      long t = static_cast<long>(s.int_at(0));
      if (t != last_t) pt.push_back({{"t", t}, {"verdicts", nlohmann::json::object()}});
      last_t = t;
      pt.back()["verdicts"][s.text_at(1)] = static_cast<long>(s.int_at(2));
    }
  }
  nlohmann::json undecided = nlohmann::json::object();
  undecided["precision"] = count_where(db, "verdict = 'UNDECIDED' AND reason LIKE '%cause: precision%'");
  undecided["mathematics"] = count_where(db, "verdict = 'UNDECIDED' AND reason LIKE '%cause: mathematics%'");
  undecided["other"] = count_where(db, "verdict = 'UNDECIDED' AND reason NOT LIKE '%cause: precision%' AND "
                                       "reason NOT LIKE '%cause: mathematics%'");
  const long decided_higher = count_where(db, "reason LIKE '%(decided at %'");

  // Listed pairs, each list capped (memory independent of the scan's size).
  nlohmann::json candidates = nlohmann::json::array(), constants = nlohmann::json::array(),
                 proportional = nlohmann::json::array(), sub_proportional = nlohmann::json::array();
  long n_constants = 0, n_candidates = 0, n_prop = 0, n_sub = 0;
  db.for_each_row(
      [&](const nlohmann::json& r, const std::string&) {
        const std::string v = r.at("verdict").get<std::string>();
        const std::string pair = scan_pair_text(r);
        if (v == "CONSTANT") {
          if (n_constants++ < kSummaryListCap)
            constants.push_back({{"job", r["job"]}, {"pair", pair}, {"constant", r.value("constant", "")}});
          if (r.value("contains_integer", false) && n_candidates++ < kSummaryListCap) {
            nlohmann::json c{{"job", r["job"]}, {"pair", pair}, {"constant", r.value("constant", "")}};
            if (ctx) {
              // Exact-count comparison up to n = 10^4 for a candidate.
              const long K = 10000;
              Family F = Family::parse(r["F"].get<std::string>()), G = Family::parse(r["G"].get<std::string>());
              Progression ap{r["A"].get<long>(), r["B"].get<long>()}, ap2{r["A2"].get<long>(), r["B2"].get<long>()};
              const IntegerSeries& f = ctx->series(F, ap.A * K + ap.B);
              const IntegerSeries& g = ctx->series(G, ap2.A * K + ap2.B);
              ProportionalityResult p = compare_exact(f, ap, g, ap2, K);
              c["exact_compare_to_10000"] =
                  relation_name(p.relation) + (p.relation == Relation::Proportional ? " k=" + p.k.str() : std::string());
            }
            candidates.push_back(c);
          }
        }
        if (v == "PROPORTIONAL" && n_prop++ < kSummaryListCap)
          proportional.push_back({{"job", r["job"]}, {"pair", pair}, {"k", r.value("k", "")}});
        if (r.contains("proportional_subclasses") && !r["proportional_subclasses"].empty() && n_sub++ < kSummaryListCap)
          sub_proportional.push_back({{"job", r["job"]}, {"pair", pair}, {"classes", r["proportional_subclasses"]},
                                      {"description", r.value("reason", "")}});
      },
      "verdict IN ('CONSTANT', 'PROPORTIONAL') OR contains_integer = 1 OR "
      "(proportional_subclasses IS NOT NULL AND proportional_subclasses != '[]')");
  return {{"jobs", db.count()},
          {"non_convergent_by_Q", grouped(db, "Q", "verdict = 'NON-CONVERGENT'")},
          {"non_convergent_by_distinguishing_prime", grouped(db, "prime", "verdict = 'NON-CONVERGENT'")},
          {"certificates_verified", count_where(db, "verified = 1")},
          {"certificates_failing_verification", count_where(db, "verified = 0")},
          {"verdicts", total},
          {"per_t", pt},
          {"undecided_by_cause", undecided},
          {"decided_at_higher_precision", decided_higher},
          {"constant_pairs", constants},
          {"constant_pairs_total", n_constants},
          {"candidates", candidates},
          {"candidates_total", n_candidates},
          {"proportional_pairs", proportional},
          {"proportional_pairs_total", n_prop},
          {"proportional_subprogressions", sub_proportional},
          {"proportional_subprogressions_total", n_sub},
          {"list_cap", kSummaryListCap},
          {"subprogression_skipping",
           "none: every pair is decided directly, so that shards are independent. (Skipping would be valid only "
           "from a CONSTANT pair to its restrictions, and from a NON-CONVERGENT restriction to the pair containing it.)"}};
}

std::string scan_summary_text(const nlohmann::json& header, const std::string& shard, const nlohmann::json& s) {
  std::ostringstream o;
  const std::string pair = header.value("pair", std::string("ct:sc2t-1"));
  o << "circlet scan: pair " << pair << ", t = " << header["t_lo"] << ".." << header["t_hi"]
    << ", all progression pairs with A, A2 <= " << header["modulus"] << " (shard " << shard << ")\n";
  o << "jobs: " << s["jobs"] << "\n";
  for (const auto& [v, n] : s["verdicts"].items()) o << "  " << v << ": " << n << "\n";
  o << "per t:\n";
  for (const auto& e : s["per_t"]) {
    o << "  t = " << e["t"] << ":";
    for (const auto& [v, n] : e["verdicts"].items()) o << " " << v << " " << n;
    o << "\n";
  }
  const auto& u = s["undecided_by_cause"];
  if (s["verdicts"].contains("UNDECIDED"))
    o << "UNDECIDED by cause: precision " << u["precision"] << ", mathematics " << u["mathematics"] << ", other "
      << u["other"] << " (weight <= 2, or no rho_p varies)\n";
  if (s["decided_at_higher_precision"].get<long>() > 0)
    o << "decided only after raising the precision: " << s["decided_at_higher_precision"] << "\n";
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
  auto more = [&](const char* total, const nlohmann::json& list) {
    long n = s[total].get<long>();
    if (n > static_cast<long>(list.size()))
      o << "  ... and " << n - static_cast<long>(list.size()) << " more (query the database)\n";
  };
  o << "CONSTANT pairs: " << s["constant_pairs_total"] << "\n";
  for (const auto& c : s["constant_pairs"])
    o << "  " << c["pair"].get<std::string>() << ": constant " << c["constant"].get<std::string>() << "\n";
  more("constant_pairs_total", s["constant_pairs"]);
  if (s["candidates"].empty()) {
    o << "CANDIDATES (CONSTANT with an integer in the interval): none\n";
  } else {
    o << "*** CANDIDATES (CONSTANT with an integer in the interval): " << s["candidates_total"] << " ***\n";
    for (const auto& c : s["candidates"])
      o << "  " << c["pair"].get<std::string>() << " constant " << c["constant"].get<std::string>() << "  exact counts: "
        << c.value("exact_compare_to_10000", std::string("not compared")) << "\n";
    more("candidates_total", s["candidates"]);
  }
  if (!s["proportional_pairs"].empty() || !s["proportional_subprogressions"].empty()) {
    o << "exact relations (weight <= 2; PROVED/REFUTED by the Sturm bound, docs/MATH.md §8):\n";
    for (const auto& c : s["proportional_pairs"]) o << "  " << c["pair"].get<std::string>() << ": k = " << c["k"].get<std::string>() << "\n";
    more("proportional_pairs_total", s["proportional_pairs"]);
    for (const auto& c : s["proportional_subprogressions"])
      o << "  " << c["pair"].get<std::string>() << ": " << c["description"].get<std::string>() << "\n";
    more("proportional_subprogressions_total", s["proportional_subprogressions"]);
  }
  o << "sub-progression skipping: " << s["subprogression_skipping"].get<std::string>() << "\n";
  return o.str();
}

void write_scan_outputs(const std::string& dir, ResultsDb& db, ScanContext* ctx, bool csv) {
  ensure_dir(dir);
  const nlohmann::json& header = db.header();
  const Provenance prov = Provenance::now(command_line(), header.value("prec", 0L));
  nlohmann::json summary = scan_summary(db, ctx);
  const std::string merged_from = db.plan_value("merged_from");
  const std::string shard = merged_from.empty() ? db.shard() : "all, merged from " + merged_from + " shards";
  if (csv) {
    AtomicFile f(dir + "/scan.csv");
    std::ostream& out = f.stream();
    out << prov.csv_comment() << scan_csv_header();
    db.for_each_row([&](const nlohmann::json& r, const std::string&) {
      bool first = true;
      for (const auto& c : scan_columns()) {
        if (!first) out << ',';
        first = false;
        out << csv_field(r, c.name);
      }
      out << '\n';
    });
    f.commit();
  }
  nlohmann::json j{{"provenance", prov.to_json()}, {"header", header}, {"shard", shard},
                   {"database", "scan.db"}, {"summary", summary}};
  write_file_atomically(dir + "/summary.json", j.dump(1) + "\n");
  write_file_atomically(dir + "/summary.txt",
                        "# " + prov.csv_comment().substr(2) + scan_summary_text(header, shard, summary));
}

namespace {
std::string db_path_of(const std::string& input) {
  struct stat st;
  if (::stat(input.c_str(), &st) != 0) throw UserError("cannot read " + input + ": no such file or directory");
  return S_ISDIR(st.st_mode) ? input + "/scan.db" : input;
}
bool same_file(const std::string& a, const std::string& b) {
  struct stat sa, sb;
  return ::stat(a.c_str(), &sa) == 0 && ::stat(b.c_str(), &sb) == 0 && sa.st_dev == sb.st_dev && sa.st_ino == sb.st_ino;
}
}  // namespace

void merge_scan_databases(const std::vector<std::string>& inputs, const std::string& out_dir, bool csv) {
  if (inputs.empty()) throw UserError("scan-merge needs at least one shard directory");
  std::vector<std::string> paths;
  for (const auto& in : inputs) paths.push_back(db_path_of(in));
  ensure_dir(out_dir);
  const std::string out_path = out_dir + "/scan.db";
  for (size_t i = 0; i < paths.size(); ++i)
    if (same_file(paths[i], out_path))
      throw UserError("scan-merge: the output " + out_path + " is one of its inputs (" + inputs[i] +
                      "); choose another output directory");
  struct stat st;
  if (::stat(out_path.c_str(), &st) == 0)
    throw UserError("scan-merge: " + out_path + " already exists; choose a new output directory");

  nlohmann::json header;
  ScanSpec spec;
  long k = -1;
  std::set<long> shards;
  std::unique_ptr<ScanSettings> settings;
  std::unique_ptr<ScanContext> ctx;
  // First pass: every input's plan (nothing is written before all plans agree).
  std::vector<ShardSpec> shard_of(paths.size());
  for (size_t i = 0; i < paths.size(); ++i) {
    ResultsDb in(paths[i], ResultsDb::Mode::Read);
    if (in.plan_value("merged_from") != "")
      throw UserError(inputs[i] + " is an already merged scan (of " + in.plan_value("merged_from") +
                      " shards), not a shard: merge the shards themselves");
    if (header.is_null()) {
      header = in.header();
      spec = scan_spec_from_header(header);
      settings = std::make_unique<ScanSettings>(scan_settings_from_header(header));
      ctx = std::make_unique<ScanContext>(*settings);
    } else if (in.header() != header) {
      throw UserError(inputs[i] + ": scan parameters differ from " + inputs[0] + " (" + in.header().dump() + " vs " +
                      header.dump() + ")");
    }
    ShardSpec s;
    try {
      s = ShardSpec::parse(in.shard());
    } catch (const UserError&) {
      throw UserError(inputs[i] + ": its plan names no valid shard ('" + in.shard() + "')");
    }
    if (k < 0) k = s.k;
    else if (s.k != k) throw UserError(inputs[i] + ": shard " + s.str() + " is not one of " + std::to_string(k) + " shards");
    if (!shards.insert(s.i).second) throw UserError(inputs[i] + ": shard " + s.str() + " given twice");
    shard_of[i] = s;
  }
  for (long i = 0; i < k; ++i)
    if (!shards.count(i)) throw UserError("shard " + std::to_string(i) + "/" + std::to_string(k) + " is missing");

  const std::string tmp = out_path + ".tmp." + std::to_string(::getpid());
  ::unlink(tmp.c_str());
  try {
    {
      ResultsDb out(tmp, ResultsDb::Mode::Create, header, "0/1");
      out.set_plan_value("merged_from", std::to_string(k));
      for (size_t i = 0; i < paths.size(); ++i) {
        ResultsDb in(paths[i], ResultsDb::Mode::Read);
        SqliteTransaction tx(out.db());
        in.for_each_row([&](const nlohmann::json& r, const std::string& problem) {
          const std::string where = inputs[i] + ": ";
          if (!problem.empty())
            throw UserError(where + "malformed row (job " + (r.contains("job") ? r["job"].dump() : "?") + "): " + problem);
          std::string bad = check_row_against_plan(r, spec, shard_of[i]);
          if (!bad.empty()) throw UserError(where + bad);
          if (row_needs_recomputation(r)) {
            nlohmann::json again = run_scan_job(*ctx, scan_job(spec, r["job"].get<long>()));
            if (again != r)
              throw UserError(where + "job " + r["job"].dump() + " claims " + r["verdict"].get<std::string>() +
                              " but recomputation gives " + again["verdict"].get<std::string>() +
                              " (the shard was edited or is not from this program)");
          }
          if (!out.insert(r)) throw UserError("job " + r["job"].dump() + " appears twice");
        });
        tx.commit();
      }
      const long n = out.count();
      if (n != spec.job_count()) {
        // The first missing job, by walking the ordered job numbers.
        long expect = 0;
        SqliteStatement s(out.db(), "SELECT job FROM pairs ORDER BY job");
        while (s.step() && s.int_at(0) == expect) ++expect;
        throw UserError(std::to_string(spec.job_count() - n) + " jobs are missing (first: job " +
                        std::to_string(expect) + ")");
      }
      out.db().exec("PRAGMA journal_mode = DELETE");
    }
    if (::rename(tmp.c_str(), out_path.c_str()) != 0) throw UserError("cannot rename " + tmp + " to " + out_path);
  } catch (...) {
    ::unlink(tmp.c_str());
    ::unlink((tmp + "-wal").c_str());
    ::unlink((tmp + "-shm").c_str());
    throw;
  }
  ResultsDb merged(out_path, ResultsDb::Mode::Read);
  write_scan_outputs(out_dir, merged, ctx.get(), csv);
}

}  // namespace circlet
