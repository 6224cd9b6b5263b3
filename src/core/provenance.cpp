#include "core/provenance.hpp"

#include <NTL/version.h>
#include <arb.h>
#include <flint/flint.h>

#include <ctime>

#include "circlet/git_commit.hpp"
#include "circlet/version.hpp"

namespace circlet {

namespace {
std::string& command_line_storage() {
  static std::string s;
  return s;
}

std::string shell_quote(const std::string& a) {
  if (!a.empty() && a.find_first_of(" \t\n'\"$\\*?;&|<>()") == std::string::npos) return a;
  std::string q = "'";
  for (char c : a) q += (c == '\'') ? std::string("'\\''") : std::string(1, c);
  return q + "'";
}
}  // namespace

void set_command_line(int argc, char** argv) {
  std::string s;
  for (int i = 0; i < argc; ++i) {
    if (i) s += ' ';
    s += shell_quote(i == 0 ? std::string("circlet") : std::string(argv[i]));
  }
  command_line_storage() = s;
}

const std::string& command_line() { return command_line_storage(); }

Provenance Provenance::now(const std::string& cmd, long precision_bits) {
  Provenance p;
  p.version = kVersion;
  p.git_commit = kGitCommit;
  p.flint_version = ::flint_version;  // run-time library versions (the shared objects actually loaded)
  p.arb_version = ::arb_version;
  p.ntl_version = NTL_VERSION;      // NTL has no run-time version string: the headers built against
  p.command_line = cmd;
  p.precision_bits = precision_bits;
  std::time_t t = std::time(nullptr);
  char buf[32];
  std::strftime(buf, sizeof buf, "%Y-%m-%dT%H:%M:%SZ", std::gmtime(&t));
  p.date_utc = buf;
  return p;
}

nlohmann::json Provenance::to_json() const {
  nlohmann::json j{{"program", program}, {"version", version}, {"command", command_line}, {"date", date_utc}};
  if (precision_bits > 0) j["precision_bits"] = precision_bits;
  if (!git_commit.empty()) j["git_commit"] = git_commit;
  if (!flint_version.empty())
    j["libraries"] = {{"flint", flint_version}, {"arb", arb_version}, {"ntl", ntl_version}};
  return j;
}

std::string Provenance::csv_comment() const {
  std::string s = "# " + program + " " + version + " | " + command_line + " | " + date_utc;
  if (precision_bits > 0) s += " | prec " + std::to_string(precision_bits) + " bits";
  if (!git_commit.empty()) s += " | git " + git_commit;
  if (!flint_version.empty()) s += " | flint " + flint_version + " | arb " + arb_version + " | ntl " + ntl_version;
  return s + "\n";
}

}  // namespace circlet
