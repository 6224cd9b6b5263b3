// Tests of `circlet arcs` and `circlet remainder` (src/cli/arcs.cpp,
// src/cli/remainder.cpp): the real binary, its outputs and its refusals.
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

vector<string> split_lines(const string& s) {
  vector<string> v;
  stringstream ss(s);
  for (string l; getline(ss, l);) v.push_back(l);
  return v;
}
}  // namespace

TEST_CASE("arcs prints one CSV row per k with the enclosure and the main term", "[cli][arcs]") {
  Run r = run("arcs c9 --at 1000 --upto 5");
  REQUIRE(r.status == 0);
  auto l = split_lines(circlet::testing::csv_body(r.out));
  REQUIRE(l.size() == 6);
  CHECK(l[0] == "k,coefficient,term,partial_sum,tail_bound,enclosure,main_term");
  // A_2/2^w = 1/16 at n = 1000 (a route (a) value; the tests of arc_terms check it against route (b)).
  CHECK(l[2].rfind("2,1/16,", 0) == 0);
  CHECK(l[1].find("14181871.40") != string::npos);  // M(1000) ≈ 14181871.4 (docs/MATH.md §3)
}

TEST_CASE("arcs --json carries provenance, terms, tail and main term", "[cli][arcs]") {
  Run r = run("arcs c5 --at 7 --upto 4 --json");
  REQUIRE(r.status == 0);
  auto j = nlohmann::json::parse(r.out);
  CHECK(j["family"] == "c5");
  CHECK(j["provenance"]["precision_bits"] == 128);
  CHECK(j["terms"].size() == 4);
  CHECK(j["main_term_exact"] == "5");  // c_5(7) = 5 = M(7) (no cusp part)
  CHECK(j["main_term_in_enclosure"] == true);
  CHECK(j["tail"]["good_prime_decay"] == 2);
}

TEST_CASE("arcs refuses bad input with one clear line", "[cli][arcs][errors]") {
  Run a = run("arcs c5 --at 3 --upto 0");
  CHECK(a.status == 2);
  CHECK(a.err == "circlet: error: --upto must be at least 1\n");
  Run b = run("arcs c5 --at -2");
  CHECK(b.status == 2);
  CHECK(b.err == "circlet: error: --at: n must be non-negative\n");
  Run c = run("arcs c1 --at 2");
  CHECK(c.status == 2);
  CHECK(c.err == "circlet: error: family c1 has rank 0: no circle-method main term\n");
}

TEST_CASE("remainder --to: CSV rows, exact remainders, summary on stderr", "[cli][remainder]") {
  Run r = run("remainder c7 --to 3");
  REQUIRE(r.status == 0);
  auto l = split_lines(circlet::testing::csv_body(r.out));
  REQUIRE(l.size() == 5);
  CHECK(l[0] == "n,X,count,main_term,main_term_exact,remainder,remainder_exact,E_deligne,E_hecke,"
                "certified_bound,within_bound");
  // c_7(0) = 1, M(0) = 5/8, E(0) = 3/8 = −a(2)/8 with a(2) = −3; bound d(2)·2/8 = 1/2.
  CHECK(l[1].rfind("0,2,1,", 0) == 0);
  CHECK(l[1].find(",5/8,") != string::npos);
  CHECK(l[1].find(",3/8,") != string::npos);
  CHECK(l[1].find(",1/2,yes") != string::npos);
  CHECK(r.err.find("certified: |E(n)| <= d(n+2)(n+2)/8 -- proved for every row") != string::npos);
}

TEST_CASE("remainder --ap --json: rows, summary and the empirical fit", "[cli][remainder]") {
  Run r = run("remainder sq8 --ap 2,1 --to 300 --json");
  REQUIRE(r.status == 0);
  auto j = nlohmann::json::parse(r.out);
  CHECK(j["ap"] == "2,1");
  CHECK(j["rows"].size() == 301);
  CHECK(j["rows"][0]["n"] == "1");
  CHECK(j["rows"][0]["count"] == "16");  // r_8(1) = 16
  CHECK(j["summary"]["identically_zero"] == true);
  CHECK(j["summary"]["fit"]["label"] == "empirical (not a bound)");
  CHECK(j["summary"]["fit"]["ok"] == false);
}

TEST_CASE("remainder refuses bad input with one clear line", "[cli][remainder][errors]") {
  Run a = run("remainder c7");
  CHECK(a.status == 2);
  CHECK(a.err == "circlet: error: give --to N or --ap A,B --to K\n");
  Run b = run("remainder sc3 --to 10");
  CHECK(b.status == 2);
  CHECK(b.err == "circlet: error: family sc3 has rank 1: no main term\n");
}

TEST_CASE("arcs --gauss adds the route (b) coefficient and checks it", "[cli][arcs]") {
  Run r = run("arcs c7 --at 98 --upto 6 --gauss");
  REQUIRE(r.status == 0);
  auto l = split_lines(circlet::testing::csv_body(r.out));
  REQUIRE(l.size() == 7);
  CHECK(l[0] == "k,coefficient,term,partial_sum,tail_bound,enclosure,main_term,coefficient_gauss");
  CHECK(l[2].rfind("2,1/8,", 0) == 0);
  CHECK(l[2].find(",0.125000000000000") != string::npos);
  Run big = run("arcs c7 --at 98 --upto 301 --gauss");
  CHECK(big.status == 2);
  CHECK(big.err == "circlet: error: --gauss is limited to --upto 300 (cost grows like K^3)\n");
}

TEST_CASE("remainder caps the number of rows", "[cli][remainder][errors]") {
  // --to 1000000 is 1000001 rows and accepted, as by `main --to`; one more is refused.
  Run a = run("remainder c9 --to 1000001");
  CHECK(a.status == 2);
  CHECK(a.err == "circlet: error: --to: at most 1000001 rows (--to 1000000); thin the range out with --ap A,B\n");
}

TEST_CASE("arcs at a huge n: the class-number refusal names an option arcs has, factoring is guarded", "[cli][arcs][errors]") {
  // c4 at n = 10^18: H(32·10^18 + 20) needs about 3.3·10^9 sieve steps, above the default budget.
  Run a = run("arcs c4 --at 10^18 --upto 2");
  CHECK(a.status == 2);
  CHECK(a.err.find("allow it with --class-number-steps") != string::npos);
  // ... and arcs accepts that option (a small budget is refused the same way, a larger one is not an unknown option).
  Run b = run("arcs c4 --at 10^18 --upto 2 --class-number-steps 1000");
  CHECK(b.status == 2);
  CHECK(b.err.find("allow it with --class-number-steps") != string::npos);
  // X = 10^40 + 7 + Δ has a 42-digit composite cofactor: refused without --allow-large ...
  Run c = run("arcs c6 --at 10^40+7 --upto 2");
  CHECK(c.status == 2);
  CHECK(c.err.find("--allow-large") != string::npos);
  // ... and with it, factored in a private child; the terms agree with the main term's enclosure.
  Run d = run("--allow-large arcs c6 --at 10^40+7 --upto 2 --factor-timeout 120");
  CHECK(d.status == 0);
  auto l = split_lines(circlet::testing::csv_body(d.out));
  CHECK(l.size() == 3);
  Run e = run("arcs c6 --at 5 --factor-timeout 0");
  CHECK(e.status == 2);
  CHECK(e.err == "circlet: error: --factor-timeout must be a positive number of seconds\n");
}
