// End-to-end checks of `circlet scan` / `circlet scan-merge` with the real binary:
// the results database, shard-and-merge, kill-and-resume, refusals.
#include "scan/scan_output.hpp"

#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <catch2/catch.hpp>
#include <chrono>
#include <fstream>
#include <thread>

#include "cli_run.hpp"
#include "scan/results_db.hpp"
#include "scan/scan_job.hpp"
#include "scan/sqlite.hpp"

using namespace circlet;
using circlet::testing::run_circlet;

namespace {
std::string slurp(const std::string& path) { return circlet::testing::slurp_file(path); }
// scan.csv without its provenance comment line.
std::string csv_rows(const std::string& dir) {
  std::string s = slurp(dir + "/scan.csv");
  REQUIRE(s.rfind("# circlet", 0) == 0);
  return s.substr(s.find('\n') + 1);
}
// Every row of dir/scan.db, in job order.
std::vector<nlohmann::json> db_rows(const std::string& dir) {
  ResultsDb db(dir + "/scan.db", ResultsDb::Mode::Read);
  std::vector<nlohmann::json> rows;
  db.for_each_row([&](const nlohmann::json& r, const std::string& problem) {
    CHECK(problem.empty());
    rows.push_back(r);
  });
  return rows;
}
nlohmann::json summary(const std::string& dir) { return nlohmann::json::parse(slurp(dir + "/summary.json"))["summary"]; }
int run(const std::string& args) { return run_circlet(args).status; }
// Runs SQL on a database with the sqlite3 C API (tests edit shards as a forger would).
void sql(const std::string& db_path, const std::string& statement) {
  SqliteDb db(db_path, false);
  db.exec(statement);
}
long db_count(const std::string& path) {
  try {
    SqliteDb db(path, true);
    SqliteStatement s(db, "SELECT count(*) FROM pairs");
    return s.step() ? static_cast<long>(s.int_at(0)) : 0;
  } catch (const std::exception&) {
    return 0;  // not created yet, or the table not yet committed
  }
}
struct TempDir {
  std::string path = "/tmp/circlet_scan_test_" + std::to_string(::getpid());
  TempDir() { std::system(("rm -rf " + path + " && mkdir -p " + path).c_str()); }
  ~TempDir() { std::system(("rm -rf " + path).c_str()); }
};
void copy_dir(const std::string& from, const std::string& to) { std::system(("cp -r " + from + " " + to).c_str()); }
}  // namespace

TEST_CASE("shard-and-merge equals a single run, in the database and in the CSV", "[scan][merge]") {
  TempDir tmp;
  const std::string scan = "scan --t 5..7 --modulus 3 --compare-to 200";
  REQUIRE(run(scan + " -o " + tmp.path + "/all") == 0);
  for (int i = 0; i < 3; ++i)
    REQUIRE(run(scan + " --shard " + std::to_string(i) + "/3 -o " + tmp.path + "/s" + std::to_string(i)) == 0);
  const std::string shards = tmp.path + "/s0 " + tmp.path + "/s1 " + tmp.path + "/s2";
  REQUIRE(run("scan-merge " + shards + " -o " + tmp.path + "/merged") == 0);
  CHECK(db_rows(tmp.path + "/all").size() == 108);
  CHECK(db_rows(tmp.path + "/merged") == db_rows(tmp.path + "/all"));
  CHECK(csv_rows(tmp.path + "/merged") == csv_rows(tmp.path + "/all"));
  CHECK(summary(tmp.path + "/merged")["verdicts"] == summary(tmp.path + "/all")["verdicts"]);
  // Missing and repeated shards are refused with a message.
  CHECK_THROWS_WITH(merge_scan_databases({tmp.path + "/s0", tmp.path + "/s1"}, tmp.path + "/m2"),
                    Catch::Contains("shard 2/3 is missing"));
  CHECK_THROWS_WITH(merge_scan_databases({tmp.path + "/s0", tmp.path + "/s0", tmp.path + "/s1"}, tmp.path + "/m3"),
                    Catch::Contains("given twice"));
  // A shard that lost a row: the missing job is named.
  copy_dir(tmp.path + "/s1", tmp.path + "/s1b");
  sql(tmp.path + "/s1b/scan.db", "DELETE FROM pairs WHERE job = 1");
  CHECK_THROWS_WITH(merge_scan_databases({tmp.path + "/s0", tmp.path + "/s1b", tmp.path + "/s2"}, tmp.path + "/m4"),
                    Catch::Contains("1 jobs are missing (first: job 1)"));
  // Merging an already merged scan is named as such.
  auto r = run_circlet("scan-merge " + tmp.path + "/merged -o " + tmp.path + "/m5");
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("already merged scan"));
}

TEST_CASE("scan-merge refuses forged and malformed shards with exit 2, and its inputs as output", "[scan][merge]") {
  TempDir tmp;
  const std::string scan = "scan --t 6..6 --modulus 2";
  for (int i = 0; i < 2; ++i)
    REQUIRE(run(scan + " --shard " + std::to_string(i) + "/2 -o " + tmp.path + "/s" + std::to_string(i)) == 0);
  const std::string s0 = tmp.path + "/s0", s1 = tmp.path + "/s1";
  auto refused = [&](const std::string& forged_dir, const std::string& message) {
    auto r = run_circlet("scan-merge " + s0 + " " + forged_dir + " -o " + tmp.path + "/out_" + std::to_string(::rand()));
    CHECK(r.status == 2);
    CHECK(r.out.empty());
    CHECK_THAT(r.err, Catch::StartsWith("circlet: error: ") && Catch::Contains(message));
  };
  // A verdict edited to CONSTANT with an integer constant: recomputed, refused.
  copy_dir(s1, tmp.path + "/forged");
  sql(tmp.path + "/forged/scan.db",
      "UPDATE pairs SET verdict = 'CONSTANT', constant = '2', contains_integer = 1 WHERE job = 1");
  refused(tmp.path + "/forged", "claims CONSTANT but recomputation gives NON-CONVERGENT");
  // A job number outside the plan.
  copy_dir(s1, tmp.path + "/outside");
  sql(tmp.path + "/outside/scan.db", "UPDATE pairs SET job = 1001 WHERE job = 1");
  refused(tmp.path + "/outside", "outside the plan");
  // A row of the right job but another pair.
  copy_dir(s1, tmp.path + "/otherpair");
  sql(tmp.path + "/otherpair/scan.db", "UPDATE pairs SET B2 = 7 WHERE job = 1");
  refused(tmp.path + "/otherpair", "the pair differs from the plan's");
  // Wrong types, a missing verdict, a missing plan, not a database at all.
  copy_dir(s1, tmp.path + "/types");
  sql(tmp.path + "/types/scan.db", "UPDATE pairs SET Q = 'three' WHERE job = 1");
  refused(tmp.path + "/types", "column Q has the wrong type");
  copy_dir(s1, tmp.path + "/noverdict");
  sql(tmp.path + "/noverdict/scan.db", "UPDATE pairs SET verdict = 'MAYBE' WHERE job = 3");
  refused(tmp.path + "/noverdict", "unknown verdict 'MAYBE'");
  copy_dir(s1, tmp.path + "/noplan");
  sql(tmp.path + "/noplan/scan.db", "DROP TABLE plan");
  refused(tmp.path + "/noplan", "is not a circlet scan database");
  std::system(("mkdir -p " + tmp.path + "/text && echo hello > " + tmp.path + "/text/scan.db").c_str());
  refused(tmp.path + "/text", "is not a circlet scan database (not an SQLite file)");
  // -o onto one of the inputs: refused, the input unchanged.
  const std::string before = slurp(s0 + "/scan.db");
  auto r = run_circlet("scan-merge " + s0 + " " + s1 + " -o " + s0);
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("is one of its inputs"));
  CHECK(slurp(s0 + "/scan.db") == before);
}

TEST_CASE("a scan killed mid-way and resumed equals an uninterrupted one", "[scan][resume]") {
  TempDir tmp;
  const std::string args = "scan --t 6..12 --modulus 4 -o ";
  REQUIRE(run(args + tmp.path + "/full") == 0);
  const std::string dir = tmp.path + "/killed";
  pid_t pid = ::fork();
  REQUIRE(pid >= 0);
  if (pid == 0) {
    std::freopen("/dev/null", "w", stderr);
    ::execl(CIRCLET_BINARY, "circlet", "scan", "--t", "6..12", "--modulus", "4", "--threads", "2", "-o", dir.c_str(),
            (char*)nullptr);
    ::_exit(127);
  }
  // Kill it (SIGKILL: no clean-up) once some jobs are committed.
  auto start = std::chrono::steady_clock::now();
  while (db_count(dir + "/scan.db") < 60 && std::chrono::steady_clock::now() - start < std::chrono::seconds(20))
    std::this_thread::sleep_for(std::chrono::milliseconds(2));
  ::kill(pid, SIGKILL);
  int status = 0;
  ::waitpid(pid, &status, 0);
  REQUIRE(WIFSIGNALED(status));
  const long done_before = db_count(dir + "/scan.db");
  CHECK(done_before >= 60);
  CHECK(done_before < 700);
  std::ifstream probe(dir + "/scan.csv");
  CHECK_FALSE(probe.good());  // exports are written only at the end
  // Without --resume an existing database is refused.
  CHECK(run(args + dir) == 2);
  auto r = run_circlet(args + dir + " --resume");
  REQUIRE(r.status == 0);
  CHECK_THAT(r.err, Catch::Contains(std::to_string(done_before) + " from the database"));
  CHECK(db_rows(dir) == db_rows(tmp.path + "/full"));
  CHECK(csv_rows(dir) == csv_rows(tmp.path + "/full"));
  CHECK(db_count(dir + "/scan.db") == 700);
  // A database of another scan is refused on --resume.
  auto other = run_circlet("scan --t 6..12 --modulus 5 --resume -o " + dir);
  CHECK(other.status == 2);
  CHECK_THAT(other.err, Catch::Contains("belongs to another scan"));
}

TEST_CASE("resume checks stored rows against the plan and recomputes CONSTANT claims", "[scan][resume]") {
  TempDir tmp;
  const std::string args = "scan --t 6..7 --modulus 3 -o ";
  REQUIRE(run(args + tmp.path + "/ref") == 0);
  const auto ref = db_rows(tmp.path + "/ref");
  REQUIRE(ref.size() == 72);
  const std::string dir = tmp.path + "/edited";
  copy_dir(tmp.path + "/ref", dir);
  // An edited verdict, a row moved outside the plan, a wrong type and a wrong pair.
  sql(dir + "/scan.db", "UPDATE pairs SET verdict = 'CONSTANT', constant = '1', contains_integer = 1 WHERE job = 5");
  sql(dir + "/scan.db", "UPDATE pairs SET job = 99999 WHERE job = 6");
  sql(dir + "/scan.db", "UPDATE pairs SET Q = 'x' WHERE job = 7");
  sql(dir + "/scan.db", "UPDATE pairs SET A = 9 WHERE job = 8");
  auto r = run_circlet(args + dir + " --resume");
  REQUIRE(r.status == 0);
  CHECK_THAT(r.err, Catch::Contains("3 stored rows dropped and recomputed, 1 corrected after recomputation"));
  CHECK_THAT(r.err, Catch::Contains("job 99999 is outside the plan"));
  CHECK_THAT(r.err, Catch::Contains("corrected: job 5 claimed CONSTANT, recomputation gives NON-CONVERGENT"));
  CHECK(db_rows(dir) == ref);
  CHECK(summary(dir)["candidates"].empty());
  // A plan without its header is named as such (not "another scan").
  sql(dir + "/scan.db", "DELETE FROM plan WHERE key = 'header'");
  auto h = run_circlet(args + dir + " --resume");
  CHECK(h.status == 2);
  CHECK_THAT(h.err, Catch::Contains("the plan has no scan header"));
  // A damaged file (bytes overwritten inside the pages) is refused and left unchanged.
  const std::string dmg = tmp.path + "/damaged";
  copy_dir(tmp.path + "/ref", dmg);
  // Page 2 and 3 headers (pages of 4096 bytes) overwritten: SQLite's quick_check fails.
  std::system(("head -c 200 /dev/zero | tr '\\0' 'X' | dd of=" + dmg + "/scan.db bs=1 seek=4096 conv=notrunc 2>/dev/null; " +
               "head -c 200 /dev/zero | tr '\\0' 'X' | dd of=" + dmg + "/scan.db bs=1 seek=8192 conv=notrunc 2>/dev/null")
                  .c_str());
  const std::string damaged = slurp(dmg + "/scan.db");
  auto d = run_circlet(args + dmg + " --resume");
  CHECK(d.status == 2);
  CHECK_THAT(d.err, Catch::Contains("circlet: error: ") && (Catch::Contains("damaged") || Catch::Contains("malformed")));
  CHECK(slurp(dmg + "/scan.db") == damaged);
}

// Every certificate behind a scan's verdicts passes the independent re-check
// (counting mod p^j, other precision). This caught a too-small ball margin once.
TEST_CASE("scan --verify re-checks every certificate and all pass", "[scan][verify]") {
  TempDir tmp;
  REQUIRE(run("scan --t 6..9 --modulus 3 --verify -o " + tmp.path + "/v") == 0);
  nlohmann::json s = summary(tmp.path + "/v");
  CHECK(s["jobs"] == 144);
  CHECK(s["certificates_verified"] == 144);
  CHECK(s["certificates_failing_verification"] == 0);
}

TEST_CASE("one worker thread and two give the same database", "[scan][threads]") {
  TempDir tmp;
  REQUIRE(run("scan --t 6..8 --modulus 3 --threads 1 -o " + tmp.path + "/one") == 0);
  REQUIRE(run("scan --t 6..8 --modulus 3 --threads 2 -o " + tmp.path + "/two") == 0);
  CHECK(db_rows(tmp.path + "/one") == db_rows(tmp.path + "/two"));
  CHECK(csv_rows(tmp.path + "/one") == csv_rows(tmp.path + "/two"));
}

TEST_CASE("progress goes to stderr only when asked or on a terminal", "[scan][progress]") {
  TempDir tmp;
  auto quiet = run_circlet("scan --t 6 --modulus 2 -o " + tmp.path + "/q");
  REQUIRE(quiet.status == 0);
  CHECK_THAT(quiet.err, !Catch::Contains("ETA"));
  auto loud = run_circlet("scan --t 6 --modulus 2 --progress -o " + tmp.path + "/p");
  REQUIRE(loud.status == 0);
  CHECK_THAT(loud.err, Catch::Contains("circlet scan: 9/9 jobs (100.0%)") && Catch::Contains("jobs/s  ETA 0:00:00"));
  CHECK(loud.out.empty());
}

// A CONSTANT row whose constant is an integer is listed as a candidate and
// compared on exact counts up to n = 10^4: c_t against itself, where the
// diagonal pairs are identical sequences (k = 1).
TEST_CASE("integer CONSTANT rows are listed as candidates with an exact-count comparison", "[scan][summary]") {
  TempDir tmp;
  REQUIRE(run("scan --t 6 --modulus 2 --pair ct:ct -o " + tmp.path + "/cc") == 0);
  nlohmann::json s = summary(tmp.path + "/cc");
  CHECK(s["jobs"] == 9);
  REQUIRE(s["candidates"].size() == 3);
  CHECK(s["constant_pairs_total"] == 3);
  CHECK(s["candidates"][0]["exact_compare_to_10000"] == "proportional k=1");
  std::string text = slurp(tmp.path + "/cc/summary.txt");
  CHECK_THAT(text, Catch::Contains("*** CANDIDATES") && Catch::Contains("c6(2n+1) vs c6(2n+1)"));
}

TEST_CASE("scan compares any two families of equal weight", "[scan][pair]") {
  TempDir tmp;
  // c_t against r_{t−1} (both weight (t−1)/2): certificates at t = 6, 7.
  REQUIRE(run("scan --t 6..7 --modulus 2 --pair ct:sqt-1 -o " + tmp.path + "/sq") == 0);
  auto rows = db_rows(tmp.path + "/sq");
  REQUIRE(rows.size() == 18);
  CHECK(rows[0]["F"] == "c6");
  CHECK(rows[0]["G"] == "sq5");
  CHECK(rows[17]["G"] == "sq6");
  for (const auto& r : rows) CHECK(r["verdict"] != "UNDECIDED");
  // A fixed pair at a single t.
  REQUIRE(run("scan --t 6 --modulus 2 --pair c6:sq5 -o " + tmp.path + "/fixed") == 0);
  CHECK(db_rows(tmp.path + "/fixed") == std::vector<nlohmann::json>(rows.begin(), rows.begin() + 9));
  // Refusals: unequal weights, a fixed pair over a range, an empty exact comparison.
  auto w = run_circlet("scan --t 6 --modulus 2 --pair ct:c2t -o " + tmp.path + "/w");
  CHECK(w.status == 2);
  CHECK_THAT(w.err, Catch::Contains("c6 has weight 5/2 but c12 has weight 11/2"));
  auto f = run_circlet("scan --t 6..7 --modulus 2 --pair c6:sq5 -o " + tmp.path + "/f");
  CHECK(f.status == 2);
  CHECK_THAT(f.err, Catch::Contains("does not depend on t"));
  for (const char* k : {"0", "1"}) {
    auto c = run_circlet("scan --t 4..5 --modulus 2 --compare-to " + std::string(k) + " -o " + tmp.path + "/c" + k);
    CHECK(c.status == 2);
    CHECK_THAT(c.err, Catch::Contains("--compare-to must be at least 2"));
  }
}

TEST_CASE("the weight 3/2 scan reports the c4/sc7 relation proved by the Sturm bound", "[scan][prove]") {
  // c_4(7n+2) = 2 sc_7(8n+1) except when n ≡ 4 (mod 7) (tests/modform_proof.cpp proves it on its
  // own; here the scan must find it from its exact comparison and write the proof's verdict).
  TempDir tmp;
  REQUIRE(run("scan --t 4..4 --modulus 8 -o " + tmp.path + "/s4") == 0);
  SqliteDb db(tmp.path + "/s4/scan.db", true);
  SqliteStatement s(db, "SELECT reason FROM pairs WHERE A = 7 AND B = 2 AND A2 = 8 AND B2 = 1");
  REQUIRE(s.step());
  // The restricted relation, then the whole one with the dilated term that closes the exception class.
  CHECK(s.text_at(0) ==
        "PROVED: c4(7n+2) - 2*sc7(8n+1) = 0 for n mod 7 != 4; PROVED: c4(7n+2) - 2*sc7(8n+1) - c4((n-4)/7) = 0");
  const std::string text = slurp(tmp.path + "/s4/summary.txt");
  CHECK(text.find("c4(7n+2) vs sc7(8n+1): PROVED: c4(7n+2) - 2*sc7(8n+1) = 0 for n mod 7 != 4") != std::string::npos);
  CHECK(text.find("exact counts n = 0..") == std::string::npos);  // the pair's reason is the proof, not a check
}

TEST_CASE("scan --verify re-checks a certificate whose counting verify alone would refuse", "[scan][verify]") {
  // c9(22n+15) vs sc17(18n+3): verify estimates 14.5 s for counting β_11 of c9
  // modulo 11^5 and refuses it without --no-time-limit; the real count takes
  // about a second. Inside a scan the limit does not apply.
  ScanSettings s;
  s.spec.t_lo = s.spec.t_hi = 9;
  s.spec.M = 24;
  s.verify = true;
  ScanContext ctx(s);
  ScanJob job;
  job.index = 0;
  job.t = 9;
  job.F = Family::parse("c9");
  job.G = Family::parse("sc17");
  job.ap = Progression{22, 15};
  job.ap2 = Progression{18, 3};
  const nlohmann::json row = run_scan_job(ctx, job);
  CHECK(row["verdict"] == "NON-CONVERGENT");
  INFO(row.dump());
  CHECK(row["verified"] == true);
  CHECK_FALSE(row.contains("verify_failure"));
}
