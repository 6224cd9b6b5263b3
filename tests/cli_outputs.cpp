// Outputs through the real binary (src/core/atomic_file.hpp): FIFOs, devices,
// symbolic and hard links, permission bits, `-o -`, write errors, stale
// temporaries; memory limits (ulimit -v) and the resource guard's lift.
#include <sys/stat.h>
#include <unistd.h>

#include <catch2/catch.hpp>
#include <cstdio>
#include <fstream>
#include <string>

#include "cli_run.hpp"

using circlet::testing::run_circlet;
using circlet::testing::slurp_file;

namespace {
// The sanitizer build (scripts/sanitize.sh) runs the same binary under ASan, whose
// shadow memory needs far more address space than any ulimit -v test allows.
#if defined(__SANITIZE_ADDRESS__)
constexpr bool kUnderAddressSanitizer = true;
#elif defined(__has_feature)
#if __has_feature(address_sanitizer)
constexpr bool kUnderAddressSanitizer = true;
#else
constexpr bool kUnderAddressSanitizer = false;
#endif
#else
constexpr bool kUnderAddressSanitizer = false;
#endif

std::string scratch_dir() {
  const std::string d = "/tmp/circlet_cli_outputs_" + std::to_string(::getpid());
  REQUIRE(std::system(("rm -rf " + d + " && mkdir -p " + d).c_str()) == 0);
  return d;
}

// The rows of `count c7 --to 5` as CSV, after the provenance comment line.
const char* kCountC7 = "n,count\n0,1\n1,1\n2,2\n3,3\n4,5\n5,7\n";

bool has_data_rows(const std::string& text) { return text.find("\n5,7\n") != std::string::npos; }

}  // namespace

TEST_CASE("the output path dash (-o -) means standard output", "[cli][outputs]") {
  const std::string d = scratch_dir();
  const auto r = run_circlet("count c7 --to 5 -o -");
  CHECK(r.status == 0);
  CHECK(circlet::testing::csv_body(r.out) == kCountC7);
  CHECK(::access("-", F_OK) != 0);  // no file named "-" in the working directory of the test
}

TEST_CASE("an output path of /dev/stdout writes to standard output and leaves the entry alone", "[cli][outputs]") {
  const auto r = run_circlet("count c7 --to 5 -o /dev/stdout");
  CHECK(r.status == 0);
  CHECK(has_data_rows(r.out));
  struct stat st {};
  REQUIRE(::lstat("/dev/stdout", &st) == 0);
  CHECK(S_ISLNK(st.st_mode));
}

TEST_CASE("a FIFO is written through, not replaced", "[cli][outputs]") {
  const std::string d = scratch_dir(), fifo = d + "/fifo", got = d + "/got.csv";
  REQUIRE(::mkfifo(fifo.c_str(), 0644) == 0);
  // A reader in the background copies what comes through the FIFO.
  REQUIRE(std::system(("(cat " + fifo + " > " + got + ") & echo $! > " + d + "/pid").c_str()) == 0);
  const auto r = run_circlet("count c7 --to 5 -o " + fifo, "timeout 60");
  CHECK(r.status == 0);
  std::system(("wait $(cat " + d + "/pid) 2>/dev/null; sleep 0.2").c_str());
  struct stat st {};
  REQUIRE(::lstat(fifo.c_str(), &st) == 0);
  CHECK(S_ISFIFO(st.st_mode));  // still a FIFO
  CHECK(has_data_rows(slurp_file(got)));
  std::system(("rm -rf " + d).c_str());
}

TEST_CASE("character devices are written through: /dev/null works, /dev/full is an error", "[cli][outputs]") {
  CHECK(run_circlet("count c7 --to 5 -o /dev/null").status == 0);
  struct stat st {};
  REQUIRE(::stat("/dev/null", &st) == 0);
  CHECK(S_ISCHR(st.st_mode));
  const auto full = run_circlet("count c7 --to 5 -o /dev/full");
  CHECK(full.status == 2);
  CHECK_THAT(full.err, Catch::Contains("circlet: error: writing '/dev/full' failed"));
  CHECK_THAT(full.err, Catch::Contains("No space left on device"));
}

TEST_CASE("a full standard output is an error, also for verify", "[cli][outputs]") {
  const std::string d = scratch_dir();
  const auto r = run_circlet("count c7 --to 5 > /dev/full 2>/dev/null; echo $? > " + d + "/rc; true");
  CHECK(slurp_file(d + "/rc") == "2\n");
  REQUIRE(run_circlet("certify c6 sc11 --ap 2,1 --ap2 2,1 -o " + d + "/cert.json").status == 0);
  run_circlet("verify " + d + "/cert.json > /dev/full 2> " + d + "/verr; echo $? > " + d + "/rc; true");
  CHECK(slurp_file(d + "/rc") == "2\n");
  CHECK_THAT(slurp_file(d + "/verr"), Catch::Contains("writing to standard output failed"));
  std::system(("rm -rf " + d).c_str());
}

TEST_CASE("a symbolic link is followed and stays a link", "[cli][outputs]") {
  const std::string d = scratch_dir(), target = d + "/real.csv", link = d + "/link.csv";
  std::ofstream(target) << "old\n";
  REQUIRE(::symlink("real.csv", link.c_str()) == 0);
  REQUIRE(run_circlet("count c7 --to 5 -o " + link).status == 0);
  struct stat st {};
  REQUIRE(::lstat(link.c_str(), &st) == 0);
  CHECK(S_ISLNK(st.st_mode));
  CHECK(has_data_rows(slurp_file(target)));
  // A dangling link: its target is created.
  const std::string dangling = d + "/dangling.csv";
  REQUIRE(::symlink("new.csv", dangling.c_str()) == 0);
  REQUIRE(run_circlet("count c7 --to 5 -o " + dangling).status == 0);
  CHECK(has_data_rows(slurp_file(d + "/new.csv")));
  REQUIRE(::lstat(dangling.c_str(), &st) == 0);
  CHECK(S_ISLNK(st.st_mode));
  std::system(("rm -rf " + d).c_str());
}

TEST_CASE("an existing file keeps its mode; hard links keep sharing the file", "[cli][outputs]") {
  const std::string d = scratch_dir(), f = d + "/private.csv", h = d + "/hard.csv";
  std::ofstream(f) << "old\n";
  REQUIRE(::chmod(f.c_str(), 0600) == 0);
  REQUIRE(run_circlet("count c7 --to 5 -o " + f).status == 0);
  struct stat st {};
  REQUIRE(::stat(f.c_str(), &st) == 0);
  CHECK((st.st_mode & 0777) == 0600);
  CHECK(has_data_rows(slurp_file(f)));

  REQUIRE(::link(f.c_str(), h.c_str()) == 0);
  REQUIRE(run_circlet("count c7 --to 6 -o " + h).status == 0);
  struct stat sf {}, sh {};
  REQUIRE(::stat(f.c_str(), &sf) == 0);
  REQUIRE(::stat(h.c_str(), &sh) == 0);
  CHECK(sf.st_ino == sh.st_ino);  // still one file with two names
  CHECK(sf.st_nlink == 2);
  CHECK(slurp_file(f).find("\n6,11\n") != std::string::npos);  // c_7(6) = 11 (OEIS A053270)
  std::system(("rm -rf " + d).c_str());
}

TEST_CASE("stale temporaries of dead processes are removed by the next run to the same path", "[cli][outputs]") {
  const std::string d = scratch_dir(), out = d + "/out.csv";
  // A process that has exited: its pid is free (no process has it) right after wait.
  const std::string pid_file = d + "/deadpid";
  REQUIRE(std::system(("sh -c 'echo $$' > " + pid_file).c_str()) == 0);
  std::string dead = slurp_file(pid_file);
  dead.erase(dead.find_last_not_of("\n") + 1);
  const std::string stale = out + ".tmp." + dead, other = d + "/other.csv.tmp." + dead;
  std::ofstream(stale) << "half a file";
  std::ofstream(other) << "another target's temporary";
  // Our own live pid's temporary must stay: a running process may still commit it.
  const std::string live = out + ".tmp." + std::to_string(::getpid());
  std::ofstream(live) << "live";
  REQUIRE(run_circlet("count c7 --to 5 -o " + out).status == 0);
  CHECK(::access(stale.c_str(), F_OK) != 0);
  CHECK(::access(other.c_str(), F_OK) == 0);  // not the same target
  CHECK(::access(live.c_str(), F_OK) == 0);
  CHECK(has_data_rows(slurp_file(out)));
  std::system(("rm -rf " + d).c_str());
}

TEST_CASE("a memory limit set with ulimit -v is seen before the work starts", "[cli][memory]") {
  if (kUnderAddressSanitizer) {
    WARN("skipped: AddressSanitizer reserves terabytes of address space, so ulimit -v cannot be tested under it");
    return;
  }
  // 300 MB of address space: c_7 to 1.6e7 needs more (the plan's estimate), so the
  // refusal names RLIMIT_AS; no abort (status 134) and no internal error.
  const auto r = run_circlet("count c7 --to 16000000 -o /dev/null", "ulimit -v 300000;");
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("RLIMIT_AS (ulimit -v)"));
  CHECK(r.err.rfind("circlet: error: ", 0) == 0);
}

TEST_CASE("a failed allocation is a clear error, not an abort", "[cli][memory]") {
  if (kUnderAddressSanitizer) {
    WARN("skipped: AddressSanitizer reserves terabytes of address space, so ulimit -v cannot be tested under it");
    return;
  }
  // The budget check is bypassed with a forged budget, so the allocation itself fails
  // under the address-space limit: std::bad_alloc becomes exit status 2.
  const auto r = run_circlet("count c7 --to 16000000 -o /dev/null",
                             "ulimit -v 300000; CIRCLET_MEMORY_AVAILABLE=100000000000");
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("circlet: error: out of memory"));
}

TEST_CASE("nothing prints nan: an unreachable main term is an infinite ball or a value", "[cli][mainterm]") {
  const auto r = run_circlet("main c4 --at 100000000");
  CHECK(r.status == 0);
  CHECK(r.out.find("nan") == std::string::npos);
  CHECK_THAT(r.out, Catch::Contains("main term"));
}

TEST_CASE("the resource guard is lifted by --allow-large and CIRCLET_TIME_LIMIT", "[cli][guard]") {
  // Refused at a 1 s limit, run with --allow-large (a note names the estimate).
  const auto refused = run_circlet("ratio c6 sc11 --to 3 --prec 8000", "CIRCLET_TIME_LIMIT=0.01");
  CHECK(refused.status == 2);
  CHECK_THAT(refused.err, Catch::Contains("give --allow-large"));
  const auto allowed = run_circlet("ratio c6 sc11 --to 3 --prec 8000 --allow-large", "CIRCLET_TIME_LIMIT=0.01");
  CHECK(allowed.status == 0);
  CHECK_THAT(allowed.err, Catch::Contains("verdict: NON-CONVERGENT"));
}

TEST_CASE("a 5000-digit n is refused by the guard before factoring starts", "[cli][guard]") {
  // 10^4999 + 7 + Δ: digits of X far beyond what factoring can promise.
  std::string n = "1" + std::string(4998, '0') + "7";
  const auto r = run_circlet("main c5 --at " + n, "timeout 30");
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("give --allow-large"));
}

TEST_CASE("ratio shows progress on standard error when it is a terminal", "[cli][progress]") {
  if (std::system("command -v script >/dev/null 2>&1") != 0) {
    WARN("util-linux `script` not found: no pseudo-terminal for this test");
    return;
  }
  const std::string d = scratch_dir();
  // script(1) gives the command a pseudo-terminal; the line is shown from the start
  // (CIRCLET_PROGRESS_AFTER=0 instead of the 2 s delay).
  const std::string cmd = std::string("CIRCLET_PROGRESS_AFTER=0 script -qc '") + CIRCLET_BINARY +
                          " ratio c6 sc11 --to 3000 -o " + d +
                          "/r.csv' /dev/null > " + d + "/tty.txt";
  REQUIRE(std::system(cmd.c_str()) == 0);
  const std::string tty = slurp_file(d + "/tty.txt");
  CHECK_THAT(tty, Catch::Contains("circlet ratio: rows"));
  // Without a terminal (the other tests): no progress line.
  const auto quiet = run_circlet("ratio c6 sc11 --to 5 -o " + d + "/q.csv");
  CHECK(quiet.err.find("circlet ratio: rows") == std::string::npos);
  std::system(("rm -rf " + d).c_str());
}
