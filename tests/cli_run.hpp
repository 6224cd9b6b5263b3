#pragma once
// Runs the real `circlet` binary (CIRCLET_BINARY, set by CMake) for CLI tests,
// capturing exit status, standard output and standard error separately.
#include <sys/wait.h>
#include <unistd.h>

#include <atomic>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <iterator>
#include <string>

namespace circlet::testing {

struct CliRun {
  int status;  // exit status, or -1 when the process did not exit normally (signal)
  std::string out;
  std::string err;
};

inline std::string slurp_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  return std::string((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
}

/// Runs `env circlet args` through /bin/sh (args is shell text: quote as needed).
/// Exit status of a shell command (-1 when it did not exit normally).
inline int shell_status(const std::string& cmd) {
  const int rc = std::system(cmd.c_str());
  return WIFEXITED(rc) ? WEXITSTATUS(rc) : -1;
}

/// Whether /usr/bin/python3 has pandas (tests of the Python tools skip with a WARN otherwise).
inline bool have_pandas() {
  static const bool ok = shell_status("/usr/bin/python3 -c 'import pandas' >/dev/null 2>&1") == 0;
  return ok;
}

inline CliRun run_circlet(const std::string& args, const std::string& env = "") {
  static std::atomic<int> counter{0};
  const std::string base = "/tmp/circlet_cli_" + std::to_string(::getpid()) + "_" + std::to_string(counter++);
  const std::string cmd = env + " " CIRCLET_BINARY " " + args + " >" + base + ".out 2>" + base + ".err </dev/null";
  const int raw = std::system(cmd.c_str());
  CliRun r{WIFEXITED(raw) ? WEXITSTATUS(raw) : -1, slurp_file(base + ".out"), slurp_file(base + ".err")};
  std::remove((base + ".out").c_str());
  std::remove((base + ".err").c_str());
  return r;
}

/// A CSV table printed on standard output without its first line, the
/// "# circlet VERSION | COMMAND | DATE | ..." provenance comment every CSV
/// output starts with (files and standard output alike). Returns "" (so that a
/// check against the expected table fails) when that line is missing.
inline std::string csv_body(const std::string& out) {
  if (out.rfind("# circlet ", 0) != 0) return "";
  const auto eol = out.find('\n');
  return eol == std::string::npos ? std::string() : out.substr(eol + 1);
}

}  // namespace circlet::testing
