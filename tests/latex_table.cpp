// scripts/latex_table.py: booktabs LaTeX tables of verdict summaries, main-term/count
// tables and the statements proved by certificates, from committed circlet output.
// Skipped with a visible WARN when /usr/bin/python3 cannot import pandas.
#include <sys/wait.h>
#include <unistd.h>

#include <catch2/catch.hpp>
#include <cstdlib>
#include <string>

#include "cli_run.hpp"

namespace {
const std::string kPython = "/usr/bin/python3";
const std::string kSource = CIRCLET_SOURCE_DIR;
const std::string kScript = kPython + " " + kSource + "/scripts/latex_table.py";

int sh(const std::string& cmd) { return circlet::testing::shell_status(cmd); }
using circlet::testing::have_pandas;

/// Output of latex_table.py ARGS (standard output), status in *rc.
std::string table(const std::string& args, int* rc) {
  const std::string out = "/tmp/circlet_latex_" + std::to_string(::getpid()) + ".tex";
  *rc = sh(kScript + " " + args + " >" + out + " 2>&1");
  std::string s = circlet::testing::slurp_file(out);
  std::remove(out.c_str());
  return s;
}

void check_booktabs(const std::string& t) {
  CHECK(t.rfind("\\begin{table}", 0) == 0);
  const auto top = t.find("\\toprule"), mid = t.find("\\midrule"), bottom = t.find("\\bottomrule");
  CHECK(top != std::string::npos);
  CHECK(mid != std::string::npos);
  CHECK(bottom != std::string::npos);
  CHECK((top < mid && mid < bottom));
  CHECK(t.find("\\hline") == std::string::npos);  // booktabs rules only
  CHECK(t.find("\\caption{") != std::string::npos);
  CHECK(t.find("\\label{tab:circlet-") != std::string::npos);
}
}  // namespace

#define CIRCLET_NEED_PANDAS()                                                         \
  if (!have_pandas()) {                                                               \
    WARN("SKIPPED: /usr/bin/python3 cannot import pandas (install python3-pandas)"); \
    return;                                                                           \
  }

TEST_CASE("latex_table.py verdicts: one row per t and a total, from a scan table", "[latex]") {
  CIRCLET_NEED_PANDAS();
  int rc = 0;
  const std::string t = table("verdicts " + kSource + "/results/scan_t6-10_M8/scan.csv", &rc);
  INFO(t);
  REQUIRE(rc == 0);
  check_booktabs(t);
  // results/scan_t6-10_M8/summary.txt: 6480 pairs, 1296 per t, all NON-CONVERGENT.
  CHECK(t.find("$t$ & NON-CONVERGENT & pairs \\\\") != std::string::npos);
  CHECK(t.find("$6$ & $1296$ & $1296$ \\\\") != std::string::npos);
  CHECK(t.find("all & $6480$ & $6480$ \\\\") != std::string::npos);
  CHECK(t.find("-{}-modulus 8") != std::string::npos);  // the command in the caption, "--" kept as two hyphens
}

TEST_CASE("latex_table.py values: exact counts, main terms and remainders", "[latex]") {
  CIRCLET_NEED_PANDAS();
  int rc = 0;
  const std::string t = table("values " + kSource + "/results/default/remainder_c6.csv --rows 0,10,1000", &rc);
  INFO(t);
  REQUIRE(rc == 0);
  check_booktabs(t);
  // Cells of results/default/remainder_c6.csv: n = 0: 1, 3/5, 2/5; n = 10: 12, 131/10, -11/10.
  CHECK(t.find("$0$ & $1$ & $\\frac{3}{5}$ & $\\frac{2}{5}$ \\\\") != std::string::npos);
  CHECK(t.find("$10$ & $12$ & $\\frac{131}{10}$ & $-\\frac{11}{10}$ \\\\") != std::string::npos);
  CHECK(t.find("$1\\,000$ & $10\\,640$") != std::string::npos);  // c_6(1000) = 10640 (thin-space groups)
  CHECK(t.find("$c_{6}(n)$") != std::string::npos);
  // A row that is not there, and a table of the wrong kind: one line, exit status 2.
  CHECK(table("values " + kSource + "/results/default/remainder_c6.csv --rows 5000", &rc).find("no row with n = 5000") !=
        std::string::npos);
  CHECK(rc == 2);
  table("values " + kSource + "/results/default/ratio_c6_sc11.csv", &rc);
  CHECK(rc == 2);
}

TEST_CASE("latex_table.py relations: certified statements with outward-rounded intervals", "[latex]") {
  CIRCLET_NEED_PANDAS();
  int rc = 0;
  const std::string t = table("relations " + kSource + "/results/default/cert_c6_1_0__sc11_1_0.json " + kSource +
                                  "/results/scan_t6-10_M8/examples/cert_c9_34_1__sc17_102_1.json",
                              &rc);
  INFO(t);
  REQUIRE(rc == 0);
  check_booktabs(t);
  CHECK(t.find("$c_{9}(34n+1) / \\mathrm{sc}_{17}(102n+1) \\to \\frac{580}{243}$ & CONSTANT & not an integer") !=
        std::string::npos);
  CHECK(t.find("$c_{6}(n) / \\mathrm{sc}_{11}(n)$ has two limit points & NON-CONVERGENT") != std::string::npos);
  CHECK(t.find("n \\equiv 6 \\pmod{24}: [") != std::string::npos);
  // The printed ends enclose the certificate's exact interval (outward rounding), checked with exact
  // rationals from the stored m*2^e midpoint and radius.
  const std::string py =
      kPython + " -c \"import sys, json, re; sys.path.insert(0, '" + kSource + "/scripts'); import latex_table as L\n"
      "from fractions import Fraction as F\n"
      "c = json.load(open('" + kSource + "/results/default/cert_c6_1_0__sc11_1_0.json'))\n"
      "for cl in c['classes']:\n"
      "  lo, hi = L.exact_interval(cl['limit_interval'])\n"
      "  a, b = F(L.round_sig(lo, 6, True)), F(L.round_sig(hi, 6, False))\n"
      "  assert a <= lo < hi <= b, (a, lo, hi, b)\n"
      "  assert b - a < (hi - lo) + F(2, 10**4) * hi, (a, b)\n"
      "import random\n"
      "random.seed(1)\n"
      "for _ in range(2000):\n"
      "  q = F(random.randint(-10**9, 10**9), random.randint(1, 10**6))\n"
      "  if q: assert F(L.round_sig(q, 4, True)) <= q <= F(L.round_sig(q, 4, False)), q\n"
      "\"";
  CHECK(sh(py) == 0);
  table("relations " + kSource + "/results/default/ratio_c6_sc11.csv", &rc);
  CHECK(rc == 2);
}
