#pragma once
// PARI/GP as an outside reference for the main-term tests. Tests that use it
// skip with a visible WARN when `gp` is not on PATH.
#include <arb.h>

#include <array>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <memory>
#include <string>
#include <unistd.h>

namespace circlet::testing {

inline bool gp_available() { return std::system("command -v gp >/dev/null 2>&1") == 0; }

/// Runs a GP script (quiet, no default stack trouble) and returns its stdout.
inline std::string gp_run(const std::string& script) {
  std::string path = "/tmp/circlet_mainterm_gp_" + std::to_string(::getpid()) + ".gp";
  {
    std::ofstream out(path);
    out << "default(parisizemax, 200000000);\n" << script << "\nquit;\n";
  }
  std::string cmd = "gp -q -f " + path + " 2>/dev/null";
  std::unique_ptr<FILE, int (*)(FILE*)> pipe(::popen(cmd.c_str(), "r"), ::pclose);
  std::string out;
  if (!pipe) return out;
  std::array<char, 4096> buf;
  size_t n;
  while ((n = std::fread(buf.data(), 1, buf.size(), pipe.get())) > 0) out.append(buf.data(), n);
  std::remove(path.c_str());
  return out;
}

/// gp's 45 printed significant digits (realprecision 45) as a ball of relative
/// radius 2^{−130} around them (about 1e−39, looser than the printed digits).
inline void gp_decimal_ball(arb_t res, const std::string& line) {
  arb_t rad;
  arb_init(rad);
  arb_set_str(res, line.c_str(), 200);
  arb_abs(rad, res);
  arb_mul_2exp_si(rad, rad, -130);
  arb_add_error(res, rad);
  arb_clear(rad);
}

}  // namespace circlet::testing
