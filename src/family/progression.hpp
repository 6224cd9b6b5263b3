#pragma once
// Arithmetic progressions n ↦ A·n + B as given on the command line ("A,B"),
// and the parsing of the non-negative integers the user types (N, K, digits).
#include <string>

#include "core/parse_int.hpp"  // parse_nonnegative: the one integer parser

namespace circlet {

struct Progression {
  long A = 1;  // ≥ 1
  long B = 0;  // ≥ 0

  /// Parses "A,B" (e.g. "5,4"); UserError on malformed text, A ≤ 0, B < 0 or overflow.
  static Progression parse(const std::string& text);
  /// A·k + B; UserError if it does not fit in a signed 64-bit integer.
  long at(long k) const;
  std::string str() const { return std::to_string(A) + "," + std::to_string(B); }
  bool operator==(const Progression& o) const { return A == o.A && B == o.B; }
};

/// The rows a table command prints, from its --to/--at/--ap options:
/// n = 0..N (--to N), the single n = N (--at N), or n = A·k + B for k = 0..K
/// (--ap A,B --to K). Empty strings mean "option not given".
struct RowSelection {
  bool progression = false;  // rows are indexed by k, n = prog.at(k)
  Progression prog;
  long first_n = 0;  // 0 for --to, N for --at
  long count = 0;    // number of rows
  long n_max = 0;    // the largest n of any row

  /// UserError on a missing or contradictory combination, on malformed numbers
  /// and on A·K + B overflowing 64 bits. `allow_at` = false for commands without --at.
  static RowSelection parse(const std::string& to, const std::string& at, const std::string& ap, bool allow_at = true);
  long n_of(long i) const { return progression ? prog.A * i + prog.B : first_n + i; }
};


}  // namespace circlet
