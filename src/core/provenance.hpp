#pragma once
// Every output carries its provenance: program version, git commit of the
// sources, the versions of FLINT, Arb and NTL it was built with, command line,
// precision (where relevant) and the UTC date of the run. CSV output (files
// and standard output alike) starts with one comment line
//   # circlet 0.1.0 | <command> | 2026-12-01T22:00:00Z | prec 128 bits | git 1a2b3c4d5e6f | flint 2.9.0 | arb 2.23.0 | ntl 11.5.1
// (the "prec" field only where a precision applies); JSON output has the same
// fields in a "provenance" object (docs/data-files.md).
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

namespace circlet {

struct Provenance {
  std::string program = "circlet";
  std::string version;
  std::string git_commit;  // short hash of HEAD when the build was configured, or "unknown"
  std::string flint_version, arb_version, ntl_version;
  std::string command_line;
  std::string date_utc;  // ISO 8601
  long precision_bits = 0;  // 0 when not applicable

  /// Version, commit and library versions from the build, date now, command line as given.
  static Provenance now(const std::string& command_line, long precision_bits = 0);
  nlohmann::json to_json() const;
  /// The "# circlet ..." comment line (with its newline) for the top of a CSV.
  std::string csv_comment() const;
};

/// The command line of this process, set once by main().
void set_command_line(int argc, char** argv);
const std::string& command_line();

}  // namespace circlet
