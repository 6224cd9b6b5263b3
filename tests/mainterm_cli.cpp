// Tests for the `circlet main` command (src/cli/main_cmd.cpp), run as a process.
#include <catch2/catch.hpp>

#include <arb.h>
#include <flint/fmpq.h>

#include "cli_run.hpp"
#include <array>
#include <cstdio>
#include <memory>
#include <string>

namespace {

struct Run {
  int status;
  std::string out;  // standard output followed by standard error
};

Run run(const std::string& args) {
  const auto r = circlet::testing::run_circlet(args);
  return {r.status, r.out + r.err};
}

}  // namespace

TEST_CASE("circlet main: exact main term, count and remainder for c9", "[mainterm][cli]") {
  // c_9(1000) = 14180606 and M ≈ 14181871.4 (docs/MATH.md §3).
  Run r = run("main c9 --at 1000");
  CHECK(r.status == 0);
  CHECK(r.out.find("382910528/27") != std::string::npos);
  CHECK(r.out.find("14180606") != std::string::npos);
  CHECK(r.out.find("-34166/27") != std::string::npos);
}

TEST_CASE("circlet main: --explain lists the parts", "[mainterm][cli]") {
  Run r = run("main c6 --at 101 --explain");
  CHECK(r.status == 0);
  CHECK(r.out.find("3319/10") != std::string::npos);  // c_6(101) = 330, M ≈ 331.90 (docs/MATH.md §3)
  CHECK(r.out.find("sigma_inf") != std::string::npos);
  CHECK(r.out.find("Kronecker symbol (7377/.)") != std::string::npos);
  CHECK(r.out.find("special primes") != std::string::npos);
}

TEST_CASE("circlet main: tables as CSV and JSON, exact values exact", "[mainterm][cli]") {
  Run r = run("main c5 --to 4");
  CHECK(r.status == 0);
  CHECK(circlet::testing::csv_body(r.out) == "n,count,main,remainder\n0,1,1,0\n1,1,1,0\n2,2,2,0\n3,3,3,0\n4,5,5,0\n");
  // r_5 = M exactly (tests/mainterm_main_term.cpp checks it against θ(q)^5): remainders 0.
  Run a = run("main sq5 --ap 3,1 --to 2");
  CHECK(a.status == 0);
  CHECK(circlet::testing::csv_body(a.out) == "k,n,count,main,remainder\n0,1,10,10,0\n1,4,90,90,0\n2,7,320,320,0\n");
  // Weight 5/2 tables are exact rationals (c_6(10) = 12, M = 131/10 as in `main c6 --at 10`).
  Run c6 = run("main c6 --to 12");
  CHECK(c6.status == 0);
  CHECK(c6.out.find("10,12,131/10,-11/10\n") != std::string::npos);
  CHECK(c6.out.find("+/-") == std::string::npos);
  Run f = run("main c6 --to 3 --fast");
  CHECK(f.status != 0);  // the uncertified path is gone: the certified table is the fast one
  Run j = run("main sq4 --to 3 --json");
  CHECK(j.status == 0);
  CHECK(j.out.find("\"provenance\"") != std::string::npos);
  CHECK(j.out.find("\"certified\": true") != std::string::npos);
}

TEST_CASE("circlet main: bad input is a user error with one clear line", "[mainterm][cli][errors]") {
  Run r = run("main sq1 --at 4");
  CHECK(r.status == 2);
  CHECK(r.out.find("needs rank ≥ 2") != std::string::npos);
  r = run("main c5 --at 4 --to 5");
  CHECK(r.status == 2);
  CHECK(r.out.find("either --to N or --at N") != std::string::npos);
  r = run("main c5 --at -3");
  CHECK(r.status == 2);
  r = run("main c5 --to 5 --explain");
  CHECK(r.status == 2);
  CHECK(r.out.find("--explain is for a single value") != std::string::npos);
  r = run("main c5 --at 10 --digits 0");
  CHECK(r.status == 2);
}

TEST_CASE("circlet main: factoring a huge X gives up under --factor-timeout", "[mainterm][cli]") {
  // X = 10^100 + Δ needs the quadratic sieve for far longer than a second: the child
  // process is stopped and the main term is reported unknown, exit status 0.
  const std::string n = "1" + std::string(100, '0');
  Run r = run("main c6 --at " + n + " --factor-timeout 1 --allow-large");  // past the resource guard
  CHECK(r.status == 0);
  CHECK(r.out.find("main term   unknown (X could not be factored in the time allowed: --factor-timeout 1 s)") !=
        std::string::npos);
  Run bad = run("main c6 --at 5 --factor-timeout 0");
  CHECK(bad.status == 2);
  CHECK(bad.out.find("--factor-timeout must be a positive number of seconds") != std::string::npos);
  // Below the threshold the result is computed in the same process as before.
  Run big = run("main c9 --at 1" + std::string(30, '0'));
  CHECK(big.status == 0);
  CHECK(big.out.find("(exact rational)") != std::string::npos);
}

TEST_CASE("circlet main: weight 7/2 above the Bernoulli limit is exact (theta route); --l-value-terms bounds it",
          "[mainterm][cli]") {
  // The theta route's values are checked against the Bernoulli route and PARI/GP in
  // tests/mainterm_dirichlet_l_theta.cpp; here: the command uses it, says so, and the
  // Euler-product ball it falls back to under a small budget contains the exact value.
  Run exact = run("main c8 --at 10^8 --explain");
  REQUIRE(exact.status == 0);
  CHECK(exact.out.find("(exact rational)") != std::string::npos);
  CHECK(exact.out.find("by the theta functional equation") != std::string::npos);
  Run ball = run("main c8 --at 10^8 --l-value-terms 1000");
  REQUIRE(ball.status == 0);
  CHECK(ball.out.find("the exact theta route needs") != std::string::npos);
  auto main_field = [](const std::string& out) {
    const size_t at = out.find("main term   ");
    REQUIRE(at != std::string::npos);
    const size_t from = at + 12;
    const size_t to = out[from] == '[' ? out.find(']', from) + 1 : out.find(' ', from);
    return out.substr(from, to - from);
  };
  const std::string q = main_field(exact.out), b = main_field(ball.out);
  INFO("exact " << q << ", ball " << b);
  fmpq_t v;
  fmpq_init(v);
  REQUIRE(fmpq_set_str(v, q.c_str(), 10) == 0);
  arb_t x, y;
  arb_init(x);
  arb_init(y);
  arb_set_fmpq(x, v, 256);
  REQUIRE(arb_set_str(y, b.c_str(), 256) == 0);
  CHECK(arb_contains(y, x));
  arb_clear(x);
  arb_clear(y);
  fmpq_clear(v);
}
