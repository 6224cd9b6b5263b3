// Tests of `circlet count` (src/cli/count.cpp): the real binary, its outputs
// and its refusals (exit status and the one-line message).
#include <sys/wait.h>
#include <unistd.h>

#include <catch2/catch.hpp>

#include "cli_run.hpp"
#include <cstdio>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>

using namespace std;

namespace {
using Run = circlet::testing::CliRun;
using circlet::testing::slurp_file;
Run run(const string& args, const string& env = "") { return circlet::testing::run_circlet(args, env); }

int lines(const string& s) {
  int n = 0;
  for (char c : s) n += c == '\n';
  return n;
}
}  // namespace

TEST_CASE("count --to prints a CSV table to stdout", "[cli][count]") {
  Run r = run("count c7 --to 10");
  REQUIRE(r.status == 0);
  // A053724 (7-cores), n = 0..10.
  CHECK(circlet::testing::csv_body(r.out) == "n,count\n0,1\n1,1\n2,2\n3,3\n4,5\n5,7\n6,11\n7,8\n8,15\n9,16\n10,21\n");
  // Standard output carries the provenance line too (docs/data-files.md), with the git commit and libraries.
  CHECK(r.out.rfind("# circlet ", 0) == 0);
  CHECK(r.out.find(" | git ") < r.out.find('\n'));
  CHECK(r.out.find(" | flint ") < r.out.find('\n'));
  CHECK(r.err.empty());
}

TEST_CASE("count --at and --ap", "[cli][count]") {
  Run a = run("count c4 --at 42");
  REQUIRE(a.status == 0);
  CHECK(circlet::testing::csv_body(a.out) == "n,count\n42,14\n");  // A045831(42) = 14
  Run p = run("count c4 --ap 7,2 --to 3");
  REQUIRE(p.status == 0);
  CHECK(circlet::testing::csv_body(p.out) == "k,n,count\n0,2,2\n1,9,4\n2,16,2\n3,23,8\n");  // A045831 at 2, 9, 16, 23
}

TEST_CASE("count prints big integers exactly", "[cli][count]") {
  Run r = run("count c40 --at 5000");
  REQUIRE(r.status == 0);
  const string body = circlet::testing::csv_body(r.out);
  const string v = body.substr(body.find('\n') + 1);
  CHECK(v.rfind("5000,", 0) == 0);
  CHECK(v.size() > 30);  // more than 20 digits: beyond 64 bits
  Run t = run("count c40 --to 5000");
  CHECK(t.out.substr(t.out.rfind("\n5000,") + 1) == v);
}

TEST_CASE("count --json has provenance and exact rows", "[cli][count]") {
  Run r = run("count sc13 --ap 2,1 --to 5 --json");
  REQUIRE(r.status == 0);
  auto j = nlohmann::json::parse(r.out);
  CHECK(j["family"] == "sc13");
  CHECK(j["provenance"]["program"] == "circlet");
  CHECK(j["provenance"]["command"].get<string>().find("count sc13") != string::npos);
  CHECK(j["columns"] == nlohmann::json{"k", "n", "count"});
  REQUIRE(j["rows"].size() == 6);
  CHECK(j["rows"][0] == nlohmann::json{0, 1, "1"});  // counts are strings (docs/data-files.md), n and k numbers
  CHECK(j["rows"][5][1] == 11);
  CHECK(j["rows"][5][2].is_string());
  Run big = run("count c40 --at 5000 --json");
  REQUIRE(big.status == 0);
  // The big count is a JSON string with all its digits.
  Run csv = run("count c40 --at 5000");
  const string digits = csv.out.substr(csv.out.rfind(',') + 1, csv.out.size() - csv.out.rfind(',') - 2);
  CHECK(big.out.find("[5000,\"" + digits + "\"]") != string::npos);
}

TEST_CASE("count -o writes the file atomically with a provenance line", "[cli][count]") {
  const string path = "/tmp/circlet_count_test_" + to_string(::getpid()) + ".csv";
  Run r = run("count c5 --to 100 -o " + path);
  REQUIRE(r.status == 0);
  CHECK(r.out.empty());
  const string body = slurp_file(path);
  CHECK(body.rfind("# circlet ", 0) == 0);
  CHECK(body.find("count c5 --to 100") != string::npos);
  CHECK(lines(body) == 1 + 1 + 101);
  std::remove(path.c_str());
  // A refused run leaves no file behind.
  Run bad = run("count c5 --to 100000 -o " + path, "CIRCLET_MEMORY_AVAILABLE=1000");
  CHECK(bad.status == 2);
  CHECK_FALSE(std::ifstream(path).good());
}

TEST_CASE("count refuses bad input with one clear line and exit status 2", "[cli][count][errors]") {
  struct Case {
    string args, env, message;
  };
  const Case cases[] = {
      {"count x7 --to 5", "", "unknown family 'x7'"},
      {"count c0 --to 5", "", "out of range"},
      {"count c1001 --to 5", "", "out of range"},
      {"count c7 --to -5", "", "--to must be non-negative"},
      {"count c7 --to abc", "", "--to expects a non-negative integer"},
      {"count c7 --at 1.5", "", "--at expects a non-negative integer"},
      {"count c7 --ap 0,1 --to 5", "", "A must be at least 1"},
      {"count c7 --ap 3,-1 --to 5", "", "B must be non-negative"},
      {"count c7 --ap 3,1", "", "--ap A,B needs --to K"},
      {"count c7", "", "give --to N, --at N or --ap A,B --to K"},
      {"count c7 --to 5 --at 3", "", "not both"},
      {"count c7 --ap 4611686018427387904,5 --to 3", "", "exceeds 64-bit integers"},
      {"count c7 --to 1000000000000", "", "of memory, more than the"},
      {"count c7 --to 100000", "CIRCLET_MEMORY_AVAILABLE=1000000", "needs about"},
  };
  for (const auto& c : cases) {
    INFO(c.args);
    Run r = run(c.args, c.env);
    CHECK(r.status == 2);
    CHECK(r.out.empty());
    CHECK(lines(r.err) == 1);
    CHECK(r.err.rfind("circlet: error: ", 0) == 0);
    CHECK(r.err.find(c.message) != string::npos);
  }
}
