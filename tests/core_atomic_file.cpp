// Output integrity (src/core/atomic_file.hpp): files appear only complete.
#include "core/atomic_file.hpp"

#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <catch2/catch.hpp>
#include <chrono>
#include <cstdio>
#include <string>
#include <thread>

#include "cli_run.hpp"
#include "core/error.hpp"

using circlet::AtomicFile;
using circlet::UserError;
using circlet::testing::slurp_file;

namespace {
std::string scratch(const std::string& name) { return "/tmp/circlet_atomic_" + std::to_string(::getpid()) + "_" + name; }
bool exists(const std::string& path) { return ::access(path.c_str(), F_OK) == 0; }
}  // namespace

TEST_CASE("an atomic file appears only on commit, and an abandoned one leaves the old file", "[core][atomic]") {
  const std::string path = scratch("a.txt");
  circlet::write_file_atomically(path, "old\n");
  {
    AtomicFile f(path);
    f.stream() << "half of the new";
    CHECK(slurp_file(path) == "old\n");  // not yet committed
  }  // destroyed without commit: the temporary is removed, the old file stays
  CHECK(slurp_file(path) == "old\n");
  CHECK_FALSE(exists(path + ".tmp." + std::to_string(::getpid())));
  {
    AtomicFile f(path);
    f.stream() << "new\n";
    f.commit();
  }
  CHECK(slurp_file(path) == "new\n");
  std::remove(path.c_str());
}

TEST_CASE("unwritable and unreadable paths give a clear message", "[core][atomic][errors]") {
  CHECK_THROWS_WITH(AtomicFile("/nonexistent-dir/x.csv"), Catch::Contains("cannot write '/nonexistent-dir/x.csv'"));
  CHECK_THROWS_WITH(AtomicFile(""), "output path is empty");
  CHECK_THROWS_WITH(circlet::read_file("/nonexistent-file"), Catch::Contains("cannot read '/nonexistent-file'"));
  CHECK_THROWS_WITH(circlet::read_file("/tmp"), Catch::Contains("not a regular file"));
}

TEST_CASE("a count killed at any moment leaves the old file or the complete new one", "[core][atomic][cli]") {
  const std::string path = scratch("c7.csv");
  circlet::write_file_atomically(path, "old\n");
  // The complete new file ends with the row of n = N.
  const std::string N = "2000000";
  const std::string last_row_prefix = "\n" + N + ",";
  int saw_old = 0, saw_new = 0;
  for (int delay_ms : {50, 200, 400, 700, 1000, 1500}) {
    pid_t pid = ::fork();
    REQUIRE(pid >= 0);
    if (pid == 0) {
      std::freopen("/dev/null", "w", stderr);
      ::execl(CIRCLET_BINARY, "circlet", "count", "c7", "--to", N.c_str(), "-o", path.c_str(), (char*)nullptr);
      ::_exit(127);
    }
    std::this_thread::sleep_for(std::chrono::milliseconds(delay_ms));
    ::kill(pid, SIGKILL);  // no clean-up runs
    int status = 0;
    ::waitpid(pid, &status, 0);
    const std::string body = slurp_file(path);
    INFO("killed after " << delay_ms << " ms; file has " << body.size() << " bytes");
    const bool old = body == "old\n";
    const bool complete = body.find(last_row_prefix) != std::string::npos && body.back() == '\n';
    CHECK((old || complete));
    saw_old += old;
    saw_new += complete;
    std::remove((path + ".tmp." + std::to_string(pid)).c_str());  // SIGKILL leaves the temporary behind
    if (complete) circlet::write_file_atomically(path, "old\n");
  }
  CHECK(saw_old + saw_new == 6);
  std::remove(path.c_str());
}
