#pragma once
// Every output file carries its provenance: program version, command line,
// precision (where relevant) and the UTC date of the run.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

namespace circlet {

struct Provenance {
  std::string program = "circlet";
  std::string version;
  std::string command_line;
  std::string date_utc;  // ISO 8601
  long precision_bits = 0;  // 0 when not applicable

  /// Version from the build, date now, command line as given.
  static Provenance now(const std::string& command_line, long precision_bits = 0);
  nlohmann::json to_json() const;
  /// "# circlet 0.1.0 | <command> | 2026-12-01T22:00:00Z" lines for the top of a CSV.
  std::string csv_comment() const;
};

/// The command line of this process, set once by main().
void set_command_line(int argc, char** argv);
const std::string& command_line();

}  // namespace circlet
