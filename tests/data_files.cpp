// Every table kind circlet writes loads into pandas with the one call that
// docs/data-files.md documents, every column is documented there, and every
// cell has its documented type (tests/data_files_check.py does the checking).
// Skipped with a visible WARN when /usr/bin/python3 cannot import pandas
// (Debian package python3-pandas).
#include <sys/wait.h>
#include <unistd.h>

#include <catch2/catch.hpp>
#include <cstdlib>
#include <string>

#include "cli_run.hpp"

namespace {

const std::string kPython = "/usr/bin/python3";
const std::string kSource = CIRCLET_SOURCE_DIR;
const std::string kCheck = kPython + " " + kSource + "/tests/data_files_check.py " + kSource + "/docs/data-files.md";

int sh(const std::string& cmd) { return circlet::testing::shell_status(cmd); }
using circlet::testing::have_pandas;

struct TempDir {
  std::string path;
  TempDir() {
    char tmpl[] = "/tmp/circlet-data-XXXXXX";
    if (char* d = ::mkdtemp(tmpl)) path = d;
  }
  ~TempDir() {
    if (!path.empty()) sh("rm -rf '" + path + "'");
  }
};

}  // namespace

TEST_CASE("every table kind loads with the documented pandas call and matches docs/data-files.md", "[data]") {
  if (!have_pandas()) {
    WARN("SKIPPED: /usr/bin/python3 cannot import pandas (install python3-pandas)");
    return;
  }
  const TempDir tmp;
  REQUIRE(!tmp.path.empty());
  const std::string& d = tmp.path;
  const std::string c = CIRCLET_BINARY;
  // Each kind in its variants (--ap, --gauss, exact and ball main terms, an undefined
  // ratio, an infinite tail bound), half through -o and half through standard output.
  struct Made {
    const char* kind;
    std::string args, file;
    bool stdout_redirect;
  };
  const Made made[] = {
      {"count", "count c7 --to 20", "count.csv", true},
      {"count", "count sc13 --ap 2,1 --to 10", "count_ap.csv", false},
      {"main", "main c7 --to 10", "main.csv", true},
      {"main", "main c6 --ap 2,1 --to 10", "main_ap.csv", false},
      {"arcs", "arcs c9 --at 100 --upto 5", "arcs.csv", true},
      {"arcs", "arcs c6 --at 50 --upto 4 --gauss", "arcs_gauss.csv", false},
      {"arcs", "arcs sc7 --at 100 --upto 3", "arcs_inf.csv", true},
      {"remainder", "remainder c7 --to 10", "rem.csv", false},
      {"remainder", "remainder c6 --ap 3,1 --to 10", "rem_ap.csv", true},
      {"ratio", "ratio c6 sc11 --to 10", "ratio.csv", true},
      {"ratio", "ratio c7 sc13 --ap 2,1 --ap2 3,2 --to 10", "ratio_ap.csv", false},
  };
  std::string args;
  for (const Made& m : made) {
    const std::string file = d + "/" + m.file;
    const std::string cmd = m.stdout_redirect ? c + " " + m.args + " >" + file + " 2>/dev/null"
                                              : c + " " + m.args + " -o " + file + " >/dev/null 2>&1";
    INFO(cmd);
    REQUIRE(sh(cmd) == 0);
    args += std::string(" ") + m.kind + "=" + file;
  }
  // A scan with exact comparisons (t = 4, 5) and certificates (t = 6), verified.
  REQUIRE(sh(c + " scan --t 4..6 --modulus 2 --verify -o " + d + "/scan >/dev/null 2>&1") == 0);
  args += " scan=" + d + "/scan/scan.csv";
  const std::string log = d + "/check.log";
  const int rc = sh(kCheck + args + " --fresh >" + log + " 2>&1");
  INFO(circlet::testing::slurp_file(log));
  CHECK(rc == 0);
  // The committed reference tables obey the same page.
  const int rc2 = sh(kCheck + " scan=" + kSource + "/results/scan_t6-10_M8/scan.csv remainder=" + kSource +
                     "/results/default/remainder_c6.csv ratio=" + kSource + "/results/default/ratio_c6_sc11.csv >" +
                     log + " 2>&1");
  INFO(circlet::testing::slurp_file(log));
  CHECK(rc2 == 0);
}

TEST_CASE("the data-file checker fails on an undocumented column and on a cell of the wrong type", "[data]") {
  if (!have_pandas()) {
    WARN("SKIPPED: /usr/bin/python3 cannot import pandas (install python3-pandas)");
    return;
  }
  const TempDir tmp;
  REQUIRE(!tmp.path.empty());
  const std::string& d = tmp.path;
  REQUIRE(sh(std::string(CIRCLET_BINARY) + " count c7 --to 5 -o " + d + "/c.csv >/dev/null 2>&1") == 0);
  // A count table is not a remainder table: its columns are not all documented there... n and count are,
  // so check it as `arcs`, where neither is.
  CHECK(sh(kCheck + " arcs=" + d + "/c.csv >/dev/null 2>&1") == 1);
  // A count cell that is not an integer.
  REQUIRE(sh("sed -i 's/^3,3$/3,3.5/' " + d + "/c.csv") == 0);
  CHECK(sh(kCheck + " count=" + d + "/c.csv >" + d + "/log 2>&1") == 1);
  CHECK(circlet::testing::slurp_file(d + "/log").find("column count (integer)") != std::string::npos);
}
