// End-to-end checks of `circlet scan` / `circlet scan-merge` with the real binary.
#include "scan/scan_output.hpp"

#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <catch2/catch.hpp>

#include "cli_run.hpp"
#include <chrono>
#include <fstream>
#include <thread>

using namespace circlet;

namespace {
std::string slurp(const std::string& path) {
  std::ifstream in(path);
  return std::string((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
}
// scan.csv without its provenance comment line.
std::string csv_rows(const std::string& dir) {
  std::string s = slurp(dir + "/scan.csv");
  REQUIRE(s.rfind("# circlet", 0) == 0);
  return s.substr(s.find('\n') + 1);
}
nlohmann::json json_rows(const std::string& dir) { return nlohmann::json::parse(slurp(dir + "/scan.json"))["rows"]; }
int run(const std::string& args) { return circlet::testing::run_circlet(args).status; }
long lines(const std::string& path) {
  std::ifstream in(path);
  long n = 0;
  std::string l;
  while (std::getline(in, l)) ++n;
  return n;
}
struct TempDir {
  std::string path = "/tmp/circlet_scan_test_" + std::to_string(::getpid());
  TempDir() { std::system(("rm -rf " + path + " && mkdir -p " + path).c_str()); }
  ~TempDir() { std::system(("rm -rf " + path).c_str()); }
};
}  // namespace

TEST_CASE("shard-and-merge equals a single run", "[scan][merge]") {
  TempDir tmp;
  const std::string scan = "scan --t 5..7 --modulus 3 --compare-to 200";
  REQUIRE(run(scan + " -o " + tmp.path + "/all") == 0);
  for (int i = 0; i < 3; ++i)
    REQUIRE(run(scan + " --shard " + std::to_string(i) + "/3 -o " + tmp.path + "/s" + std::to_string(i)) == 0);
  REQUIRE(run("scan-merge " + tmp.path + "/s0 " + tmp.path + "/s1 " + tmp.path + "/s2 -o " + tmp.path + "/merged") == 0);
  CHECK(json_rows(tmp.path + "/all").size() == 108);
  CHECK(json_rows(tmp.path + "/merged") == json_rows(tmp.path + "/all"));
  CHECK(csv_rows(tmp.path + "/merged") == csv_rows(tmp.path + "/all"));
  // Missing and repeated shards are refused with a message.
  CHECK_THROWS_WITH(merge_scan_outputs({tmp.path + "/s0", tmp.path + "/s1"}, tmp.path + "/m2"),
                    Catch::Contains("shard 2/3 is missing"));
  CHECK_THROWS_WITH(merge_scan_outputs({tmp.path + "/s0", tmp.path + "/s0", tmp.path + "/s1"}, tmp.path + "/m3"),
                    Catch::Contains("given twice"));
  // A shard whose rows lost a job: the missing job is named.
  nlohmann::json j = nlohmann::json::parse(slurp(tmp.path + "/s1/scan.json"));
  j["rows"].erase(j["rows"].begin());
  std::system(("mkdir -p " + tmp.path + "/s1b").c_str());
  std::ofstream(tmp.path + "/s1b/scan.json") << j.dump();
  CHECK_THROWS_WITH(merge_scan_outputs({tmp.path + "/s0", tmp.path + "/s1b", tmp.path + "/s2"}, tmp.path + "/m4"),
                    Catch::Contains("1 jobs are missing (first: job 1)"));
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
    ::execl(CIRCLET_BINARY, "circlet", "scan", "--t", "6..12", "--modulus", "4", "-o", dir.c_str(), (char*)nullptr);
    ::_exit(127);
  }
  // Kill it (SIGKILL: no clean-up) once some jobs are in the checkpoint.
  auto start = std::chrono::steady_clock::now();
  while (lines(dir + "/checkpoint.jsonl") < 60 && std::chrono::steady_clock::now() - start < std::chrono::seconds(20))
    std::this_thread::sleep_for(std::chrono::milliseconds(2));
  ::kill(pid, SIGKILL);
  int status = 0;
  ::waitpid(pid, &status, 0);
  REQUIRE(WIFSIGNALED(status));
  const long done_before = lines(dir + "/checkpoint.jsonl") - 1;
  CHECK(done_before >= 59);
  CHECK(done_before < 700);
  std::ifstream probe(dir + "/scan.csv");
  CHECK_FALSE(probe.good());  // outputs are written only at the end
  // A torn last line (a write cut short) is dropped and its job recomputed.
  std::ofstream(dir + "/checkpoint.jsonl", std::ios::app) << "{\"job\": 99999, \"t\": ";
  // Without --resume an existing checkpoint is refused.
  CHECK(run(args + dir) == 2);
  REQUIRE(run(args + dir + " --resume") == 0);
  CHECK(json_rows(dir) == json_rows(tmp.path + "/full"));
  CHECK(csv_rows(dir) == csv_rows(tmp.path + "/full"));
  CHECK(lines(dir + "/checkpoint.jsonl") == 700 + 1);  // header + each job exactly once
  // A checkpoint of another scan is refused on --resume.
  CHECK(run("scan --t 6..12 --modulus 5 --resume -o " + dir) == 2);
}

// Every certificate behind a scan's verdicts passes the independent re-check
// (counting mod p^j, other precision). This caught a too-small ball margin once.
TEST_CASE("scan --verify re-checks every certificate and all pass", "[scan][verify]") {
  TempDir tmp;
  REQUIRE(run("scan --t 6..9 --modulus 3 --verify -o " + tmp.path + "/v") == 0);
  nlohmann::json s = nlohmann::json::parse(slurp(tmp.path + "/v/scan.json"))["summary"];
  CHECK(s["jobs"] == 144);
  CHECK(s["certificates_verified"] == 144);
  CHECK(s["certificates_failing_verification"] == 0);
}

// A CONSTANT row whose constant is an integer is listed as a candidate and
// compared on exact counts up to n = 10^4 (here identical sequences: k = 1).
TEST_CASE("integer CONSTANT rows are listed as candidates with an exact-count comparison", "[scan][summary]") {
  ScanSettings s;
  ScanContext ctx(s);
  nlohmann::json row{{"job", 0}, {"t", 6},  {"F", "c6"}, {"G", "c6"},         {"A", 2},
                     {"B", 1},   {"A2", 2}, {"B2", 1},   {"verdict", "CONSTANT"}, {"constant", "1"},
                     {"contains_integer", true}};
  nlohmann::json summary = scan_summary({row}, &ctx);
  REQUIRE(summary["candidates"].size() == 1);
  CHECK(summary["candidates"][0]["exact_compare_to_10000"] == "proportional k=1");
  std::string text = scan_summary_text(nlohmann::json{{"t_lo", 6}, {"t_hi", 6}, {"modulus", 2}}, "0/1", summary);
  CHECK_THAT(text, Catch::Contains("*** CANDIDATES") && Catch::Contains("c6(2n+1) vs c6(2n+1)"));
}
